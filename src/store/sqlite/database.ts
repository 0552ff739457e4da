import { mkdirSync } from "node:fs";
import { dirname } from "node:path";
import Database from "better-sqlite3";

export type Db = Database.Database;

export const BUSY_TIMEOUT_MS = 5000;

/**
 * Open (creating if missing) the SQLite file and set the per-connection pragmas that do not
 * write to the file. The journal mode is switched to WAL only after migrations succeed
 * (see enableWal), so a start-up that is refused leaves a file exactly as it was.
 */
export function openDatabase(path: string): Db {
  if (path !== ":memory:") mkdirSync(dirname(path), { recursive: true });
  const db = new Database(path);
  try {
    db.pragma(`busy_timeout = ${BUSY_TIMEOUT_MS}`);
    db.pragma("foreign_keys = ON");
    db.pragma("synchronous = FULL");
  } catch (err) {
    db.close();
    throw err;
  }
  return db;
}

/**
 * WAL lets readers run beside the one writer. synchronous = NORMAL: COMMIT writes the log without syncing it, the
 * store syncs it itself off the event loop before it answers (./wal-file.ts); checkpoints still sync.
 */
export function enableWal(db: Db): void {
  db.pragma("journal_mode = WAL");
  db.pragma("synchronous = NORMAL");
}
