import { fileURLToPath } from "node:url";
import pg from "pg";
import { checkApplied, loadMigrations, MigrationError, type MigrationReport } from "../sqlite/migrate.js";

/** migrations/postgres/ at the project root, from src/store/postgres/ (tsx, vitest) and dist/store/postgres/ alike. */
export const POSTGRES_MIGRATIONS_DIR = fileURLToPath(new URL("../../../migrations/postgres/", import.meta.url));

/**
 * The session-level advisory lock every migrating process takes first (an arbitrary constant of our own): ten
 * instances starting at once queue on it, and each reads the applied list only once it holds it, so every
 * migration runs once.
 */
const MIGRATION_LOCK_KEY = 7_146_203_911;

const TABLE = `CREATE TABLE IF NOT EXISTS schema_migrations (
  version integer PRIMARY KEY, name text NOT NULL, checksum text NOT NULL, applied_at timestamptz NOT NULL)`;

interface AppliedRow {
  version: number;
  name: string;
  checksum: string;
}

async function appliedOf(client: pg.ClientBase): Promise<AppliedRow[]> {
  const exists = await client.query<{ t: string | null }>("SELECT to_regclass('schema_migrations')::text AS t");
  if (!exists.rows[0]?.t) return [];
  return (await client.query<AppliedRow>("SELECT version, name, checksum FROM schema_migrations ORDER BY version")).rows;
}

/** The newest applied version and the newest this build knows, without taking the lock (for /ready). */
export async function schemaVersions(
  client: pg.ClientBase | pg.Pool,
  dir: string = POSTGRES_MIGRATIONS_DIR,
): Promise<{ applied: number; known: number }> {
  const known = loadMigrations(dir).length;
  const exists = await client.query<{ t: string | null }>("SELECT to_regclass('schema_migrations')::text AS t");
  if (!exists.rows[0]?.t) return { applied: 0, known };
  const r = await client.query<{ v: number | null }>("SELECT max(version) AS v FROM schema_migrations");
  return { applied: r.rows[0]?.v ?? 0, known };
}

/**
 * Bring the database to the newest schema under the advisory lock: all pending migrations in one transaction
 * (PostgreSQL's DDL is transactional), so a failure leaves the database as it was. Refuses a database newer than
 * this build, or one whose applied migrations were edited since (checksums), as the SQLite store does.
 */
export async function migratePostgres(
  pool: pg.Pool,
  dir: string = POSTGRES_MIGRATIONS_DIR,
  now: () => Date = () => new Date(),
): Promise<MigrationReport> {
  const known = loadMigrations(dir);
  const client = await pool.connect();
  let current: string | undefined;
  try {
    await client.query("SELECT pg_advisory_lock($1)", [MIGRATION_LOCK_KEY]);
    try {
      const rows = await appliedOf(client);
      checkApplied(rows, known);
      const from = rows.length;
      if (from === known.length) return { from, to: from, applied: [] };
      const applied: number[] = [];
      await client.query("BEGIN");
      try {
        await client.query(TABLE);
        for (const m of known.slice(from)) {
          current = m.name;
          await client.query(m.sql);
          await client.query("INSERT INTO schema_migrations (version, name, checksum, applied_at) VALUES ($1, $2, $3, $4)", [
            m.version,
            m.name,
            m.checksum,
            now().toISOString(),
          ]);
          applied.push(m.version);
        }
        current = undefined;
        await client.query("COMMIT");
      } catch (err) {
        await client.query("ROLLBACK").catch(() => undefined);
        throw err;
      }
      return { from, to: known.length, applied };
    } finally {
      await client.query("SELECT pg_advisory_unlock($1)", [MIGRATION_LOCK_KEY]).catch(() => undefined);
    }
  } catch (err) {
    if (err instanceof MigrationError) throw err;
    const which = current ? `migration ${current}` : "the migration bookkeeping";
    throw new MigrationError(`${which} failed: ${(err as Error).message}; nothing was applied and the database was left as it was`);
  } finally {
    client.release();
  }
}
