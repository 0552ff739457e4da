import type { Store } from "../../src/store/ports.js";
import { auditRepo } from "../../src/store/sqlite/audit-repo.js";
import { surveyResultsRepo } from "../../src/store/sqlite/bank-health-repo.js";
import { buildingsRepo } from "../../src/store/sqlite/buildings-repo.js";
import { idempotencyRepo } from "../../src/store/sqlite/idempotency-repo.js";
import { intervalAnalysesRepo } from "../../src/store/sqlite/interval-analyses-repo.js";
import { keysRepo } from "../../src/store/sqlite/keys-repo.js";
import { openSqliteStore, sqliteOf, type SqliteStore } from "../../src/store/sqlite/sqlite-store.js";
import { surveysRepo } from "../../src/store/sqlite/surveys-repo.js";

export interface TestStoreOptions {
  /** SQLite file for this test (a fresh temp path from tempDatabasePath()). */
  path: string;
  migrationsDir?: string;
  now?: () => Date;
}

/**
 * The ONE place the test suites get their store. Today: SQLite at `path`. To run every API suite against
 * PostgreSQL, switch here (e.g. on TEST_DATABASE_URL: a fresh schema per call through openPostgresStore).
 */
export function openTestStore(o: TestStoreOptions): Promise<Store> {
  return openSqliteStore({ path: o.path, ...(o.migrationsDir ? { migrationsDir: o.migrationsDir } : {}), ...(o.now ? { now: o.now } : {}) });
}

/** For tests that only make sense on SQLite (raw SQL, file checks): the SQLite store behind `store`. */
export function sqliteStore(store: Store): SqliteStore {
  return sqliteOf(store);
}

/** Row count of every table, to prove a rejected request changed nothing. */
export async function rowCounts(store: Store): Promise<Record<string, number>> {
  await Promise.resolve();
  const { db } = sqliteOf(store);
  const tables = db.prepare("SELECT name FROM sqlite_master WHERE type = 'table' AND name NOT LIKE 'sqlite_%' ORDER BY name").all() as { name: string }[];
  return Object.fromEntries(tables.map(({ name }) => [name, (db.prepare(`SELECT count(*) AS n FROM "${name}"`).get() as { n: number }).n]));
}

/** Rows in one table. */
export async function countRows(store: Store, table: string): Promise<number> {
  return (await rowCounts(store))[table] ?? 0;
}

/**
 * SQLite's repositories as they are under the async store: synchronous prepared statements on the raw handle,
 * with `write(fn)` one IMMEDIATE transaction. For the repository tests (test/store/), which check SQL.
 */
export async function openSqliteRepos(o: TestStoreOptions) {
  const store = await openSqliteStore({ path: o.path, ...(o.migrationsDir ? { migrationsDir: o.migrationsDir } : {}), ...(o.now ? { now: o.now } : {}) });
  const { db } = store;
  return {
    db,
    store,
    migration: store.migration,
    now: store.now,
    buildings: buildingsRepo(db),
    surveys: { ...surveysRepo(db), ...surveyResultsRepo(db) },
    intervalAnalyses: intervalAnalysesRepo(db),
    idempotency: idempotencyRepo(db),
    audit: auditRepo(db),
    keys: keysRepo(db),
    write: <T>(fn: () => T): T => db.transaction(fn).immediate(),
    close: () => store.close(),
  };
}
export type SqliteRepos = Awaited<ReturnType<typeof openSqliteRepos>>;
