import { LAST_USED_EVERY_MS, type KeysRepository } from "../ports.js";
import type { ApiKeyRecord, Organisation } from "../types.js";
import { all, one, type Sql } from "./sql.js";

const COLUMNS = `id, org_id AS "orgId", prefix, secret_sha256 AS "secretSha256", role, label, created_at AS "createdAt",
  created_by AS "createdBy", revoked_at AS "revokedAt", last_used_at AS "lastUsedAt"`;
const ORG = `id, name, created_at AS "createdAt"`;

/** API keys and organisations. */
export function postgresKeys(sql: Sql): KeysRepository {
  const count = async (text: string, values: unknown[]) => (await one<{ n: number }>(sql, text, values))?.n ?? 0;
  return {
    findByPrefix: (prefix) => one<ApiKeyRecord>(sql, `SELECT ${COLUMNS} FROM api_keys WHERE prefix = $1`, [prefix]),
    get: (orgId, id) => one<ApiKeyRecord>(sql, `SELECT ${COLUMNS} FROM api_keys WHERE org_id = $1 AND id = $2`, [orgId, id]),
    list: (orgId) => all<ApiKeyRecord>(sql, `SELECT ${COLUMNS} FROM api_keys WHERE org_id = $1 ORDER BY created_at, id`, [orgId]),
    async create(k) {
      await sql.query(
        `INSERT INTO api_keys (id, org_id, prefix, secret_sha256, role, label, created_at, created_by) VALUES ($1, $2, $3, $4, $5, $6, $7, $8)`,
        [k.id, k.orgId, k.prefix, k.secretSha256, k.role, k.label, k.createdAt, k.createdBy],
      );
    },
    async revoke(orgId, id, at) {
      const r = await sql.query("UPDATE api_keys SET revoked_at = $1 WHERE org_id = $2 AND id = $3 AND revoked_at IS NULL", [at, orgId, id]);
      return r.rowCount === 1;
    },
    async touch(k, now) {
      if (k.lastUsedAt && now.getTime() - Date.parse(k.lastUsedAt) < LAST_USED_EVERY_MS) return;
      await sql.query("UPDATE api_keys SET last_used_at = $1 WHERE id = $2", [now.toISOString(), k.id]);
    },
    count: () => count("SELECT count(*) AS n FROM api_keys", []),
    activeAdminCount: (orgId) => count("SELECT count(*) AS n FROM api_keys WHERE org_id = $1 AND role = 'admin' AND revoked_at IS NULL", [orgId]),
    organisationByName: (name) => one<Organisation>(sql, `SELECT ${ORG} FROM organisations WHERE name = $1`, [name]),
    organisation: (id) => one<Organisation>(sql, `SELECT ${ORG} FROM organisations WHERE id = $1`, [id]),
    async createOrganisation(id, name, at) {
      await sql.query("INSERT INTO organisations (id, name, created_at) VALUES ($1, $2, $3)", [id, name, at]);
      return { id, name, createdAt: at };
    },
  };
}
