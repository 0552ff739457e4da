import { createHash } from "node:crypto";
import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import type { Db } from "./database.js";

/**
 * Numbered plain-SQL migrations (001_init.sql, 002_…) applied in order and recorded in
 * schema_migrations. The directory sits at the project root: ../../../migrations from both
 * src/store/sqlite/ (tsx, vitest) and dist/store/sqlite/ (compiled).
 */
export const DEFAULT_MIGRATIONS_DIR = fileURLToPath(new URL("../../../migrations/", import.meta.url));

export interface Migration {
  version: number;
  name: string;
  sql: string;
  checksum: string;
}

export interface MigrationReport {
  from: number;
  to: number;
  applied: number[];
}

export class MigrationError extends Error {
  override name = "MigrationError";
}

const FILE = /^(\d{3,})_([\w-]+)\.sql$/;

export function loadMigrations(dir: string): Migration[] {
  let files: string[];
  try {
    files = readdirSync(dir).filter((f) => f.endsWith(".sql"));
  } catch (err) {
    throw new MigrationError(`cannot read the migrations directory ${dir}: ${(err as Error).message}`);
  }
  const migrations = files.map((file) => {
    const m = FILE.exec(file);
    if (!m) throw new MigrationError(`migration file ${file} is not named NNN_name.sql`);
    const sql = readFileSync(join(dir, file), "utf8");
    return { version: Number(m[1]), name: file, sql, checksum: createHash("sha256").update(sql).digest("hex") };
  });
  migrations.sort((a, b) => a.version - b.version);
  migrations.forEach((m, i) => {
    if (m.version !== i + 1) {
      throw new MigrationError(`migrations must be numbered 1, 2, 3… without gaps or repeats; found ${m.name} at position ${i + 1}`);
    }
  });
  return migrations;
}

interface AppliedRow {
  version: number;
  name: string;
  checksum: string;
}

function appliedMigrations(db: Db): AppliedRow[] {
  const table = db.prepare("SELECT 1 FROM sqlite_master WHERE type = 'table' AND name = 'schema_migrations'").get();
  if (!table) return [];
  return db.prepare("SELECT version, name, checksum FROM schema_migrations ORDER BY version").all() as AppliedRow[];
}

/** Refuse a database this code cannot run on: a newer version, or a migration changed after it was applied. */
export function checkApplied(applied: AppliedRow[], known: Migration[]): void {
  const latest = known.length;
  for (const row of applied) {
    const mine = known[row.version - 1];
    if (!mine) {
      const dbVersion = Math.max(...applied.map((r) => r.version));
      throw new MigrationError(
        `the database is at schema version ${dbVersion} (has migration ${row.version} "${row.name}"), newer than this program, which knows versions up to ${latest}: run a newer release of pfc-sizing or restore a backup; the file was not changed`,
      );
    }
    if (mine.checksum !== row.checksum) {
      throw new MigrationError(
        `migration ${mine.name} was changed after it was applied to this database (checksum differs): restore the original file; the database was not changed`,
      );
    }
  }
}

/**
 * Bring the database to the latest version. All pending migrations run inside one
 * IMMEDIATE transaction, each under its own savepoint: a failure rolls everything back
 * and leaves the file as it was. Concurrent starters are serialised by the write lock,
 * and the applied list is read again under it.
 */
export function migrate(db: Db, dir: string = DEFAULT_MIGRATIONS_DIR, now: () => Date = () => new Date()): MigrationReport {
  const known = loadMigrations(dir);
  const before = appliedMigrations(db);
  checkApplied(before, known);
  const from = before.length;
  if (from === known.length) return { from, to: from, applied: [] };

  const applied: number[] = [];
  let current: Migration | undefined;
  let startedAt = from;
  db.exec("BEGIN IMMEDIATE");
  try {
    const rows = appliedMigrations(db);
    checkApplied(rows, known);
    startedAt = rows.length;
    db.exec(
      "CREATE TABLE IF NOT EXISTS schema_migrations (version INTEGER PRIMARY KEY, name TEXT NOT NULL, checksum TEXT NOT NULL, applied_at TEXT NOT NULL)",
    );
    const record = db.prepare("INSERT INTO schema_migrations (version, name, checksum, applied_at) VALUES (?, ?, ?, ?)");
    for (const m of known.slice(rows.length)) {
      current = m;
      db.exec(`SAVEPOINT migration_${m.version}`);
      db.exec(m.sql);
      record.run(m.version, m.name, m.checksum, now().toISOString());
      db.exec(`RELEASE migration_${m.version}`);
      applied.push(m.version);
    }
    current = undefined;
    db.exec("COMMIT");
  } catch (err) {
    if (db.inTransaction) db.exec("ROLLBACK");
    if (err instanceof MigrationError) throw err;
    const which = current ? `migration ${current.name}` : "the migration bookkeeping";
    throw new MigrationError(`${which} failed: ${(err as Error).message}; nothing was applied and the database was left as it was`);
  }
  return { from: startedAt, to: known.length, applied };
}
