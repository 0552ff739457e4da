import type { AuditRepository } from "../ports.js";
import type { AuditEntry } from "../types.js";
import { all, type Sql } from "./sql.js";

/** The append-only record of every write. */
export function postgresAudit(sql: Sql): AuditRepository {
  return {
    async record(e) {
      await sql.query(
        `INSERT INTO audit_log (org_id, actor, action, resource_type, resource_id, request_id, at) VALUES ($1, $2, $3, $4, $5, $6, $7)`,
        [e.orgId, e.actor, e.action, e.resourceType, e.resourceId, e.requestId, e.at],
      );
    },
    list: (orgId, q) =>
      all<AuditEntry>(
        sql,
        `SELECT id, actor, action, resource_type AS "resourceType", resource_id AS "resourceId", request_id AS "requestId", at
         FROM audit_log WHERE org_id = $1 AND ($2::bigint IS NULL OR id < $2::bigint) ORDER BY id DESC LIMIT $3`,
        [orgId, q.beforeId ?? null, q.limit],
      ),
  };
}
