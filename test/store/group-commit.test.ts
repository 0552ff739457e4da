import Database from "better-sqlite3";
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { DEFAULT_ORG_ID } from "../../src/store/ports.js";
import { openSqliteStore, type SqliteStore } from "../../src/store/sqlite/sqlite-store.js";
import { buildingData } from "./fixtures.js";
import { tempDatabasePath } from "../helpers/db.js";

const ORG = DEFAULT_ORG_ID;
const at = "2025-06-01T10:00:00.000Z";
const data = buildingData;
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

let store: SqliteStore;
let path: string;
/** Every statement run through db.exec, in order (BEGIN, SAVEPOINT, COMMIT…). */
let execs: string[];
beforeEach(async () => {
  path = tempDatabasePath();
  store = await openSqliteStore({ path });
  execs = [];
  const exec = store.db.exec.bind(store.db);
  store.db.exec = (sql: string) => {
    execs.push(sql);
    return exec(sql);
  };
});
afterEach(() => store.close());

/** What another connection (another process) sees on disk: only committed rows. */
function namesOnDisk(): string[] {
  const other = new Database(path, { readonly: true });
  try {
    return (other.prepare("SELECT name FROM buildings ORDER BY name").all() as { name: string }[]).map((r) => r.name);
  } finally {
    other.close();
  }
}

describe("SQLite group commit", () => {
  it("commits concurrent transactions together; the one that throws rolls back only its own writes", async () => {
    const outcomes = await Promise.allSettled(
      Array.from({ length: 10 }, (_, i) =>
        store.transaction(async (tx) => {
          await tx.buildings.create(ORG, `bld_${i}`, data(`hall ${i}`), "test", at);
          await tx.audit.record({
            orgId: ORG,
            actor: "test",
            action: "building.create",
            resourceType: "building",
            resourceId: `bld_${i}`,
            requestId: null,
            at,
          });
          if (i === 4) throw new Error("caller 4 fails after writing");
          return i;
        }),
      ),
    );
    expect(outcomes.map((o) => o.status)).toEqual(["fulfilled", "fulfilled", "fulfilled", "fulfilled", "rejected", ...Array(5).fill("fulfilled")]);
    expect((outcomes[4] as PromiseRejectedResult).reason).toMatchObject({ message: "caller 4 fails after writing" });
    // one BEGIN … COMMIT for all ten: one fsync instead of ten
    expect(execs.filter((s) => s === "COMMIT")).toHaveLength(1);
    expect(execs.filter((s) => s === "ROLLBACK TO one_caller")).toHaveLength(1);
    // caller 4's building and its audit entry are both gone; every other caller's pair is there
    expect(namesOnDisk()).toEqual([0, 1, 2, 3, 5, 6, 7, 8, 9].map((i) => `hall ${i}`));
    const audited = store.db.prepare("SELECT resource_id AS id FROM audit_log ORDER BY id").all() as { id: string }[];
    expect(audited.map((r) => r.id).sort()).toEqual([0, 1, 2, 3, 5, 6, 7, 8, 9].map((i) => `bld_${i}`));
  });

  it("settles no caller before the shared COMMIT has run", async () => {
    let committed = false;
    const exec = store.db.exec.bind(store.db);
    store.db.exec = (sql: string) => {
      const r = exec(sql);
      if (sql === "COMMIT") committed = true;
      return r;
    };
    const seenAtSettle: boolean[] = [];
    await Promise.allSettled(
      Array.from({ length: 5 }, (_, i) =>
        store
          .transaction(async (tx) => {
            await tx.buildings.create(ORG, `bld_s${i}`, data(`settle ${i}`), "test", at);
            if (i === 2) throw new Error("no");
          })
          .finally(() => seenAtSettle.push(committed)),
      ),
    );
    expect(seenAtSettle).toEqual([true, true, true, true, true]);
  });

  it("makes transactions asked for while a group runs wait for the next group", async () => {
    const first = store.transaction(async (tx) => {
      await tx.buildings.create(ORG, "bld_a", data("a"), "test", at);
      await sleep(30); // the group stays open: the next two callers queue
    });
    await sleep(5);
    const later = [1, 2].map((i) => store.transaction((tx) => tx.buildings.create(ORG, `bld_l${i}`, data(`later ${i}`), "test", at)));
    await Promise.all([first, ...later]);
    expect(execs.filter((s) => s === "COMMIT")).toHaveLength(2);
    expect(namesOnDisk()).toEqual(["a", "later 1", "later 2"]);
  });

  it("keeps a plain read out of an open group: it never sees rows that are then rolled back", async () => {
    const failing = store.transaction(async (tx) => {
      await tx.buildings.create(ORG, "bld_ghost", data("ghost"), "test", at);
      await sleep(30);
      throw new Error("rolled back");
    });
    await sleep(5);
    // Without the wait this read would run inside the open transaction on the one connection and see the ghost.
    const read = await store.buildings.get(ORG, "bld_ghost");
    expect(read).toBeUndefined();
    await expect(failing).rejects.toThrow("rolled back");
  });

  it("acknowledges no caller of a group whose COMMIT fails (an I/O error at the fsync): every one is told, nothing is on disk", async () => {
    const exec = store.db.exec.bind(store.db);
    let failCommit = true;
    store.db.exec = (sql: string) => {
      if (sql === "COMMIT" && failCommit) {
        failCommit = false;
        throw Object.assign(new Error("disk I/O error"), { code: "SQLITE_IOERR_FSYNC" });
      }
      return exec(sql);
    };
    const acknowledged: number[] = [];
    const outcomes = await Promise.allSettled(
      Array.from({ length: 6 }, (_, i) =>
        store
          .transaction(async (tx) => {
            await tx.buildings.create(ORG, `bld_f${i}`, data(`lost ${i}`), "test", at);
            return i;
          })
          .then((i) => acknowledged.push(i)),
      ),
    );
    expect(acknowledged).toEqual([]);
    expect(outcomes.map((o) => o.status)).toEqual(Array(6).fill("rejected"));
    for (const o of outcomes) expect((o as PromiseRejectedResult).reason).toMatchObject({ message: "disk I/O error" });
    expect(store.db.inTransaction).toBe(false);
    expect(namesOnDisk()).toEqual([]);
    expect(await store.buildings.get(ORG, "bld_f0")).toBeUndefined();
    // the next group commits as usual
    await store.transaction((tx) => tx.buildings.create(ORG, "bld_next", data("next"), "test", at));
    expect(namesOnDisk()).toEqual(["next"]);
    expect(store.groupCommitStats()).toMatchObject({ groups: 1, transactions: 1 });
  });

  it("commits Idempotency-Key claims made at once in one group, each committed before it is answered", async () => {
    const claim = (key: string) =>
      store.idempotency.claim(ORG, key, { requestHash: `h-${key}`, createdAt: at }, "1970-01-01T00:00:00.000Z", "1970-01-01T00:00:00.000Z");
    const outcomes = await Promise.all(["k1", "k2", "k3"].map(claim));
    expect(outcomes).toEqual([{ kind: "claimed" }, { kind: "claimed" }, { kind: "claimed" }]);
    expect(execs.filter((s) => s === "COMMIT")).toHaveLength(1);
    const other = new Database(path, { readonly: true });
    try {
      expect((other.prepare("SELECT count(*) AS n FROM idempotency_keys WHERE status IS NULL").get() as { n: number }).n).toBe(3);
    } finally {
      other.close();
    }
    expect(await claim("k1")).toMatchObject({ kind: "in_flight" });
  });

  it("counts the transactions each COMMIT carried", async () => {
    await Promise.all([1, 2, 3].map((i) => store.transaction((tx) => tx.buildings.create(ORG, `bld_c${i}`, data(`c${i}`), "test", at))));
    await store.transaction((tx) => tx.buildings.create(ORG, "bld_c4", data("c4"), "test", at));
    const stats = store.groupCommitStats();
    expect(stats).toMatchObject({ groups: 2, transactions: 4, largest: 3 });
    expect(stats.bySize[1]).toBe(1);
    expect(stats.bySize[3]).toBe(1);
  });

  it("fails every caller of a group whose BEGIN cannot take the write lock, and goes on afterwards", async () => {
    const other = new Database(path);
    other.pragma("busy_timeout = 0");
    other.exec("BEGIN IMMEDIATE"); // another process holds the write lock
    store.db.pragma("busy_timeout = 50");
    const blocked = await Promise.allSettled(
      [1, 2].map((i) => store.transaction((tx) => tx.buildings.create(ORG, `bld_b${i}`, data(`b${i}`), "test", at))),
    );
    expect(blocked.map((o) => o.status)).toEqual(["rejected", "rejected"]);
    other.exec("ROLLBACK");
    other.close();
    await store.transaction((tx) => tx.buildings.create(ORG, "bld_after", data("after"), "test", at));
    expect(namesOnDisk()).toEqual(["after"]);
  });
});
