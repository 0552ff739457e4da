import type { FastifyInstance } from "fastify";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Store } from "../../src/store/ports.js";
import { makeStoreApp } from "../helpers/db.js";
import { inject } from "../helpers/auth.js";
import { countRows } from "../helpers/store.js";
import { buildingBody, surveyBody } from "../store/fixtures.js";

/** The claim protocol of src/store/ports.ts seen through HTTP: one key, requests at the same moment. */

let app: FastifyInstance;
let store: Store;
let buildingId: string;
let clock = Date.parse("2025-04-01T08:00:00.000Z");

beforeAll(async () => {
  ({ app, store } = await makeStoreApp({}, { now: () => new Date(clock) }));
  buildingId = (await inject(app, { method: "POST", url: "/v1/buildings", payload: buildingBody() })).json().id;
});
afterAll(() => app.close());

const postSurvey = (key: string, payload: unknown) =>
  inject(app, { method: "POST", url: `/v1/buildings/${buildingId}/surveys`, payload: payload as object, headers: { "idempotency-key": key } });

describe("Idempotency-Key claims", () => {
  it("two requests with one key at once store one survey; the other gets 409 with Retry-After or the replay", async () => {
    const before = await countRows(store, "surveys");
    const body = surveyBody({ notes: "sent twice at once" });
    const answers = await Promise.all([postSurvey("k-twin", body), postSurvey("k-twin", body)]);
    expect(await countRows(store, "surveys")).toBe(before + 1);
    const created = answers.filter((a) => a.statusCode === 201);
    expect(created.length).toBeGreaterThanOrEqual(1);
    for (const a of answers) {
      expect([201, 409]).toContain(a.statusCode);
      if (a.statusCode === 409) {
        expect(a.headers["content-type"]).toMatch(/^application\/problem\+json/);
        expect(a.headers["retry-after"]).toBe("1");
        expect(a.json()).toMatchObject({ type: "/problems/idempotency-key-in-flight", errors: [{ path: "headers.idempotency-key" }] });
      }
    }
    const id = created[0]!.json().id;
    if (created.length === 2) expect(created[1]!.json().id).toBe(id);
    // once the first has committed, a retry is its replay
    const retry = await postSurvey("k-twin", body);
    expect(retry.statusCode).toBe(201);
    expect(retry.headers["idempotent-replayed"]).toBe("true");
    expect(retry.json().id).toBe(id);
  });

  it("ten requests with one key at once: still one survey", async () => {
    const before = await countRows(store, "surveys");
    const body = surveyBody({ notes: "sent ten times" });
    const answers = await Promise.all(Array.from({ length: 10 }, () => postSurvey("k-ten", body)));
    expect(await countRows(store, "surveys")).toBe(before + 1);
    expect(new Set(answers.filter((a) => a.statusCode === 201).map((a) => a.json().id)).size).toBe(1);
    expect(answers.every((a) => a.statusCode === 201 || a.statusCode === 409)).toBe(true);
  });

  it("a request whose work fails releases its claim: the same key then serves a corrected request", async () => {
    const before = await countRows(store, "surveys");
    // kW above kVA by more than 1 %: the engine rejects the readings (400) after the key was claimed
    const bad = surveyBody({ loads: [{ label: "Impossible", kind: "motor", measurement: { method: "kw_kva", kW: 120, kVA: 100 } }] });
    expect((await postSurvey("k-fix", bad)).statusCode).toBe(400);
    const good = await postSurvey("k-fix", surveyBody({ notes: "corrected" }));
    expect(good.statusCode).toBe(201);
    expect(good.headers["idempotent-replayed"]).toBe("false");
    expect(await countRows(store, "surveys")).toBe(before + 1);
  });

  it("another body under a key still in flight is a 422, not a 409", async () => {
    const answers = await Promise.all([postSurvey("k-mixed", surveyBody({ notes: "one" })), postSurvey("k-mixed", surveyBody({ notes: "two" }))]);
    expect(answers.map((a) => a.statusCode).sort()).toEqual([201, 422]);
  });

  it("a claim left by an instance that died is taken over after the lease", async () => {
    const t = new Date(clock).toISOString();
    // what a crashed instance leaves: a claim without an answer
    const claimed = await store.idempotency.claim(
      "org_default",
      "k-orphan",
      { requestHash: "a dead request", createdAt: t },
      "1970-01-01T00:00:00.000Z",
      "1970-01-01T00:00:00.000Z",
    );
    expect(claimed).toEqual({ kind: "claimed" });
    const during = await postSurvey("k-orphan", surveyBody());
    expect(during.statusCode).toBe(422); // another request holds the key (a different hash)
    clock += 31_000; // past the 30 s lease
    const after = await postSurvey("k-orphan", surveyBody());
    expect(after.statusCode).toBe(201);
  });
});
