import { existsSync, mkdirSync } from "node:fs";
import { dirname, resolve } from "node:path";
import Database from "better-sqlite3";

export interface BackupOutcome {
  file: string;
  pages: number;
  integrity: string;
}

/**
 * Copy a live database with SQLite's online backup (consistent even while the server writes),
 * then check the copy. Only reads the source. Refuses to overwrite an existing file.
 */
export async function backupDatabase(sourcePath: string, targetPath: string): Promise<BackupOutcome> {
  const file = resolve(targetPath);
  if (!existsSync(sourcePath)) throw new Error(`no database at ${sourcePath}`);
  if (existsSync(file)) throw new Error(`${file} already exists; choose a new file name`);
  if (resolve(sourcePath) === file) throw new Error("the backup file must differ from the database");
  mkdirSync(dirname(file), { recursive: true });
  const source = new Database(sourcePath, { fileMustExist: true });
  let pages: number;
  try {
    source.pragma("busy_timeout = 5000");
    pages = (await source.backup(file)).totalPages;
  } finally {
    source.close();
  }
  const copy = new Database(file, { fileMustExist: true });
  try {
    // A single self-contained file: no -wal beside it to forget when restoring.
    copy.pragma("journal_mode = DELETE");
    const integrity = String(copy.pragma("integrity_check", { simple: true }));
    if (integrity !== "ok") throw new Error(`the backup at ${file} fails its integrity check: ${integrity}`);
    return { file, pages, integrity };
  } finally {
    copy.close();
  }
}
