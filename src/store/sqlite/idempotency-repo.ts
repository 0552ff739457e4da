import type { ClaimOutcome, IdempotencyClaim } from "../ports.js";
import type { IdempotencyRecord } from "../types.js";
import type { Db } from "./database.js";

interface Row {
  requestHash: string;
  status: number | null;
  location: string | null;
  responseJson: string | null;
  createdAt: string;
}

/**
 * Idempotency-Key records per organisation: a claim (no status yet) while the first request is worked, then its
 * response. `claim` reads and writes in one IMMEDIATE transaction, so two processes on one file cannot both
 * claim a key; inside an open transaction (group commit) it runs in that transaction.
 */
export function idempotencyRepo(db: Db) {
  const find = db.prepare(
    `SELECT request_hash AS requestHash, status, location, response_json AS responseJson, created_at AS createdAt
     FROM idempotency_keys WHERE org_id = ? AND key = ?`,
  );
  const putClaim = db.prepare(
    `INSERT INTO idempotency_keys (org_id, key, request_hash, status, location, response_json, created_at)
     VALUES (@org_id, @key, @request_hash, NULL, NULL, NULL, @created_at)
     ON CONFLICT (org_id, key) DO UPDATE SET request_hash = excluded.request_hash, status = NULL, location = NULL,
       response_json = NULL, created_at = excluded.created_at`,
  );
  const complete = db.prepare(
    `UPDATE idempotency_keys SET status = @status, location = @location, response_json = @response_json, created_at = @created_at
     WHERE org_id = @org_id AND key = @key AND request_hash = @request_hash AND status IS NULL`,
  );
  const release = db.prepare("DELETE FROM idempotency_keys WHERE org_id = ? AND key = ? AND request_hash = ? AND status IS NULL");
  const purge = db.prepare("DELETE FROM idempotency_keys WHERE created_at < ?");

  const claimNow = (orgId: string, key: string, c: IdempotencyClaim, expiredBeforeIso: string, staleClaimBeforeIso: string): ClaimOutcome => {
    const row = find.get(orgId, key) as Row | undefined;
    if (row && row.createdAt >= expiredBeforeIso) {
      if (row.status !== null && row.responseJson !== null) {
        const record: IdempotencyRecord = {
          requestHash: row.requestHash,
          status: row.status,
          location: row.location,
          responseJson: row.responseJson,
          createdAt: row.createdAt,
        };
        return { kind: "done", record };
      }
      if (row.createdAt >= staleClaimBeforeIso) return { kind: "in_flight", claim: { requestHash: row.requestHash, createdAt: row.createdAt } };
    }
    putClaim.run({ org_id: orgId, key, request_hash: c.requestHash, created_at: c.createdAt });
    return { kind: "claimed" };
  };
  const claimAtomically = db.transaction(claimNow);

  return {
    claim(orgId: string, key: string, c: IdempotencyClaim, expiredBeforeIso: string, staleClaimBeforeIso: string): ClaimOutcome {
      return db.inTransaction
        ? claimNow(orgId, key, c, expiredBeforeIso, staleClaimBeforeIso)
        : claimAtomically.immediate(orgId, key, c, expiredBeforeIso, staleClaimBeforeIso);
    },
    /** Store the response under our claim; throws when the claim is no longer ours (taken over as stale). */
    complete(orgId: string, key: string, r: IdempotencyRecord): void {
      const changed = complete.run({
        org_id: orgId,
        key,
        request_hash: r.requestHash,
        status: r.status,
        location: r.location,
        response_json: r.responseJson,
        created_at: r.createdAt,
      }).changes;
      if (changed !== 1) throw new Error(`the claim on Idempotency-Key "${key}" was lost before its work committed`);
    },
    release(orgId: string, key: string, requestHash: string): void {
      release.run(orgId, key, requestHash);
    },
    purgeBefore(cutoffIso: string): number {
      return purge.run(cutoffIso).changes;
    },
  };
}
