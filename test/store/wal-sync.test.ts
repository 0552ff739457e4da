import { statSync } from "node:fs";
import Database from "better-sqlite3";
import { afterEach, describe, expect, it, vi } from "vitest";
import { DEFAULT_ORG_ID } from "../../src/store/ports.js";
import { DurabilityUnknown } from "../../src/store/sqlite/durability.js";
import { openSqliteStore, type SqliteStore } from "../../src/store/sqlite/sqlite-store.js";
import { buildingData } from "./fixtures.js";
import { tempDatabasePath } from "../helpers/db.js";

/**
 * The store syncs SQLite's write-ahead log itself, off the event loop (src/store/sqlite/wal-file.ts): these tests
 * hold or fail each sync through the store's `syncWal` seam and check who is answered when.
 */

const ORG = DEFAULT_ORG_ID;
const at = "2025-06-01T10:00:00.000Z";
const data = buildingData;

/** Each sync the store asks for waits here until the test lets it run (the real one) or fails it. */
function heldSyncs() {
  const asked: { run: () => void; fail: (error: Error) => void }[] = [];
  const syncWal = (real: () => Promise<void>) =>
    new Promise<void>((resolve, reject) => asked.push({ run: () => void real().then(resolve, reject), fail: reject }));
  return { asked, syncWal };
}

/** A promise and whether it has settled yet. */
function watched<T>(p: Promise<T>) {
  const w = { settled: false, promise: p };
  p.then(
    () => (w.settled = true),
    () => (w.settled = true),
  );
  return w;
}

let store: SqliteStore | undefined;
let path: string;
afterEach(async () => {
  await store?.close();
  store = undefined;
});

async function open(syncWal: (real: () => Promise<void>) => Promise<void>): Promise<SqliteStore> {
  path = tempDatabasePath();
  store = await openSqliteStore({ path, syncWal });
  return store;
}

const createBuilding = (s: SqliteStore, name: string) => s.transaction((tx) => tx.buildings.create(ORG, `bld_${name}`, data(name), "test", at));

/** What another connection finds in the file: committed rows, synced or not. */
function namesInFile(): string[] {
  const other = new Database(path, { readonly: true });
  try {
    return (other.prepare("SELECT name FROM buildings ORDER BY name").all() as { name: string }[]).map((r) => r.name);
  } finally {
    other.close();
  }
}

const tick = () => new Promise((r) => setImmediate(r));

describe("SQLite: answers wait for the sync of the write-ahead log", () => {
  it("settles no caller before a sync that started after its COMMIT; a group committed during a sync waits for the next", async () => {
    const held = heldSyncs();
    const s = await open(held.syncWal);
    const first = ["a1", "a2", "a3"].map((n) => watched(createBuilding(s, n)));
    await vi.waitFor(() => expect(held.asked).toHaveLength(1));
    expect(namesInFile()).toEqual(["a1", "a2", "a3"]); // committed…
    expect(first.map((w) => w.settled)).toEqual([false, false, false]); // …but nobody is told yet

    // the next group commits while the first sync is still held
    const second = ["b1", "b2"].map((n) => watched(createBuilding(s, n)));
    await vi.waitFor(() => expect(namesInFile()).toEqual(["a1", "a2", "a3", "b1", "b2"]));
    for (let i = 0; i < 5; i++) await tick();
    expect(first.some((w) => w.settled) || second.some((w) => w.settled)).toBe(false);
    expect(held.asked).toHaveLength(1); // one sync at a time

    held.asked[0]!.run();
    await Promise.all(first.map((w) => w.promise));
    // the first sync started before the second group's COMMIT: it does not cover it
    await vi.waitFor(() => expect(held.asked).toHaveLength(2));
    for (let i = 0; i < 5; i++) await tick();
    expect(second.map((w) => w.settled)).toEqual([false, false]);
    held.asked[1]!.run();
    await Promise.all(second.map((w) => w.promise));
    expect(s.groupCommitStats()).toMatchObject({ groups: 2, transactions: 5, syncs: 2 });
  });

  it("holds a plain read's answer until the rows it could see are synced", async () => {
    const held = heldSyncs();
    const s = await open(held.syncWal);
    const write = watched(createBuilding(s, "seen"));
    await vi.waitFor(() => expect(held.asked).toHaveLength(1));
    const read = watched(s.buildings.get(ORG, "bld_seen"));
    for (let i = 0; i < 5; i++) await tick();
    expect(read.settled).toBe(false); // it saw a committed row that a power loss could still take back
    held.asked[0]!.run();
    expect(await read.promise).toMatchObject({ name: "seen" });
    await write.promise;
  });

  it("syncs a plain call's own write (an autocommit) before its caller goes on", async () => {
    const held = heldSyncs();
    const s = await open(held.syncWal);
    const purged = watched(s.idempotency.purgeBefore("2999-01-01T00:00:00.000Z"));
    for (let i = 0; i < 5; i++) await tick();
    expect(purged.settled).toBe(true); // it changed nothing: no sync to wait for
    expect(held.asked).toHaveLength(0);
    // a claim leaves a row, which the purge then deletes in its own autocommit
    const claimed = s.idempotency.claim(ORG, "k", { requestHash: "h", createdAt: at }, "1970-01-01T00:00:00.000Z", "1970-01-01T00:00:00.000Z");
    await vi.waitFor(() => expect(held.asked).toHaveLength(1));
    held.asked[0]!.run();
    await claimed;
    const purge = watched(s.idempotency.purgeBefore("2999-01-01T00:00:00.000Z"));
    await vi.waitFor(() => expect(held.asked).toHaveLength(2));
    expect(purge.settled).toBe(false);
    held.asked[1]!.run();
    expect(await purge.promise).toBe(1);
  });

  it("rejects every caller a failed sync covered, then acknowledges nothing and reports not ready", async () => {
    const held = heldSyncs();
    const s = await open(held.syncWal);
    const covered = ["c1", "c2"].map((n) => watched(createBuilding(s, n)));
    await vi.waitFor(() => expect(held.asked).toHaveLength(1));
    // a group that commits while the failing sync runs is not known to be on disk either
    const during = watched(createBuilding(s, "d1"));
    await vi.waitFor(() => expect(namesInFile()).toContain("d1"));
    held.asked[0]!.fail(Object.assign(new Error("EIO: i/o error, fdatasync"), { code: "EIO" }));

    for (const w of [...covered, during]) await expect(w.promise).rejects.toBeInstanceOf(DurabilityUnknown);
    await expect(createBuilding(s, "later")).rejects.toBeInstanceOf(DurabilityUnknown);
    await expect(s.buildings.get(ORG, "bld_c1")).rejects.toBeInstanceOf(DurabilityUnknown);
    await expect(s.idempotency.claim(ORG, "k2", { requestHash: "h", createdAt: at }, at, at)).rejects.toBeInstanceOf(DurabilityUnknown);
    expect(held.asked).toHaveLength(1); // no retry over pages the kernel may have dropped
    expect(namesInFile()).not.toContain("later");
    const ready = await s.readiness();
    expect(ready).toMatchObject({ databaseReachable: false });
    expect(ready.detail).toContain("EIO: i/o error, fdatasync");
  });

  it("counts the syncs beside the COMMITs: several COMMITs waiting for one sync share the next", async () => {
    const held = heldSyncs();
    const s = await open(held.syncWal);
    const a = createBuilding(s, "x1");
    await vi.waitFor(() => expect(held.asked).toHaveLength(1));
    const b = createBuilding(s, "x2");
    await vi.waitFor(() => expect(namesInFile()).toContain("x2"));
    const c = createBuilding(s, "x3");
    await vi.waitFor(() => expect(namesInFile()).toContain("x3"));
    held.asked[0]!.run();
    await a;
    await vi.waitFor(() => expect(held.asked).toHaveLength(2));
    held.asked[1]!.run();
    await Promise.all([b, c]);
    expect(held.asked).toHaveLength(2); // x2's and x3's COMMITs shared the second sync
    expect(s.groupCommitStats()).toMatchObject({ groups: 3, transactions: 3, syncs: 2 });
  });

  it("syncs with the real fdatasync by default, and the rows are there after a reopen", async () => {
    path = tempDatabasePath();
    store = await openSqliteStore({ path });
    await Promise.all(["r1", "r2"].map((n) => createBuilding(store!, n)));
    expect(store.groupCommitStats().syncs).toBeGreaterThanOrEqual(1);
    await store.close();
    store = await openSqliteStore({ path });
    expect((await store.buildings.list(ORG, { limit: 10 })).map((b) => b.name).sort()).toEqual(["r1", "r2"]);
  });
});

describe("SQLite: checkpoints on their own thread", () => {
  it("turns SQLite's automatic checkpoint off on the store's connection and keeps the log from growing", async () => {
    path = tempDatabasePath();
    store = await openSqliteStore({ path, checkpointEveryMs: 0 });
    expect(store.db.pragma("wal_autocheckpoint", { simple: true })).toBe(0);
    const notes = "x".repeat(100_000); // about 25 pages a write
    for (let i = 0; i < 60; i++) {
      await store.transaction((tx) => tx.buildings.create(ORG, `bld_w${i}`, { ...data(`w${i}`), notes }, "test", at));
    }
    // 60 × 100 KB is about 6 MB of log without checkpoints; copied into the database after each COMMIT, the log
    // restarts from its start and stays a few writes long
    expect(statSync(`${path}-wal`).size).toBeLessThan(1_500_000);
    expect(statSync(path).size).toBeGreaterThan(5_000_000);
  });

  it("checkpoints after plain autocommits too, when no group ever commits", async () => {
    path = tempDatabasePath();
    store = await openSqliteStore({ path, checkpointEveryMs: 0 });
    const before = store.groupCommitStats();
    const name = "o".repeat(100_000); // about 25 pages a write
    for (let i = 0; i < 40; i++) {
      const done = store.groupCommitStats().checkpoints;
      await store.keys.createOrganisation(`org_plain${i}`, `${name}${i}`, at); // a plain write: its own autocommit
      // the checkpoint it asked for ends before the next write begins, so that write restarts the log
      await vi.waitFor(() => expect(store!.groupCommitStats().checkpoints).toBeGreaterThan(done));
    }
    const after = store.groupCommitStats();
    expect(after.groups).toBe(before.groups); // no group committed: only the autocommits can have asked
    expect(after.checkpoints).toBeGreaterThan(before.checkpoints);
    // without a checkpoint the 40 writes leave about 4 MB of log (checked to fail so before the fix)
    expect(statSync(`${path}-wal`).size).toBeLessThan(1_500_000);
  });
});
