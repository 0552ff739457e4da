import { afterEach, beforeEach, expect, it } from "vitest";
import type { IntervalSummary } from "../../src/core/interval/summary.js";
import type { SizingResult } from "../../src/core/pipeline/size.js";
import type { Repositories, Store } from "../../src/store/ports.js";
import type { BuildingData, NewRevision, SurveyInputs } from "../../src/store/types.js";
import { describeEachStore, type StoreUnderTest } from "../helpers/stores.js";
import { surveyBody } from "./fixtures.js";

// The store contract (src/store/ports.ts), the same assertions against every implementation.

const ORG = "org_default"; // created by the first migration of both schemas
const OTHER = "org_contract_other";
const at = "2025-06-01T10:00:00.000Z";
const later = "2025-06-02T07:30:15.250Z";

const data: BuildingData = {
  name: "Contract hall",
  address: "4 Invented Row",
  notes: null,
  system: { voltageV: 400, frequencyHz: 50, phases: 3 },
  transformer: { kVA: 800, impedancePct: 5, xOverR: 7 },
  utility: { faultMVA: 120 },
  economics: null,
};

// A result is stored and read back as a document; its content does not matter to the store.
const result = { marker: "stored as given", figures: [1.5, -0.25, 1e-9], nested: { ok: true } } as unknown as SizingResult;

function revision(surveyId: string, n: number, surveyedAt: string, over: Partial<NewRevision> = {}): NewRevision {
  return {
    surveyId,
    n,
    reason: n === 1 ? null : `revision ${n}`,
    createdAt: at,
    actor: "contract",
    inputs: { ...(surveyBody() as unknown as SurveyInputs), surveyedAt },
    result,
    engineVersion: "test-engine",
    building: {
      buildingVersion: 1,
      system: data.system,
      transformer: data.transformer,
      utility: data.utility,
      economics: null,
      intervalAnalysisId: null,
    },
    summary: {
      kW: 100 + n,
      kvar: 60,
      kVA: 116.6,
      displacementPF: 0.857,
      kvarRequired: 27.1,
      warningCount: n,
      installedKvarInService: null,
      installedKvarDelivered: null,
    },
    surveyedAtUtc: new Date(surveyedAt).toISOString(),
    ...over,
  };
}

describeEachStore("store contract", (open) => {
  let sut: StoreUnderTest;
  let store: Store;
  beforeEach(async () => {
    sut = await open();
    store = sut.store;
    await store.keys.createOrganisation(OTHER, "Contract other org", at);
  });
  afterEach(() => sut.close());

  const withBuilding = (id = "bld_c", org = ORG, d = data) => store.transaction((tx) => tx.buildings.create(org, id, d, "contract", at));

  it("reads a building back as written, timestamps as the ISO strings given", async () => {
    const b = await withBuilding();
    expect(b).toEqual({ id: "bld_c", version: 1, ...data, createdAt: at, updatedAt: at });
    expect(await store.buildings.get(ORG, "bld_c")).toEqual(b);
    expect(await store.buildings.history(ORG, "bld_c")).toEqual([{ version: 1, data, recordedAt: at, actor: "contract" }]);
  });

  it("updates a building only from the expected version, keeping every version", async () => {
    await withBuilding();
    const next = { ...data, utility: { faultMVA: 90 } };
    expect(await store.transaction((tx) => tx.buildings.update(ORG, "bld_c", 2, next, "contract", later))).toBeUndefined();
    const b = await store.transaction((tx) => tx.buildings.update(ORG, "bld_c", 1, next, "contract", later));
    expect(b).toMatchObject({ version: 2, utility: { faultMVA: 90 }, createdAt: at, updatedAt: later });
    expect((await store.buildings.history(ORG, "bld_c")).map((v) => [v.version, v.recordedAt])).toEqual([
      [1, at],
      [2, later],
    ]);
  });

  it("lists buildings by name ignoring ASCII case, then id, in keyset pages; % and _ are literal in a search", async () => {
    const names = [
      ["b1", "beta hall"],
      ["b2", "Alpha hall"],
      ["b3", "alpha hall"],
      ["b4", "100% hall"],
      ["b5", "a_b"],
      ["b6", "axb"],
    ] as const;
    for (const [id, name] of names) await withBuilding(id, ORG, { ...data, name });
    await withBuilding("b_other", OTHER, { ...data, name: "alpha other" });
    // SQLite NOCASE: "100% hall" < "a_b" < "alpha hall" (b2, b3 by id) < "axb" < "beta hall".
    const order = ["b4", "b5", "b2", "b3", "b6", "b1"];
    const first = await store.buildings.list(ORG, { limit: 3 });
    expect(first.map((b) => b.id)).toEqual(order.slice(0, 3));
    const last = first[2];
    if (!last) throw new Error("no third building");
    const second = await store.buildings.list(ORG, { limit: 10, after: { name: last.name, id: last.id } });
    expect(second.map((b) => b.id)).toEqual(order.slice(3));
    expect((await store.buildings.list(ORG, { limit: 10, q: "%" })).map((b) => b.id)).toEqual(["b4"]);
    expect((await store.buildings.list(ORG, { limit: 10, q: "a_b" })).map((b) => b.id)).toEqual(["b5"]);
    expect((await store.buildings.list(ORG, { limit: 10, q: "ALPHA" })).map((b) => b.id)).toEqual(["b2", "b3"]);
  });

  it("keeps organisations apart in every read and write", async () => {
    await withBuilding("bld_theirs", OTHER);
    await store.transaction((tx) => tx.surveys.create(OTHER, "bld_theirs", revision("srv_theirs", 1, "2024-05-02T08:00:00Z")));
    expect(await store.buildings.get(ORG, "bld_theirs")).toBeUndefined();
    expect(await store.buildings.list(ORG, { limit: 10 })).toEqual([]);
    expect(await store.buildings.history(ORG, "bld_theirs")).toEqual([]);
    expect(await store.transaction((tx) => tx.buildings.update(ORG, "bld_theirs", 1, data, "x", later))).toBeUndefined();
    expect(await store.surveys.head(ORG, "srv_theirs")).toBeUndefined();
    expect(await store.surveys.revision(ORG, "srv_theirs", 1)).toBeUndefined();
    expect(await store.surveys.revisions(ORG, "srv_theirs")).toEqual([]);
    expect(await store.surveys.listByBuilding(ORG, "bld_theirs", { limit: 10 })).toEqual([]);
    expect(await store.transaction((tx) => tx.surveys.revise(ORG, revision("srv_theirs", 2, "2024-05-03T08:00:00Z")))).toBe(false);
    expect((await store.surveys.head(OTHER, "srv_theirs"))?.revision).toBe(1);
  });

  it("stores a survey with its revisions and moves the head to the newest", async () => {
    await withBuilding();
    const first = revision("srv_1", 1, "2024-05-02T10:00:00+02:00");
    await store.transaction((tx) => tx.surveys.create(ORG, "bld_c", first));
    const { surveyedAtUtc: _utc, ...stored } = first;
    expect(await store.surveys.revision(ORG, "srv_1", 1)).toEqual({ ...stored, buildingId: "bld_c" });
    expect(await store.surveys.head(ORG, "srv_1")).toEqual({
      id: "srv_1",
      buildingId: "bld_c",
      createdAt: at,
      revision: 1,
      surveyedAt: "2024-05-02T10:00:00+02:00",
      surveyedAtUtc: "2024-05-02T08:00:00.000Z",
      surveyor: first.inputs.surveyor,
      ...first.summary,
    });
    expect(await store.transaction((tx) => tx.surveys.revise(ORG, revision("srv_1", 3, "2024-05-02T09:00:00Z")))).toBe(false);
    expect(await store.transaction((tx) => tx.surveys.revise(ORG, revision("srv_1", 2, "2024-05-02T09:00:00Z", { createdAt: later })))).toBe(true);
    expect(await store.surveys.head(ORG, "srv_1")).toMatchObject({ revision: 2, kW: 102, surveyedAtUtc: "2024-05-02T09:00:00.000Z" });
    expect(await store.surveys.revisions(ORG, "srv_1")).toEqual([
      { n: 1, createdAt: at, reason: null },
      { n: 2, createdAt: later, reason: "revision 2" },
    ]);
  });

  it("pages surveys newest first by surveyed instant, then id, within a date range; trends oldest first", async () => {
    await withBuilding();
    const times = ["2024-01-01T00:00:00Z", "2024-02-01T00:00:00Z", "2024-02-01T00:00:00Z", "2024-03-01T00:00:00Z", "2024-04-01T00:00:00Z"];
    await store.transaction(async (tx) => {
      for (const [i, t] of times.entries()) await tx.surveys.create(ORG, "bld_c", revision(`srv_${i}`, 1, t));
    });
    const page1 = await store.surveys.listByBuilding(ORG, "bld_c", { limit: 2 });
    expect(page1.map((s) => s.id)).toEqual(["srv_4", "srv_3"]);
    const last = page1[1];
    if (!last) throw new Error("short page");
    const page2 = await store.surveys.listByBuilding(ORG, "bld_c", { limit: 2, before: { t: last.surveyedAtUtc, id: last.id } });
    expect(page2.map((s) => s.id)).toEqual(["srv_2", "srv_1"]);
    const ranged = await store.surveys.listByBuilding(ORG, "bld_c", {
      limit: 10,
      fromUtc: "2024-02-01T00:00:00.000Z",
      toUtc: "2024-03-01T00:00:00.000Z",
    });
    expect(ranged.map((s) => s.id)).toEqual(["srv_3", "srv_2", "srv_1"]);
    const trend = await store.surveys.trend(ORG, "bld_c", { limit: 3, fromUtc: "2024-01-15T00:00:00.000Z" });
    expect(trend.map((s) => s.id)).toEqual(["srv_1", "srv_2", "srv_3"]);
  });

  it("lists the latest result of surveys that had installed banks, oldest first", async () => {
    await withBuilding();
    const banks = { installedKvarInService: 50, installedKvarDelivered: 41.5 };
    await store.transaction(async (tx) => {
      await tx.surveys.create(ORG, "bld_c", revision("srv_a", 1, "2024-03-01T00:00:00Z"));
      await tx.surveys.create(ORG, "bld_c", revision("srv_b", 1, "2024-02-01T00:00:00Z", { summary: { ...revision("x", 1, at).summary, ...banks } }));
    });
    const rows = await store.surveys.withInstalledBanks(ORG, "bld_c", 10);
    expect(rows).toEqual([{ surveyId: "srv_b", surveyedAt: "2024-02-01T00:00:00Z", result, building: revision("x", 1, at).building }]);
  });

  it("refuses to change or delete what is recorded", async () => {
    await withBuilding();
    await store.transaction(async (tx) => {
      await tx.surveys.create(ORG, "bld_c", revision("srv_1", 1, "2024-05-02T08:00:00Z"));
      await tx.audit.record({ orgId: ORG, actor: "contract", action: "create", resourceType: "survey", resourceId: "srv_1", requestId: null, at });
    });
    for (const sql of [
      "UPDATE survey_revisions SET actor = 'someone else'",
      "DELETE FROM survey_revisions",
      "DELETE FROM surveys",
      "UPDATE building_versions SET actor = 'someone else'",
      "DELETE FROM building_versions",
      "UPDATE audit_log SET actor = 'someone else'",
      "DELETE FROM audit_log",
    ]) {
      await expect(sut.raw(sql), sql).rejects.toThrow(/immutable|never deleted|append-only/);
    }
    expect((await store.surveys.revision(ORG, "srv_1", 1))?.actor).toBe("contract");
    expect(await store.audit.list(ORG, { limit: 10 })).toHaveLength(1);
  });

  it("commits a transaction whole or not at all", async () => {
    await expect(
      store.transaction(async (tx) => {
        await tx.buildings.create(ORG, "bld_gone", data, "contract", at);
        await tx.audit.record({
          orgId: ORG,
          actor: "contract",
          action: "create",
          resourceType: "building",
          resourceId: "bld_gone",
          requestId: null,
          at,
        });
        throw new Error("the work failed");
      }),
    ).rejects.toThrow("the work failed");
    expect(await store.buildings.get(ORG, "bld_gone")).toBeUndefined();
    expect(await store.audit.list(ORG, { limit: 10 })).toEqual([]);
    expect(await store.isPristine()).toBe(true);
    await withBuilding();
    expect(await store.isPristine()).toBe(false);
  });

  it("runs exclusive sections one after another", async () => {
    const events: string[] = [];
    const section = (name: string) =>
      store.exclusively(async (tx: Repositories) => {
        events.push(`${name} in`);
        await tx.keys.count();
        await new Promise((r) => setTimeout(r, 50));
        events.push(`${name} out`);
      });
    await Promise.all([section("a"), section("b"), section("c")]);
    for (let i = 0; i < events.length; i += 2) expect(events[i + 1]?.replace(" out", " in")).toBe(events[i]);
  });

  {
    // The idempotency claim protocol.
    const c = (hash: string, createdAt = at) => ({ requestHash: hash, createdAt });
    const far = "2000-01-01T00:00:00.000Z";
    const record = (hash: string) => ({ requestHash: hash, status: 201, location: "/v1/x", responseJson: '{"b":1,"a":2}', createdAt: at });

    it("claims a key once; a second claim sees it in flight, then done once completed", async () => {
      expect(await store.idempotency.claim(ORG, "k1", c("h1"), far, far)).toEqual({ kind: "claimed" });
      expect(await store.idempotency.claim(ORG, "k1", c("h2"), far, far)).toEqual({ kind: "in_flight", claim: c("h1") });
      expect(await store.idempotency.claim(OTHER, "k1", c("h1"), far, far)).toEqual({ kind: "claimed" });
      await store.transaction((tx) => tx.idempotency.complete(ORG, "k1", record("h1")));
      expect(await store.idempotency.claim(ORG, "k1", c("h1"), far, far)).toEqual({ kind: "done", record: record("h1") });
    });

    it("lets exactly one of many simultaneous claims through", async () => {
      const outcomes = await Promise.all(Array.from({ length: 12 }, (_, i) => store.idempotency.claim(ORG, "k_race", c(`h${i}`), far, far)));
      expect(outcomes.filter((o) => o.kind === "claimed")).toHaveLength(1);
      expect(outcomes.filter((o) => o.kind === "in_flight")).toHaveLength(11);
    });

    it("frees a released claim, replaces an expired record and a stale claim, and purges by age", async () => {
      await store.idempotency.claim(ORG, "k_rel", c("h1"), far, far);
      await store.idempotency.release(ORG, "k_rel", "h1");
      expect(await store.idempotency.claim(ORG, "k_rel", c("h2", later), far, far)).toEqual({ kind: "claimed" });
      // Stale claim (its instance died): older than the stale-claim bound.
      expect(await store.idempotency.claim(ORG, "k_rel", c("h3", later), far, "2025-06-03T00:00:00.000Z")).toEqual({ kind: "claimed" });
      await store.idempotency.claim(ORG, "k_done", c("h1"), far, far);
      await store.idempotency.complete(ORG, "k_done", record("h1"));
      // A finished record is not taken over as a stale claim, only once expired.
      expect((await store.idempotency.claim(ORG, "k_done", c("h4", later), far, "2030-01-01T00:00:00.000Z")).kind).toBe("done");
      expect(await store.idempotency.claim(ORG, "k_done", c("h4", later), "2030-01-01T00:00:00.000Z", far)).toEqual({ kind: "claimed" });
      expect(await store.idempotency.purgeBefore("2025-06-02T00:00:00.000Z")).toBe(0);
      expect(await store.idempotency.purgeBefore("2030-01-01T00:00:00.000Z")).toBe(2);
    });
  }

  it("keeps keys and organisations", async () => {
    const key = {
      id: "key_1",
      orgId: ORG,
      prefix: "pfx1",
      secretSha256: "a".repeat(64),
      role: "admin" as const,
      label: null,
      createdAt: at,
      createdBy: "contract",
    };
    await store.transaction((tx) => tx.keys.create(key));
    expect(await store.keys.findByPrefix("pfx1")).toEqual({ ...key, revokedAt: null, lastUsedAt: null });
    expect(await store.keys.get(OTHER, "key_1")).toBeUndefined();
    expect(await store.keys.count()).toBe(1);
    expect(await store.keys.activeAdminCount(ORG)).toBe(1);
    await store.keys.touch({ ...key, revokedAt: null, lastUsedAt: null }, new Date(later));
    expect((await store.keys.get(ORG, "key_1"))?.lastUsedAt).toBe(later);
    expect(await store.transaction((tx) => tx.keys.revoke(ORG, "key_1", later))).toBe(true);
    expect(await store.transaction((tx) => tx.keys.revoke(ORG, "key_1", later))).toBe(false);
    expect(await store.keys.activeAdminCount(ORG)).toBe(0);
    expect(await store.keys.organisationByName("Contract other org")).toEqual({ id: OTHER, name: "Contract other org", createdAt: at });
    expect((await store.keys.organisation(ORG))?.name).toBe("Default organisation");
  });

  it("pages the audit log newest first, per organisation", async () => {
    await store.transaction(async (tx) => {
      for (const org of [ORG, OTHER, ORG, ORG])
        await tx.audit.record({ orgId: org, actor: "contract", action: "create", resourceType: "building", resourceId: org, requestId: "req", at });
    });
    const page = await store.audit.list(ORG, { limit: 2 });
    expect(page).toHaveLength(2);
    const [newer, older] = page;
    if (!newer || !older) throw new Error("short page");
    expect(newer.id).toBeGreaterThan(older.id);
    expect(await store.audit.list(ORG, { limit: 10, beforeId: older.id })).toHaveLength(1);
    expect(page[0]).toEqual({ id: newer.id, actor: "contract", action: "create", resourceType: "building", resourceId: ORG, requestId: "req", at });
  });

  it("stores interval analyses once and lists them newest first", async () => {
    await withBuilding();
    const summary = {
      targetPF: 0.95,
      intervalCount: 96,
      intervalMinutes: 15,
      firstTimestamp: "2024-01-01T00:00",
      lastTimestamp: "2024-01-01T23:45",
      neededKvar: { hold99PctKvar: 42.5 },
      minimumReactiveDemand: { minKvar: 3.25 },
    } as unknown as IntervalSummary;
    const made = [];
    for (const id of ["iva_1", "iva_2"]) {
      made.push(
        await store.transaction((tx) =>
          tx.intervalAnalyses.create(ORG, { id, buildingId: "bld_c", createdAt: at, actor: "contract", requestId: null, summary }),
        ),
      );
    }
    expect(made[0]).toEqual({
      id: "iva_1",
      buildingId: "bld_c",
      createdAt: at,
      actor: "contract",
      requestId: null,
      targetPF: 0.95,
      intervalCount: 96,
      intervalMinutes: 15,
      firstTimestamp: "2024-01-01T00:00",
      lastTimestamp: "2024-01-01T23:45",
      hold99PctKvar: 42.5,
      minKvar: 3.25,
      summary,
    });
    expect((await store.intervalAnalyses.newestOf(ORG, "bld_c"))?.id).toBe("iva_2");
    const list = await store.intervalAnalyses.listByBuilding(ORG, "bld_c", { limit: 1 });
    expect(list.map((e) => e.id)).toEqual(["iva_2"]);
    expect((await store.intervalAnalyses.listByBuilding(ORG, "bld_c", { limit: 5, beforeSeq: list[0]?.seq })).map((e) => e.id)).toEqual(["iva_1"]);
    expect(await store.intervalAnalyses.get(OTHER, "iva_1")).toBeUndefined();
    await expect(sut.raw("UPDATE interval_analyses SET actor = 'x'")).rejects.toThrow(/immutable/);
  });

  it("is ready once migrated, and says so", async () => {
    expect(await store.readiness()).toEqual({ databaseReachable: true, migrationsCurrent: true });
  });
});
