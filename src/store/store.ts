import { auditRepo } from "./audit-repo.js";
import { buildingsRepo } from "./buildings-repo.js";
import { enableWal, openDatabase, type Db } from "./database.js";
import { idempotencyRepo } from "./idempotency-repo.js";
import { intervalAnalysesRepo } from "./interval-analyses-repo.js";
import { keysRepo } from "./keys-repo.js";
import { DEFAULT_MIGRATIONS_DIR, migrate, type MigrationReport } from "./migrate.js";
import { surveysRepo } from "./surveys-repo.js";

export interface StoreOptions {
  /** SQLite file (its directory is created if missing) or ":memory:". */
  path: string;
  /** Where the NNN_name.sql files are; the project's migrations/ by default. */
  migrationsDir?: string;
  /** The clock for every timestamp the store writes; tests move it. */
  now?: () => Date;
}

export interface Store {
  readonly db: Db;
  readonly path: string;
  readonly migration: MigrationReport;
  now(): Date;
  readonly buildings: ReturnType<typeof buildingsRepo>;
  readonly surveys: ReturnType<typeof surveysRepo>;
  readonly intervalAnalyses: ReturnType<typeof intervalAnalysesRepo>;
  readonly idempotency: ReturnType<typeof idempotencyRepo>;
  readonly audit: ReturnType<typeof auditRepo>;
  readonly keys: ReturnType<typeof keysRepo>;
  /** Run `fn` in one IMMEDIATE transaction: everything it writes commits together or not at all. */
  write<T>(fn: () => T): T;
  close(): void;
}

/** The first organisation (created by the first migration); the bootstrap admin key belongs to it. */
export const DEFAULT_ORG_ID = "org_default";

/** Open the database, bring it to the latest schema, and build the repositories. */
export function openStore(options: StoreOptions): Store {
  const db = openDatabase(options.path);
  const now = options.now ?? (() => new Date());
  let migration: MigrationReport;
  try {
    migration = migrate(db, options.migrationsDir ?? DEFAULT_MIGRATIONS_DIR, now);
    enableWal(db);
  } catch (err) {
    db.close();
    throw err;
  }
  let closed = false;
  return {
    db,
    path: options.path,
    migration,
    now,
    buildings: buildingsRepo(db),
    surveys: surveysRepo(db),
    intervalAnalyses: intervalAnalysesRepo(db),
    idempotency: idempotencyRepo(db),
    audit: auditRepo(db),
    keys: keysRepo(db),
    write<T>(fn: () => T): T {
      return db.transaction(fn).immediate();
    },
    close() {
      if (closed) return;
      closed = true;
      db.close();
    },
  };
}
