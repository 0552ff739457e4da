import type { Db } from "./database.js";
import type { Durability } from "./durability.js";

interface Job<R> {
  fn: (tx: R) => Promise<unknown>;
  resolve: (value: unknown) => void;
  reject: (error: unknown) => void;
  outcome?: { ok: true; value: unknown } | { ok: false; error: unknown };
}

/** Most transactions one COMMIT carries; the rest wait for the next. */
export const MAX_GROUP = 256;

/** Checkpoints off the event loop (./checkpointer.ts), each at least this long after the last one ended. */
export interface Checkpoints {
  run: () => Promise<void>;
  everyMs: number;
}

/** What the groups carried so far: how well concurrent writes share a COMMIT (printed by the bench). */
export interface GroupCommitStats {
  /** COMMITs run (groups whose BEGIN failed are not counted). */
  groups: number;
  /** Transactions those COMMITs carried. */
  transactions: number;
  /** The most one COMMIT carried. */
  largest: number;
  /** bySize[n]: groups that carried n transactions (index 0 unused). */
  bySize: number[];
  /** Checkpoints the checkpoint thread has finished (or given up on). */
  checkpoints: number;
  /** Syncs of the write-ahead log completed (several COMMITs may share one). */
  syncs: number;
}

/**
 * Group commit on one better-sqlite3 connection. Transactions asked for while another group runs wait in a queue; the
 * next turn of the event loop runs all of them in one BEGIN IMMEDIATE … COMMIT, each inside its own SAVEPOINT, so one
 * that throws rolls back only its own writes. COMMIT only writes the log (synchronous = NORMAL); every caller's
 * promise settles after a sync of the log that started after the shared COMMIT returned (./durability.ts,
 * ./wal-file.ts), so nothing is acknowledged before it is durable. The sync runs off the event loop, and the next
 * group may commit while it runs; groups committed meanwhile share the next sync.
 *
 * While a group is open no other statement may run on the connection (it would join the open transaction):
 * `idle()` is what plain reads await first.
 */
export class GroupCommitter<R> {
  private readonly queue: Job<R>[] = [];
  private scheduled = false;
  private open: Promise<void> | null = null;
  private readonly counts: Omit<GroupCommitStats, "syncs"> = { groups: 0, transactions: 0, largest: 0, bySize: [], checkpoints: 0 };
  private checkpointing: Promise<void> | null = null;
  private lastCheckpoint = performance.now();

  constructor(
    private readonly db: Db,
    private readonly tx: R,
    private readonly durability: Durability,
    private readonly checkpoints: Checkpoints | null = null,
  ) {}

  /** A copy of the counts so far. */
  stats(): GroupCommitStats {
    return { ...this.counts, bySize: [...this.counts.bySize], syncs: this.durability.syncs };
  }

  /** True while a group's transaction is open. */
  get busy(): boolean {
    return this.open !== null;
  }

  /** Resolves when no group is open (at once when none is). */
  async idle(): Promise<void> {
    while (this.open) await this.open;
  }

  /** Resolves when the queue is empty, no group is open and every committed group has been answered. */
  async drained(): Promise<void> {
    while (this.open || this.checkpointing || this.queue.length > 0 || this.scheduled || this.durability.pending) {
      await (this.open ?? this.checkpointing ?? new Promise((r) => setImmediate(r)));
    }
  }

  run<T>(fn: (tx: R) => Promise<T>): Promise<T> {
    const lost = this.durability.failure;
    if (lost) return Promise.reject(lost);
    return new Promise<T>((resolve, reject) => {
      this.queue.push({ fn, resolve: resolve as (v: unknown) => void, reject });
      this.schedule();
    });
  }

  private schedule(): void {
    // no group during a checkpoint: the log restarts only if a write transaction begins with every frame copied
    if (this.scheduled || this.open || this.checkpointing) return;
    this.scheduled = true;
    // setImmediate, not a microtask: requests whose bodies arrived while the last group ran get to queue first.
    setImmediate(() => {
      this.scheduled = false;
      void this.runGroup();
    });
  }

  private async runGroup(): Promise<void> {
    const jobs = this.queue.splice(0, MAX_GROUP);
    if (jobs.length === 0) return;
    const lost = this.durability.failure;
    if (lost) {
      for (const j of [...jobs, ...this.queue.splice(0)]) j.reject(lost);
      return;
    }
    let done!: () => void;
    this.open = new Promise<void>((r) => (done = r));
    try {
      await this.commitGroup(jobs);
    } finally {
      this.open = null;
      done();
      if (this.queue.length > 0) this.schedule();
    }
  }

  /**
   * A plain statement outside any group has just written (an autocommit): its frames count toward a checkpoint
   * too, or a service whose only writes are autocommits would grow the log without bound (the automatic
   * checkpoint is off, ./sqlite-store.ts).
   */
  wroteOutsideGroup(): void {
    if (!this.open) this.checkpointIfDue();
  }

  private checkpointIfDue(): void {
    const c = this.checkpoints;
    if (!c || this.checkpointing || performance.now() - this.lastCheckpoint < c.everyMs) return;
    this.checkpointing = c.run().finally(() => {
      this.counts.checkpoints++;
      this.checkpointing = null;
      this.lastCheckpoint = performance.now();
      if (this.queue.length > 0) this.schedule();
    });
  }

  private count(n: number): void {
    const c = this.counts;
    c.groups++;
    c.transactions += n;
    c.largest = Math.max(c.largest, n);
    c.bySize[n] = (c.bySize[n] ?? 0) + 1;
  }

  private async commitGroup(jobs: Job<R>[]): Promise<void> {
    const failAll = (error: unknown) => {
      if (this.db.inTransaction) this.db.exec("ROLLBACK");
      for (const j of jobs) j.reject(error);
    };
    try {
      this.db.exec("BEGIN IMMEDIATE");
    } catch (error) {
      failAll(error);
      return;
    }
    for (const job of jobs) {
      try {
        this.db.exec("SAVEPOINT one_caller");
        job.outcome = { ok: true, value: await job.fn(this.tx) };
        this.db.exec("RELEASE one_caller");
      } catch (error) {
        job.outcome = { ok: false, error };
        try {
          this.db.exec("ROLLBACK TO one_caller");
          this.db.exec("RELEASE one_caller");
        } catch (lost) {
          // SQLite itself ended the transaction (e.g. disk full): the whole group is lost.
          failAll(this.db.inTransaction ? lost : error);
          return;
        }
      }
    }
    try {
      this.db.exec("COMMIT");
    } catch (error) {
      failAll(error);
      return;
    }
    this.count(jobs.length);
    this.checkpointIfDue();
    const settle = () => {
      for (const j of jobs) {
        const o = j.outcome;
        if (o?.ok) j.resolve(o.value);
        else j.reject(o?.error);
      }
    };
    const durable = this.durability.durable(this.durability.committedOne());
    if (!durable) {
      settle();
      return;
    }
    // not awaited: the next group may run while this one's sync is in flight
    durable.then(settle, (lost: unknown) => {
      for (const j of jobs) j.reject(lost);
    });
  }
}
