import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { size } from "../../src/core/pipeline/size.js";
import { computeRevision } from "../../src/application/survey-sizing.js";
import { newId } from "../../src/store/ids.js";
import { DEFAULT_ORG_ID } from "../../src/store/ports.js";
import { openSqliteRepos as openStore, type SqliteRepos as Store } from "../helpers/store.js";
import type { BuildingData, SurveyInputs } from "../../src/store/types.js";
import { rowCounts, tempDatabasePath } from "../helpers/db.js";
import { surveyBody } from "./fixtures.js";

const ORG = DEFAULT_ORG_ID;
const OTHER = "org_other";
const data: BuildingData = {
  name: "Repo test hall",
  address: null,
  notes: null,
  system: { voltageV: 400, frequencyHz: 50, phases: 3 },
  transformer: { kVA: 800, impedancePct: 5, xOverR: 7 },
  utility: null,
  economics: null,
};
const inputs = surveyBody() as unknown as SurveyInputs;
const at = "2025-06-01T10:00:00.000Z";

let store: Store;
beforeEach(async () => {
  store = await openStore({ path: tempDatabasePath() });
  store.db.prepare("INSERT INTO organisations (id, name, created_at) VALUES (?, ?, ?)").run(OTHER, "Other org", at);
});
afterEach(() => store.close());

describe("buildings repository", () => {
  it("stores columns that read back as the same data, with version 1 in history", async () => {
    const b = store.write(() => store.buildings.create(ORG, "bld_a", data, "local", at));
    expect(b).toEqual({ id: "bld_a", version: 1, ...data, createdAt: at, updatedAt: at });
    expect(store.buildings.history(ORG, "bld_a")).toEqual([{ version: 1, data, recordedAt: at, actor: "local" }]);
  });

  it("keeps organisations apart in every read", async () => {
    store.write(() => {
      store.buildings.create(ORG, "bld_mine", data, "local", at);
      store.buildings.create(OTHER, "bld_theirs", { ...data, name: "Repo test other" }, "local", at);
    });
    expect(store.buildings.get(ORG, "bld_theirs")).toBeUndefined();
    expect(store.buildings.list(ORG, { limit: 10 }).map((b) => b.id)).toEqual(["bld_mine"]);
    expect(store.buildings.history(ORG, "bld_theirs")).toEqual([]);
    expect(store.buildings.update(ORG, "bld_theirs", 1, data, "local", at)).toBeUndefined();
  });

  it("updates only from the expected version", async () => {
    store.write(() => store.buildings.create(ORG, "bld_v", data, "local", at));
    const later = "2025-06-02T00:00:00.000Z";
    expect(store.buildings.update(ORG, "bld_v", 2, { ...data, name: "x" }, "local", later)).toBeUndefined();
    const b = store.buildings.update(ORG, "bld_v", 1, { ...data, utility: { faultMVA: 90 } }, "local", later);
    expect(b).toMatchObject({ version: 2, utility: { faultMVA: 90 }, createdAt: at, updatedAt: later });
    expect(store.buildings.history(ORG, "bld_v").map((v) => v.version)).toEqual([1, 2]);
  });

  it("searches names treating % and _ literally", async () => {
    store.write(() => {
      for (const [id, name] of [
        ["b1", "100% hall"],
        ["b2", "1000 hall"],
        ["b3", "a_b"],
        ["b4", "axb"],
      ] as const) {
        store.buildings.create(ORG, id, { ...data, name }, "local", at);
      }
    });
    expect(store.buildings.list(ORG, { q: "0%", limit: 10 }).map((b) => b.name)).toEqual(["100% hall"]);
    expect(store.buildings.list(ORG, { q: "_", limit: 10 }).map((b) => b.name)).toEqual(["a_b"]);
    expect(store.buildings.list(ORG, { q: "HALL", limit: 10 }).map((b) => b.name)).toEqual(["100% hall", "1000 hall"]); // "%" sorts before "0"
  });
});

describe("surveys repository", () => {
  function createSurvey(buildingId = "bld_s"): string {
    return store.write(() => {
      const b = store.buildings.get(ORG, buildingId) ?? store.buildings.create(ORG, buildingId, data, "local", at);
      const id = newId("srv");
      store.surveys.create(ORG, b.id, computeRevision(b, inputs, { surveyId: id, n: 1, reason: null, actor: "local", at }));
      return id;
    });
  }

  it("stores inputs, the engine's result and the building snapshot apart, with the summary in columns", async () => {
    const id = createSurvey();
    const r = store.surveys.revision(ORG, id, 1);
    expect(r?.inputs).toEqual(inputs);
    const expected = size({ ...inputs, system: data.system, transformer: data.transformer! });
    expect(expected.ok && r?.result).toEqual(expected.ok ? expected.result : null);
    expect(r?.building).toEqual({
      buildingVersion: 1,
      system: data.system,
      transformer: data.transformer,
      utility: null,
      economics: null,
      intervalAnalysisId: null,
    });
    const head = store.surveys.head(ORG, id);
    expect(head).toMatchObject({
      revision: 1,
      surveyedAtUtc: "2024-05-02T08:00:00.000Z",
      kW: r?.result.site.kW,
      kvarRequired: r?.result.correction.kvarRequired,
    });
    expect(r?.inputs).not.toHaveProperty("result");
  });

  it("appends revisions only as the next number", async () => {
    const id = createSurvey();
    const b = store.buildings.get(ORG, "bld_s")!;
    const rev = (n: number) => computeRevision(b, { ...inputs, targetPF: 0.98 }, { surveyId: id, n, reason: "typo", actor: "local", at });
    expect(store.write(() => store.surveys.revise(ORG, rev(3)))).toBe(false);
    expect(store.write(() => store.surveys.revise(ORG, rev(2)))).toBe(true);
    expect(store.surveys.head(ORG, id)?.revision).toBe(2);
    expect(store.surveys.revisions(ORG, id)).toEqual([
      { n: 1, createdAt: at, reason: null },
      { n: 2, createdAt: at, reason: "typo" },
    ]);
    expect(store.surveys.revision(OTHER, id, 1)).toBeUndefined();
  });

  it("refuses to change or delete what is recorded", async () => {
    const id = createSurvey();
    expect(() => store.db.prepare("UPDATE survey_revisions SET result_json = '{}'").run()).toThrow(/immutable/);
    expect(() => store.db.prepare("DELETE FROM survey_revisions").run()).toThrow(/never deleted/);
    expect(() => store.db.prepare("DELETE FROM surveys WHERE id = ?").run(id)).toThrow(/never deleted/);
    expect(() => store.db.prepare("UPDATE building_versions SET actor = 'x'").run()).toThrow(/immutable/);
    store.audit.record({ orgId: ORG, actor: "local", action: "x", resourceType: "y", resourceId: "z", requestId: null, at });
    expect(() => store.db.prepare("DELETE FROM audit_log").run()).toThrow(/append-only/);
  });

  it("refuses a survey whose building belongs to another organisation", async () => {
    store.write(() => store.buildings.create(OTHER, "bld_theirs", data, "local", at));
    const b = store.buildings.get(OTHER, "bld_theirs")!;
    const first = computeRevision(b, inputs, { surveyId: "srv_x", n: 1, reason: null, actor: "local", at });
    expect(() => store.write(() => store.surveys.create(ORG, "bld_theirs", first))).toThrow(/FOREIGN KEY/);
  });
});

describe("store transactions and idempotency records", () => {
  it("rolls back everything a failing write did", async () => {
    const before = await rowCounts(store.store);
    expect(() =>
      store.write(() => {
        store.buildings.create(ORG, "bld_gone", data, "local", at);
        store.audit.record({
          orgId: ORG,
          actor: "local",
          action: "building.create",
          resourceType: "building",
          resourceId: "bld_gone",
          requestId: "r1",
          at,
        });
        throw new Error("boom");
      }),
    ).toThrow("boom");
    expect(await rowCounts(store.store)).toEqual(before);
  });

  it("claims an Idempotency-Key once, completes it in place, takes a stale claim over, purges by age", async () => {
    const never = "2000-01-01T00:00:00.000Z";
    const t0 = "2025-01-01T00:00:00.000Z";
    const claim = (key: string, requestHash: string, createdAt: string, staleBefore = never, expiredBefore = never, org = ORG) =>
      store.idempotency.claim(org, key, { requestHash, createdAt }, expiredBefore, staleBefore);
    expect(claim("k", "h1", t0)).toEqual({ kind: "claimed" });
    expect(claim("k", "h2", "2025-01-01T00:00:01.000Z")).toEqual({ kind: "in_flight", claim: { requestHash: "h1", createdAt: t0 } });
    expect(claim("k", "h1", "2025-01-01T00:00:01.000Z", never, never, OTHER)).toEqual({ kind: "claimed" }); // another organisation's key
    // h1's instance died: its claim, older than the lease, is taken over; h1 can then no longer complete it
    expect(claim("k", "h3", "2025-01-01T00:01:00.000Z", "2025-01-01T00:00:30.000Z")).toEqual({ kind: "claimed" });
    const answer = { status: 201, location: "/v1/x", responseJson: '{"id":"x"}', createdAt: "2025-01-01T00:01:02.000Z" };
    expect(() => store.idempotency.complete(ORG, "k", { requestHash: "h1", ...answer })).toThrow(/lost/);
    store.idempotency.complete(ORG, "k", { requestHash: "h3", ...answer });
    store.idempotency.release(ORG, "k", "h3"); // a completed record is not released
    expect(claim("k", "h4", "2025-01-01T00:05:00.000Z", "2025-01-01T00:04:00.000Z")).toEqual({
      kind: "done",
      record: { requestHash: "h3", ...answer },
    });
    // a record older than the keep time is replaced by a new claim
    expect(claim("k", "h5", "2025-01-04T00:00:00.000Z", never, "2025-01-02T00:00:00.000Z")).toEqual({ kind: "claimed" });
    // a released claim can be claimed again at once
    expect(claim("r", "hr", t0)).toEqual({ kind: "claimed" });
    store.idempotency.release(ORG, "r", "hr");
    expect(claim("r", "hq", t0)).toEqual({ kind: "claimed" });
    // records created before the cut-off go, across organisations: OTHER's k (00:00:01) and r (t0); k (Jan 4) stays
    expect(store.idempotency.purgeBefore("2025-01-02T00:00:00.000Z")).toBe(2);
    expect(claim("k", "h6", "2025-01-04T00:00:01.000Z").kind).toBe("in_flight");
  });

  it("makes ids with their resource prefix and no repeats", async () => {
    const ids = new Set(Array.from({ length: 2000 }, () => newId("srv")));
    expect(ids.size).toBe(2000);
    for (const id of ids) expect(id).toMatch(/^srv_[0-9a-hjkmnp-tv-z]{16}$/);
  });
});
