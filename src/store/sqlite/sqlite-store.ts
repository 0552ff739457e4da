import type { Readiness, Repositories, Store } from "../ports.js";
import { auditRepo } from "./audit-repo.js";
import { surveyResultsRepo } from "./bank-health-repo.js";
import { buildingsRepo } from "./buildings-repo.js";
import { startCheckpointer, type Checkpointer } from "./checkpointer.js";
import { enableWal, openDatabase, type Db } from "./database.js";
import { Durability } from "./durability.js";
import { GroupCommitter, type Checkpoints, type GroupCommitStats } from "./group-commit.js";
import { idempotencyRepo } from "./idempotency-repo.js";
import { intervalAnalysesRepo } from "./interval-analyses-repo.js";
import { keysRepo } from "./keys-repo.js";
import { DEFAULT_MIGRATIONS_DIR, migrate, type MigrationReport } from "./migrate.js";
import { surveysRepo } from "./surveys-repo.js";
import { walFile } from "./wal-file.js";

export interface SqliteStoreOptions {
  /** SQLite file (its directory is created if missing) or ":memory:". */
  path: string;
  /** Where the NNN_name.sql files are; the project's migrations/ by default. */
  migrationsDir?: string;
  /** The clock for every timestamp the store writes; tests move it. */
  now?: () => Date;
  /** Runs each sync of the write-ahead log (`sync` is the real one): tests delay or fail it here. */
  syncWal?: (sync: () => Promise<void>) => Promise<void>;
  /** The least time between two checkpoints on the checkpoint thread while writes go on, ms (100 by default). */
  checkpointEveryMs?: number;
}

/** The SQLite store, with its raw handle for SQLite-only tests and the backup. */
export interface SqliteStore extends Store {
  readonly kind: "sqlite";
  readonly db: Db;
  readonly path: string;
  readonly migration: MigrationReport;
  /** How many transactions each COMMIT carried so far (group commit). */
  groupCommitStats(): GroupCommitStats;
}

/** Each method of a synchronous repository as an async one; `gate` runs first (waits for an open group). */
type Asynced<T> = { [K in keyof T]: T[K] extends (...a: infer A) => infer V ? (...a: A) => Promise<V> : never };

/** What a plain (not grouped) call waits for: before it, the open group; after it, the sync of what it saw or wrote. */
interface PlainGates {
  before: () => Promise<void> | undefined;
  /** Called just before the statement runs; returns what to call right after it. */
  around: () => () => Promise<void> | undefined;
}

function asynced<T extends object>(sync: T, gates?: PlainGates): Asynced<T> {
  const out: Record<string, unknown> = {};
  for (const [name, f] of Object.entries(sync) as [string, (...a: unknown[]) => unknown][]) {
    out[name] = !gates
      ? async (...a: unknown[]) => f(...a)
      : async (...a: unknown[]) => {
          const before = gates.before();
          if (before) await before;
          const done = gates.around();
          const value = f(...a);
          const after = done();
          if (after) await after;
          return value;
        };
  }
  return out as Asynced<T>;
}

function syncRepositories(db: Db) {
  const used = db.prepare("SELECT EXISTS (SELECT 1 FROM buildings) OR EXISTS (SELECT 1 FROM audit_log) AS used");
  return {
    buildings: buildingsRepo(db),
    surveys: { ...surveysRepo(db), ...surveyResultsRepo(db) },
    intervalAnalyses: intervalAnalysesRepo(db),
    idempotency: idempotencyRepo(db),
    audit: auditRepo(db),
    keys: keysRepo(db),
    isPristine: () => (used.get() as { used: number }).used === 0,
  };
}

function repositories(sync: ReturnType<typeof syncRepositories>, gates?: PlainGates): Repositories {
  return {
    buildings: asynced(sync.buildings, gates),
    surveys: asynced(sync.surveys, gates),
    intervalAnalyses: asynced(sync.intervalAnalyses, gates),
    idempotency: asynced(sync.idempotency, gates),
    audit: asynced(sync.audit, gates),
    keys: asynced(sync.keys, gates),
    isPristine: asynced({ isPristine: sync.isPristine }, gates).isPristine,
  };
}

/**
 * Open the database, bring it to the latest schema, and build the store: async repositories over the synchronous
 * driver on one connection. Transactions go through group commit (./group-commit.ts); a plain read waits while a
 * group is open, so it never sees another request's uncommitted rows, and its answer waits for the sync of every
 * COMMIT it could see, so nobody is shown a row that a power loss could still take back. A plain call that wrote
 * (its own autocommit: a key's last-used time, the purge of old Idempotency-Keys) counts as a COMMIT to sync.
 */
export async function openSqliteStore(options: SqliteStoreOptions): Promise<SqliteStore> {
  const db = openDatabase(options.path);
  const now = options.now ?? (() => new Date());
  const migrationsDir = options.migrationsDir ?? DEFAULT_MIGRATIONS_DIR;
  let migration: MigrationReport;
  const wal = walFile(options.path);
  const inMemory = options.path === ":memory:";
  try {
    migration = migrate(db, migrationsDir, now);
    enableWal(db);
    // the log exists once the connection has read in WAL mode; its first sync also syncs its directory entry
    db.prepare("SELECT count(*) FROM sqlite_master").get();
    if (!inMemory) await wal.sync();
  } catch (err) {
    await wal.close();
    db.close();
    throw err;
  }
  const syncWal = options.syncWal;
  const durability = new Durability(inMemory ? null : syncWal ? () => syncWal(wal.sync) : wal.sync);
  const checkpointer = inMemory ? null : startCheckpointer(options.path);
  const checkpoints = checkpointer && offLoopCheckpoints(db, checkpointer, options.checkpointEveryMs ?? CHECKPOINT_EVERY_MS);
  const sync = syncRepositories(db);
  const inTx = repositories(sync);
  const committer = new GroupCommitter<Repositories>(db, inTx, durability, checkpoints);
  const totalChanges = db.prepare("SELECT total_changes()").pluck();
  const plain = repositories(sync, {
    before: () => (committer.busy ? committer.idle() : undefined),
    around: () => {
      const changesBefore = totalChanges.get();
      return () => {
        if (totalChanges.get() !== changesBefore) {
          durability.committedOne();
          committer.wroteOutsideGroup();
        }
        return durability.durable();
      };
    },
  });
  // A claim (and its release) is a write of its own, committed before the work: through the committer it shares a
  // COMMIT, and so an fsync, with the other writes of the moment instead of blocking the event loop for one alone.
  const claims: Repositories["idempotency"] = {
    ...plain.idempotency,
    claim: (...a) => committer.run((tx) => tx.idempotency.claim(...a)),
    release: (...a) => committer.run((tx) => tx.idempotency.release(...a)),
  };
  const latestKnown = migration.to;
  const appliedVersion = db.prepare("SELECT coalesce(max(version), 0) AS v FROM schema_migrations");
  let closed = false;

  return {
    kind: "sqlite",
    location: options.path,
    db,
    path: options.path,
    migration,
    now,
    groupCommitStats: () => committer.stats(),
    ...plain,
    idempotency: claims,
    transaction: <T>(fn: (tx: Repositories) => Promise<T>) => committer.run(fn),
    // One connection per process and BEGIN IMMEDIATE takes the file's write lock: other processes wait for it.
    exclusively: <T>(fn: (tx: Repositories) => Promise<T>) => committer.run(fn),
    async readiness(): Promise<Readiness> {
      if (closed) return { databaseReachable: false, migrationsCurrent: false, detail: "the store is closed" };
      if (durability.failure) return { databaseReachable: false, migrationsCurrent: false, detail: durability.failure.message };
      try {
        await committer.idle();
        const v = (appliedVersion.get() as { v: number }).v;
        const current = v === latestKnown;
        return {
          databaseReachable: true,
          migrationsCurrent: current,
          ...(current ? {} : { detail: `schema at version ${v}, this build knows ${latestKnown}` }),
        };
      } catch (err) {
        return { databaseReachable: false, migrationsCurrent: false, detail: (err as Error).message };
      }
    },
    async close(): Promise<void> {
      if (closed) return;
      closed = true;
      await committer.drained();
      await checkpointer?.close();
      await wal.close();
      db.close();
    },
  };
}

/**
 * How often the checkpoint thread copies the log into the database while writes go on, ms: at 400 surveys/s of
 * about 90 KB each, about SQLite's own default of a checkpoint per 1000 pages (4 MB).
 */
const CHECKPOINT_EVERY_MS = 100;

/**
 * SQLite's automatic checkpoint off (it would run inside a COMMIT on the event loop), the checkpoint thread's
 * instead; should that thread fail, the automatic one comes back, so the log never grows without bound.
 */
function offLoopCheckpoints(db: Db, checkpointer: Checkpointer, everyMs: number): Checkpoints {
  db.pragma("wal_autocheckpoint = 0");
  let fellBack = false;
  return {
    everyMs,
    run: async () => {
      if (fellBack) return;
      try {
        await checkpointer.run();
      } catch {
        fellBack = true;
        db.pragma("wal_autocheckpoint = 1000");
      }
    },
  };
}

/** The SQLite store behind `store`, for what only SQLite has (its raw handle: backup, SQLite-only tests and benches). */
export function sqliteOf(store: Store): SqliteStore {
  if (store.kind !== "sqlite" || !("db" in store)) throw new Error(`this needs the SQLite store; the store is ${store.kind} at ${store.location}`);
  return store as SqliteStore;
}
