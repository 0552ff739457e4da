import type { IdempotencyRecord } from "../types.js";
import type { ClaimOutcome, IdempotencyClaim, IdempotencyRepository } from "../ports.js";
import { one, type Sql } from "./sql.js";

interface KeyRow {
  requestHash: string;
  status: number | null;
  location: string | null;
  responseJson: string | null;
  createdAt: string;
}

/** A claim lost to a release between our insert and our read is retried; more than this is a bug, not a race. */
const CLAIM_ATTEMPTS = 5;

/**
 * The first response to each Idempotency-Key, per organisation, across instances. `claim` is one INSERT … ON
 * CONFLICT, committed at once (it runs on the pool, outside the work's transaction): the unique key lets exactly
 * one request in; the others read what holds the key — a finished response, or a claim still in flight.
 */
export function postgresIdempotency(sql: Sql): IdempotencyRepository {
  async function claimOnce(
    orgId: string,
    key: string,
    c: IdempotencyClaim,
    expiredBeforeIso: string,
    staleClaimBeforeIso: string,
  ): Promise<ClaimOutcome | undefined> {
    const mine = await one(
      sql,
      `INSERT INTO idempotency_keys AS k (org_id, key, request_hash, status, location, response_json, created_at)
       VALUES ($1, $2, $3, NULL, NULL, NULL, $4)
       ON CONFLICT (org_id, key) DO UPDATE
         SET request_hash = excluded.request_hash, status = NULL, location = NULL, response_json = NULL, created_at = excluded.created_at
         WHERE (k.status IS NOT NULL AND k.created_at < $5::timestamptz) OR (k.status IS NULL AND k.created_at < $6::timestamptz)
       RETURNING 1 AS claimed`,
      [orgId, key, c.requestHash, c.createdAt, expiredBeforeIso, staleClaimBeforeIso],
    );
    if (mine) return { kind: "claimed" };
    const held = await one<KeyRow>(
      sql,
      `SELECT request_hash AS "requestHash", status, location, response_json AS "responseJson", created_at AS "createdAt"
       FROM idempotency_keys WHERE org_id = $1 AND key = $2`,
      [orgId, key],
    );
    if (!held) return undefined;
    if (held.status === null || held.responseJson === null)
      return { kind: "in_flight", claim: { requestHash: held.requestHash, createdAt: held.createdAt } };
    const record: IdempotencyRecord = {
      requestHash: held.requestHash,
      status: held.status,
      location: held.location,
      responseJson: held.responseJson,
      createdAt: held.createdAt,
    };
    return { kind: "done", record };
  }

  return {
    async claim(orgId, key, c, expiredBeforeIso, staleClaimBeforeIso) {
      for (let attempt = 0; attempt < CLAIM_ATTEMPTS; attempt++) {
        const outcome = await claimOnce(orgId, key, c, expiredBeforeIso, staleClaimBeforeIso);
        if (outcome) return outcome;
      }
      throw new Error(`idempotency key ${key} kept changing hands ${CLAIM_ATTEMPTS} times in a row`);
    },
    async complete(orgId, key, r) {
      // An upsert: the claim is normally there, but a stale-claim takeover must not lose the response.
      await sql.query(
        `INSERT INTO idempotency_keys AS k (org_id, key, request_hash, status, location, response_json, created_at)
         VALUES ($1, $2, $3, $4, $5, $6, $7)
         ON CONFLICT (org_id, key) DO UPDATE SET request_hash = excluded.request_hash, status = excluded.status,
           location = excluded.location, response_json = excluded.response_json, created_at = excluded.created_at`,
        [orgId, key, r.requestHash, r.status, r.location, r.responseJson, r.createdAt],
      );
    },
    async release(orgId, key, requestHash) {
      await sql.query("DELETE FROM idempotency_keys WHERE org_id = $1 AND key = $2 AND request_hash = $3 AND status IS NULL", [
        orgId,
        key,
        requestHash,
      ]);
    },
    async purgeBefore(cutoffIso) {
      return (await sql.query("DELETE FROM idempotency_keys WHERE created_at < $1::timestamptz", [cutoffIso])).rowCount ?? 0;
    },
  };
}
