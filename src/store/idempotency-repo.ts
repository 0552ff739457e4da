import type { Db } from "./database.js";

export interface IdempotencyRecord {
  requestHash: string;
  status: number;
  location: string | null;
  responseJson: string;
  createdAt: string;
}

export type IdempotencyRepo = ReturnType<typeof idempotencyRepo>;

/** The first response to each Idempotency-Key, per organisation. */
export function idempotencyRepo(db: Db) {
  const find = db.prepare(
    `SELECT request_hash AS requestHash, status, location, response_json AS responseJson, created_at AS createdAt
     FROM idempotency_keys WHERE org_id = ? AND key = ?`,
  );
  const save = db.prepare(
    `INSERT INTO idempotency_keys (org_id, key, request_hash, status, location, response_json, created_at)
     VALUES (@org_id, @key, @request_hash, @status, @location, @response_json, @created_at)
     ON CONFLICT (org_id, key) DO UPDATE SET request_hash = excluded.request_hash, status = excluded.status,
       location = excluded.location, response_json = excluded.response_json, created_at = excluded.created_at`,
  );
  const purge = db.prepare("DELETE FROM idempotency_keys WHERE created_at < ?");

  return {
    find(orgId: string, key: string): IdempotencyRecord | undefined {
      return find.get(orgId, key) as IdempotencyRecord | undefined;
    },
    /** Record (or replace an expired record of) a key. */
    save(orgId: string, key: string, r: IdempotencyRecord): void {
      save.run({
        org_id: orgId,
        key,
        request_hash: r.requestHash,
        status: r.status,
        location: r.location,
        response_json: r.responseJson,
        created_at: r.createdAt,
      });
    },
    /** Delete records created before `cutoffIso`, across organisations; returns how many. */
    purgeBefore(cutoffIso: string): number {
      return purge.run(cutoffIso).changes;
    },
  };
}
