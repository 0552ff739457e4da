import pg from "pg";
import type { Store } from "../../src/store/ports.js";
import { auditRepo } from "../../src/store/sqlite/audit-repo.js";
import { surveyResultsRepo } from "../../src/store/sqlite/bank-health-repo.js";
import { buildingsRepo } from "../../src/store/sqlite/buildings-repo.js";
import { idempotencyRepo } from "../../src/store/sqlite/idempotency-repo.js";
import { intervalAnalysesRepo } from "../../src/store/sqlite/interval-analyses-repo.js";
import { keysRepo } from "../../src/store/sqlite/keys-repo.js";
import { openSqliteStore, sqliteOf, type SqliteStore } from "../../src/store/sqlite/sqlite-store.js";
import { surveysRepo } from "../../src/store/sqlite/surveys-repo.js";
import { openPostgresStore } from "../../src/store/postgres/store.js";
import { freshDatabase } from "./postgres.js";

export interface TestStoreOptions {
  /** SQLite file for this test (a fresh temp path from tempDatabasePath()). */
  path: string;
  migrationsDir?: string;
  now?: () => Date;
}

/** TEST_STORE=postgres (with TEST_DATABASE_URL): the suites that take their store here run on PostgreSQL. */
export const TEST_STORE_KIND: "sqlite" | "postgres" = process.env.TEST_STORE === "postgres" ? "postgres" : "sqlite";

/** Per PostgreSQL store of this file: its database's URL, for sqlRows. */
const postgresUrls = new WeakMap<Store, string>();
/** The database standing for each SQLite path, so that reopening "the same file" reopens the same database. */
const databaseOfPath = new Map<string, string>();

/**
 * The ONE place the test suites get their store: SQLite at `path`; with TEST_STORE=postgres a PostgreSQL database
 * standing for that path (fresh the first time, the same one when the path is opened again, as after a restart).
 */
export async function openTestStore(o: TestStoreOptions): Promise<Store> {
  if (TEST_STORE_KIND === "postgres") {
    const { DATABASE_URL: url = "" } = await databaseEnvFor(o.path);
    const store = await openPostgresStore({ url, poolSize: 4, statementTimeoutMs: 10_000, sslMode: "disable", ...(o.now ? { now: o.now } : {}) });
    postgresUrls.set(store, url);
    return store;
  }
  return openSqliteStore({ path: o.path, ...(o.migrationsDir ? { migrationsDir: o.migrationsDir } : {}), ...(o.now ? { now: o.now } : {}) });
}

/** What a child process (npm run keys, a server) needs in its environment to open the store `openTestStore` gave for `path`. */
export async function databaseEnvFor(path: string): Promise<Record<string, string>> {
  if (TEST_STORE_KIND !== "postgres") return { DATABASE_PATH: path };
  const base = process.env.TEST_DATABASE_URL;
  if (!base) throw new Error('TEST_STORE=postgres needs TEST_DATABASE_URL: eval "$(scripts/test-services.sh start)"');
  const url = databaseOfPath.get(path) ?? (await freshDatabase(base));
  databaseOfPath.set(path, url);
  return { DATABASE_URL: url };
}

/**
 * Rows of one SQL statement run beside the store, for what the ports do not offer (counts, stored columns).
 * Written with `?` placeholders as SQLite takes them; on PostgreSQL they become $1, $2…
 */
export async function sqlRows<R = Record<string, unknown>>(store: Store, sql: string, params: unknown[] = []): Promise<R[]> {
  const url = postgresUrls.get(store);
  if (!url)
    return sqliteOf(store)
      .db.prepare(sql)
      .all(...params) as R[];
  let n = 0;
  const client = new pg.Client({ connectionString: url });
  await client.connect();
  try {
    return (
      await client.query(
        sql.replace(/\?/g, () => `$${++n}`),
        params,
      )
    ).rows as R[];
  } finally {
    await client.end();
  }
}

/** count(*) of a query written for sqlRows. */
export async function sqlCount(store: Store, sql: string, params: unknown[] = []): Promise<number> {
  const rows = await sqlRows<Record<string, unknown>>(store, sql, params);
  return Number(Object.values(rows[0] ?? {})[0] ?? NaN);
}

/** For tests that only make sense on SQLite (raw SQL, file checks): the SQLite store behind `store`. */
export function sqliteStore(store: Store): SqliteStore {
  return sqliteOf(store);
}

/** Row count of every table, to prove a rejected request changed nothing. */
export async function rowCounts(store: Store): Promise<Record<string, number>> {
  const tables = await sqlRows<{ name: string }>(
    store,
    postgresUrls.has(store)
      ? "SELECT table_name AS name FROM information_schema.tables WHERE table_schema = 'public' ORDER BY table_name"
      : "SELECT name FROM sqlite_master WHERE type = 'table' AND name NOT LIKE 'sqlite_%' ORDER BY name",
  );
  const counts = await Promise.all(tables.map(async ({ name }) => [name, await sqlCount(store, `SELECT count(*) AS n FROM "${name}"`)] as const));
  return Object.fromEntries(counts);
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
  const store = await openSqliteStore({
    path: o.path,
    ...(o.migrationsDir ? { migrationsDir: o.migrationsDir } : {}),
    ...(o.now ? { now: o.now } : {}),
  });
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
