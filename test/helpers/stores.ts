import { describe } from "vitest";
import pg from "pg";
import { openSqliteStore, sqliteOf } from "../../src/store/sqlite/sqlite-store.js";
import { tempDatabasePath } from "./db.js";
import { openPostgresStore } from "../../src/store/postgres/store.js";
import type { Store } from "../../src/store/ports.js";
import { describePostgres, freshDatabase } from "./postgres.js";

/** A store on a fresh database, with a raw statement runner for what the ports do not offer (tampering tests). */
export interface StoreUnderTest {
  store: Store;
  /** Run one SQL statement outside the store's repositories; rejects as the database does. */
  raw(sql: string): Promise<void>;
  close(): Promise<void>;
}

async function openPostgres(baseUrl: string, now?: () => Date): Promise<StoreUnderTest> {
  const url = await freshDatabase(baseUrl);
  const store = await openPostgresStore({ url, poolSize: 4, statementTimeoutMs: 10_000, sslMode: "disable", ...(now ? { now } : {}) });
  return {
    store,
    async raw(sql) {
      const client = new pg.Client({ connectionString: url });
      await client.connect();
      try {
        await client.query(sql);
      } finally {
        await client.end();
      }
    },
    close: () => store.close(),
  };
}

/**
 * Run `body` once per store: SQLite always, PostgreSQL when TEST_DATABASE_URL is set (skipped locally without it,
 * failing under CI=true). `open` gives a store on a fresh, empty database each time it is called.
 */
async function openSqlite(now?: () => Date): Promise<StoreUnderTest> {
  const store = await openSqliteStore({ path: tempDatabasePath(), ...(now ? { now } : {}) });
  return {
    store,
    async raw(sql) {
      await Promise.resolve();
      sqliteOf(store).db.exec(sql);
    },
    close: () => store.close(),
  };
}

export function describeEachStore(name: string, body: (open: (now?: () => Date) => Promise<StoreUnderTest>) => void): void {
  describe(`${name} (sqlite)`, () => body(openSqlite));
  describePostgres(`${name} (postgres)`, (baseUrl) => body((now) => openPostgres(baseUrl, now)));
}
