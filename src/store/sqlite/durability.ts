/**
 * Which COMMITs are on disk. Every COMMIT on the connection gets a number as it returns; a sync of the write-ahead
 * log that starts after COMMIT n returned makes 1..n durable, so whoever waits for n is told after that sync. One
 * sync runs at a time and serves everyone waiting when it starts; those who arrive meanwhile share the next one.
 *
 * A failed sync is final: the kernel may have dropped the pages it could not write and a retry could then report
 * success over a hole in the log, which would make every later commit unrecoverable too. So every waiter is
 * rejected, later waiters and writes are refused with the same error, and the store reports not ready: only a
 * restart (SQLite's recovery reads what really is in the file) says which commits survived.
 */

/** What a sync failure leaves behind: nothing committed since the last good sync is known to be on disk. */
export class DurabilityUnknown extends Error {
  constructor(cause: unknown) {
    super(
      `the write-ahead log could not be synced to disk (${(cause as Error)?.message ?? String(cause)}); no write is acknowledged any more: restart`,
      {
        cause,
      },
    );
    this.name = "DurabilityUnknown";
  }
}

interface Waiter {
  n: number;
  resolve: () => void;
  reject: (error: unknown) => void;
}

export class Durability {
  private committed = 0;
  private durableUpTo = 0;
  private syncing = false;
  private readonly waiters: Waiter[] = [];
  private lost: DurabilityUnknown | null = null;
  /** Syncs completed (printed by the bench beside the COMMITs). */
  syncs = 0;

  /** `syncLog` null: nothing to sync (an in-memory database), every COMMIT counts as durable when it returns. */
  constructor(private readonly syncLog: (() => Promise<void>) | null) {}

  /** The error every write and wait is refused with since a sync failed; null while all is well. */
  get failure(): DurabilityUnknown | null {
    return this.lost;
  }

  /** A COMMIT (or a plain statement's autocommit) has just returned: its number. */
  committedOne(): number {
    this.committed++;
    if (!this.syncLog) this.durableUpTo = this.committed;
    return this.committed;
  }

  /** Syncs are running or due: close() waits for them. */
  get pending(): boolean {
    return this.syncing || this.waiters.length > 0;
  }

  /**
   * Undefined when COMMIT n (by default the latest) is already durable; else a promise settled by the first sync
   * that starts after now, which is after n returned.
   */
  durable(n: number = this.committed): Promise<void> | undefined {
    if (this.lost) return Promise.reject(this.lost);
    if (n <= this.durableUpTo) return undefined;
    return new Promise<void>((resolve, reject) => {
      // n never decreases from one call to the next, so the waiters stay in order of n
      this.waiters.push({ n, resolve, reject });
      this.next();
    });
  }

  private next(): void {
    if (this.syncing || this.lost || this.waiters.length === 0 || !this.syncLog) return;
    this.syncing = true;
    const upTo = this.committed;
    this.syncLog().then(
      () => {
        this.syncing = false;
        this.syncs++;
        this.durableUpTo = upTo;
        let i = 0;
        while (i < this.waiters.length && this.waiters[i]!.n <= upTo) this.waiters[i++]!.resolve();
        this.waiters.splice(0, i);
        this.next();
      },
      (error: unknown) => {
        this.syncing = false;
        this.lost = new DurabilityUnknown(error);
        for (const w of this.waiters.splice(0)) w.reject(this.lost);
      },
    );
  }
}
