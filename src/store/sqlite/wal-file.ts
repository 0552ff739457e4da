import { open, type FileHandle } from "node:fs/promises";
import { dirname } from "node:path";

/**
 * The store's own sync of SQLite's write-ahead log, so that the fsync of a COMMIT no longer blocks the event loop.
 *
 * The connection runs `synchronous = NORMAL` in WAL mode: COMMIT writes the transaction's frames into `<db>-wal`
 * (into the kernel's page cache) and returns without syncing. The group committer then calls `sync()`, which runs
 * fdatasync on that file in libuv's thread pool while the event loop goes on (the next group may commit meanwhile),
 * and acknowledges a group only after a sync that started after its COMMIT returned (./durability.ts). Why an
 * acknowledged write is then as durable as with `synchronous = FULL` (which syncs the same file inside COMMIT):
 *
 * - fsync and fdatasync act on the file (the inode), not on the descriptor: our descriptor flushes the pages
 *   SQLite wrote through its own, as long as both name the same inode. SQLite removes `-wal` only when the last
 *   connection closes, and ours stays open for the store's life; a restart of the log after a checkpoint rewrites
 *   the same file from its start (a truncation, were one configured, keeps the inode too). So one descriptor,
 *   opened at the first sync (the file does not exist before the first write), serves for good.
 * - The file's directory entry: a file created and synced, but whose directory was not, can vanish at power loss.
 *   The first sync also fsyncs the directory, before anything is acknowledged; the entry never changes afterwards.
 * - A log restart: with NORMAL, SQLite syncs the new log header as it writes it, as FULL does. A commit's frames
 *   carry the header's salts and a running checksum; recovery keeps the frames up to the last valid commit frame,
 *   so frames that were written but not yet synced can be lost at power loss (their callers were not answered) but
 *   cannot corrupt the file, and they never precede an acknowledged commit.
 * - Checkpoints: with NORMAL, SQLite syncs the log before a checkpoint copies frames into the database and syncs the
 *   database after, as FULL does; the log restarts only over frames that a completed checkpoint put in the synced
 *   database. So a restart never overwrites frames an acknowledged commit depends on, even while our sync runs.
 *   The checkpoints run on their own thread and connection (./checkpointer.ts), also NORMAL, so the same holds.
 * - A failed sync: nothing since the last good one is known to be on disk, and a retry could succeed over pages the
 *   kernel dropped. The store refuses every later write and reports not ready (./durability.ts).
 *
 * Writes that SQLite itself commits outside the committer (a plain statement's autocommit, e.g. a key's last-used
 * time) are followed by the same sync before their caller continues (./sqlite-store.ts).
 */
export interface WalFile {
  /** fdatasync `<db>-wal` (and, the first time, its directory) off the event loop. */
  sync(): Promise<void>;
  close(): Promise<void>;
}

export function walFile(databasePath: string): WalFile {
  const path = `${databasePath}-wal`;
  let handle: Promise<FileHandle> | null = null;
  const opened = async (): Promise<FileHandle> => {
    const log = await open(path, "r");
    const dir = await open(dirname(path), "r");
    try {
      await dir.sync();
    } finally {
      await dir.close();
    }
    return log;
  };
  return {
    async sync() {
      handle ??= opened();
      await (await handle).datasync();
    },
    async close() {
      const h = handle;
      handle = null;
      if (h) await (await h.catch(() => null))?.close();
    },
  };
}
