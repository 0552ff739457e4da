import type { Db } from "./database.js";
import type { AuditEntry, AuditEvent } from "../types.js";

export type AuditRepo = ReturnType<typeof auditRepo>;

/** The append-only record of every write. */
export function auditRepo(db: Db) {
  const insert = db.prepare(
    `INSERT INTO audit_log (org_id, actor, action, resource_type, resource_id, request_id, at)
     VALUES (@orgId, @actor, @action, @resourceType, @resourceId, @requestId, @at)`,
  );
  const page = db.prepare(
    `SELECT id, actor, action, resource_type AS resourceType, resource_id AS resourceId, request_id AS requestId, at
     FROM audit_log WHERE org_id = @org_id AND (@before IS NULL OR id < @before) ORDER BY id DESC LIMIT @limit`,
  );
  return {
    record(e: AuditEvent): void {
      insert.run(e);
    },
    /** Newest first; `beforeId` continues after the last entry of the previous page. */
    list(orgId: string, q: { beforeId?: number; limit: number }): AuditEntry[] {
      return page.all({ org_id: orgId, before: q.beforeId ?? null, limit: q.limit }) as AuditEntry[];
    },
  };
}
