import { createRequire } from "node:module";
import { Worker } from "node:worker_threads";

/**
 * Checkpoints on a worker thread with its own connection, so that copying the log into the database and the two
 * fsyncs around it (with synchronous = NORMAL SQLite syncs the log before a checkpoint and the database after) no
 * longer run inside a COMMIT on the event loop, as SQLite's automatic checkpoint does. Measured on the 2-core bench
 * machine with 20-load surveys: COMMIT took 0.34–0.57 ms of the event loop per survey with the automatic checkpoint
 * and 0.12–0.25 ms without, and a COMMIT that checkpointed held the loop up to 20–40 ms.
 *
 * PASSIVE: it copies what it can without waiting for the writer or readers. The log restarts from its start only
 * when a write transaction begins with every frame copied, so the group committer starts no group while a
 * checkpoint runs (./group-commit.ts); the event loop meanwhile goes on parsing and sizing.
 *
 * The worker is plain JavaScript evaluated from a string: it needs only the driver, and so runs the same from the
 * sources and from dist/.
 */
const WORKER = `
const { parentPort, workerData } = require("node:worker_threads");
const Database = require(workerData.driver);
const db = new Database(workerData.path);
db.pragma("busy_timeout = ${5000}");
db.pragma("synchronous = NORMAL");
parentPort.on("message", (m) => {
  if (m === "close") {
    db.close();
    parentPort.close();
    return;
  }
  try {
    const [r] = db.pragma("wal_checkpoint(PASSIVE)");
    parentPort.postMessage({ ok: true, busy: r.busy, log: r.log, copied: r.checkpointed });
  } catch (error) {
    parentPort.postMessage({ ok: false, message: String(error && error.message) });
  }
});
`;

export interface CheckpointOutcome {
  /** Frames in the log, and how many of them are now in the database. */
  log: number;
  copied: number;
}

export interface Checkpointer {
  /** One PASSIVE checkpoint on the worker's connection. */
  run(): Promise<CheckpointOutcome>;
  close(): Promise<void>;
}

export function startCheckpointer(databasePath: string): Checkpointer {
  const driver = createRequire(import.meta.url).resolve("better-sqlite3");
  const worker = new Worker(WORKER, { eval: true, workerData: { driver, path: databasePath } });
  // the thread keeps the process alive only while a checkpoint or its close is awaited
  worker.unref();
  let waiting: { resolve: (o: CheckpointOutcome) => void; reject: (e: Error) => void } | null = null;
  let broken: Error | null = null;
  const fail = (error: Error) => {
    broken ??= error;
    waiting?.reject(error);
    waiting = null;
  };
  worker.on("message", (m: { ok: true; log: number; copied: number } | { ok: false; message: string }) => {
    const w = waiting;
    waiting = null;
    worker.unref();
    if (!w) return;
    if (m.ok) w.resolve({ log: m.log, copied: m.copied });
    else w.reject(new Error(`checkpoint failed: ${m.message}`));
  });
  worker.on("error", fail);
  worker.on("exit", () => fail(new Error("the checkpoint thread stopped")));
  return {
    run() {
      if (broken) return Promise.reject(broken);
      if (waiting) return Promise.reject(new Error("a checkpoint is already running"));
      return new Promise<CheckpointOutcome>((resolve, reject) => {
        waiting = { resolve, reject };
        worker.ref();
        worker.postMessage("checkpoint");
      });
    },
    async close() {
      if (broken) return;
      broken = new Error("the checkpoint thread is closed");
      const exited = new Promise((r) => worker.once("exit", r));
      worker.ref();
      worker.postMessage("close");
      await exited;
    },
  };
}
