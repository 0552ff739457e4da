import { LAST_USED_EVERY_MS } from "../ports.js";
import type { ApiKeyRecord, Organisation } from "../types.js";
import type { Db } from "./database.js";

const COLUMNS = `id, org_id AS orgId, prefix, secret_sha256 AS secretSha256, role, label, created_at AS createdAt,
  created_by AS createdBy, revoked_at AS revokedAt, last_used_at AS lastUsedAt`;

/** API keys and organisations. */
export function keysRepo(db: Db) {
  const byPrefix = db.prepare(`SELECT ${COLUMNS} FROM api_keys WHERE prefix = ?`);
  const byId = db.prepare(`SELECT ${COLUMNS} FROM api_keys WHERE org_id = ? AND id = ?`);
  const list = db.prepare(`SELECT ${COLUMNS} FROM api_keys WHERE org_id = ? ORDER BY created_at, id`);
  const insert = db.prepare(
    `INSERT INTO api_keys (id, org_id, prefix, secret_sha256, role, label, created_at, created_by)
     VALUES (@id, @orgId, @prefix, @secretSha256, @role, @label, @createdAt, @createdBy)`,
  );
  const revoke = db.prepare("UPDATE api_keys SET revoked_at = ? WHERE org_id = ? AND id = ? AND revoked_at IS NULL");
  const touch = db.prepare("UPDATE api_keys SET last_used_at = ? WHERE id = ?");
  const count = db.prepare("SELECT count(*) AS n FROM api_keys");
  const activeAdmins = db.prepare("SELECT count(*) AS n FROM api_keys WHERE org_id = ? AND role = 'admin' AND revoked_at IS NULL");
  const orgByName = db.prepare("SELECT id, name, created_at AS createdAt FROM organisations WHERE name = ?");
  const orgById = db.prepare("SELECT id, name, created_at AS createdAt FROM organisations WHERE id = ?");
  const insertOrg = db.prepare("INSERT INTO organisations (id, name, created_at) VALUES (?, ?, ?)");
  return {
    findByPrefix: (prefix: string) => byPrefix.get(prefix) as ApiKeyRecord | undefined,
    get: (orgId: string, id: string) => byId.get(orgId, id) as ApiKeyRecord | undefined,
    list: (orgId: string) => list.all(orgId) as ApiKeyRecord[],
    create(k: Omit<ApiKeyRecord, "revokedAt" | "lastUsedAt">): void {
      insert.run(k);
    },
    /** True when the key was active and is now revoked. */
    revoke: (orgId: string, id: string, at: string) => revoke.run(at, orgId, id).changes === 1,
    /** Record use unless it was recorded less than a minute ago. */
    touch(k: ApiKeyRecord, now: Date): void {
      if (k.lastUsedAt && now.getTime() - Date.parse(k.lastUsedAt) < LAST_USED_EVERY_MS) return;
      touch.run(now.toISOString(), k.id);
    },
    count: () => (count.get() as { n: number }).n,
    activeAdminCount: (orgId: string) => (activeAdmins.get(orgId) as { n: number }).n,
    organisationByName: (name: string) => orgByName.get(name) as Organisation | undefined,
    organisation: (id: string) => orgById.get(id) as Organisation | undefined,
    createOrganisation(id: string, name: string, at: string): Organisation {
      insertOrg.run(id, name, at);
      return { id, name, createdAt: at };
    },
  };
}
