import type { Store } from "./ports.js";
import { redactedUrl } from "./postgres/sql.js";
import { openPostgresStore } from "./postgres/store.js";
import { openSqliteStore } from "./sqlite/sqlite-store.js";

export interface OpenStoreOptions {
  /** postgres://… or postgresql://…: PostgreSQL; unset: SQLite at databasePath. */
  databaseUrl?: string | undefined;
  databasePath: string;
  poolSize?: number;
  statementTimeoutMs?: number;
  sslMode?: "disable" | "require" | "verify-full";
  /** SQLite migrations directory, for tests. */
  migrationsDir?: string;
  now?: () => Date;
}

/** The store the configuration names: DATABASE_URL selects PostgreSQL, else the SQLite file at DATABASE_PATH. */
export function openStore(o: OpenStoreOptions): Promise<Store> {
  const now = o.now ? { now: o.now } : {};
  if (o.databaseUrl) {
    return openPostgresStore({
      url: o.databaseUrl,
      poolSize: o.poolSize ?? 10,
      statementTimeoutMs: o.statementTimeoutMs ?? 10_000,
      sslMode: o.sslMode ?? "disable",
      ...now,
    });
  }
  return openSqliteStore({ path: o.databasePath, ...(o.migrationsDir ? { migrationsDir: o.migrationsDir } : {}), ...now });
}

/** Where the store is, for messages: the URL without its password, or the file. */
export function storeLocation(o: Pick<OpenStoreOptions, "databaseUrl" | "databasePath">): string {
  return o.databaseUrl ? redactedUrl(o.databaseUrl) : o.databasePath;
}
