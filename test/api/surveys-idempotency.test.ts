import type { FastifyInstance } from "fastify";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Store } from "../../src/store/ports.js";
import { makeStoreApp, rowCounts } from "../helpers/db.js";
import { buildingBody, surveyBody } from "../store/fixtures.js";
import { inject } from "../helpers/auth.js";
import { sqlCount } from "../helpers/store.js";

let app: FastifyInstance;
let store: Store;
let buildingId: string;
let clock = Date.parse("2025-03-01T12:00:00.000Z");
const HOUR = 3600_000;

beforeAll(async () => {
  ({ app, store } = await makeStoreApp({}, { now: () => new Date(clock) }));
  buildingId = (await inject(app, { method: "POST", url: "/v1/buildings", payload: buildingBody() })).json().id;
});
afterAll(() => app.close());

const postSurvey = (key: string, payload: unknown) =>
  inject(app, { method: "POST", url: `/v1/buildings/${buildingId}/surveys`, payload: payload as object, headers: { "idempotency-key": key } });
const surveyCount = () => sqlCount(store, "SELECT count(*) AS n FROM surveys");

describe("Idempotency-Key", () => {
  it("same key and same body: one survey, the first response again", async () => {
    const n = await surveyCount();
    const first = await postSurvey("k-same", surveyBody());
    expect(first.statusCode).toBe(201);
    expect(first.headers["idempotent-replayed"]).toBe("false");
    const counts = await rowCounts(store);
    // same content, keys in another order
    const { loads, ...rest } = surveyBody();
    const second = await postSurvey("k-same", { loads, ...Object.fromEntries(Object.entries(rest).reverse()) });
    expect(second.statusCode).toBe(201);
    expect(second.headers["idempotent-replayed"]).toBe("true");
    expect(second.headers.location).toBe(first.headers.location);
    expect(second.json()).toEqual(first.json());
    expect(await rowCounts(store)).toEqual(counts);
    expect(await surveyCount()).toBe(n + 1);
  });

  it("same key with a different body: 422 problem, nothing written", async () => {
    await postSurvey("k-diff", surveyBody());
    const counts = await rowCounts(store);
    const res = await postSurvey("k-diff", surveyBody({ surveyor: "Someone else" }));
    expect(res.statusCode).toBe(422);
    expect(res.headers["content-type"]).toMatch(/^application\/problem\+json/);
    expect(res.json()).toMatchObject({ status: 422, errors: [{ path: "headers.idempotency-key" }] });
    expect(await rowCounts(store)).toEqual(counts);
  });

  it("the same key on another route is another request (422)", async () => {
    await postSurvey("k-route", surveyBody());
    const res = await inject(app, { method: "POST", url: "/v1/buildings", payload: surveyBody(), headers: { "idempotency-key": "k-route" } });
    expect(res.statusCode).toBe(400); // validated first: the body is not a building
    const b = await inject(app, { method: "POST", url: "/v1/buildings", payload: buildingBody(), headers: { "idempotency-key": "k-route" } });
    expect(b.statusCode).toBe(422);
  });

  it("replays building creation, PATCH and revisions too", async () => {
    const h = { "idempotency-key": "k-building" };
    const a = await inject(app, { method: "POST", url: "/v1/buildings", payload: buildingBody({ name: "Once hall" }), headers: h });
    const b = await inject(app, { method: "POST", url: "/v1/buildings", payload: buildingBody({ name: "Once hall" }), headers: h });
    expect(b.json()).toEqual(a.json());
    expect((await inject(app, "/v1/buildings?q=Once hall")).json().items).toHaveLength(1);

    const p = { method: "PATCH" as const, url: `/v1/buildings/${a.json().id}`, payload: { notes: "x" }, headers: { "idempotency-key": "k-patch" } };
    expect((await inject(app, p)).json().version).toBe(2);
    expect((await inject(app, p)).json().version).toBe(2);

    const s = (await postSurvey("k-for-rev", surveyBody())).json();
    const rev = {
      method: "POST" as const,
      url: `/v1/surveys/${s.id}/revisions`,
      payload: { ...surveyBody(), reason: "r" },
      headers: { "idempotency-key": "k-rev" },
    };
    expect((await inject(app, rev)).json().revision).toBe(2);
    expect((await inject(app, rev)).json().revision).toBe(2);
    expect((await inject(app, `/v1/surveys/${s.id}`)).json().revisions).toHaveLength(2);
  });

  it("does not store a key for a rejected request", async () => {
    const bad = surveyBody();
    bad.loads[0] = { label: "x", kind: "motor", measurement: { method: "kw_kva", kW: 90, kVA: 10 } } as never;
    expect((await postSurvey("k-rejected", bad)).statusCode).toBe(400);
    expect((await postSurvey("k-rejected", surveyBody())).statusCode).toBe(201);
  });

  it("keeps keys 48 h (README), then forgets them, purged", async () => {
    const first = await postSurvey("k-old", surveyBody());
    clock += 47 * HOUR;
    const replay = await postSurvey("k-old", surveyBody());
    expect(replay.headers["idempotent-replayed"]).toBe("true");
    expect(replay.json().id).toBe(first.json().id);
    clock += 2 * HOUR; // 49 h after the first use
    const n = await surveyCount();
    const fresh = await postSurvey("k-old", surveyBody({ surveyor: "new request after expiry" }));
    expect(fresh.statusCode).toBe(201);
    expect(fresh.json().id).not.toBe(first.json().id);
    expect(await surveyCount()).toBe(n + 1);
    // lazily purged: records older than 48 h are gone
    const old = await sqlCount(store, "SELECT count(*) AS n FROM idempotency_keys WHERE created_at < ?", [new Date(clock - 48 * HOUR).toISOString()]);
    expect(old).toBe(0);
  });

  it('takes the draft\'s quoted form: "k1" is the key k1, escapes undone', async () => {
    const bare = await postSurvey("k-quoted", surveyBody());
    expect(bare.statusCode).toBe(201);
    const counts = await rowCounts(store);
    const quoted = await postSurvey('"k-quoted"', surveyBody());
    expect(quoted.statusCode).toBe(201);
    expect(quoted.headers["idempotent-replayed"]).toBe("true");
    expect(quoted.json().id).toBe(bare.json().id);
    expect(await rowCounts(store)).toEqual(counts);
    // the other way round, with RFC 8941 escapes: "a\"b\\c" is the key a"b\c
    const first = await postSurvey('"a\\"b\\\\c"', surveyBody({ surveyor: "escaped" }));
    const again = await postSurvey('a"b\\c', surveyBody({ surveyor: "escaped" }));
    expect(again.headers["idempotent-replayed"]).toBe("true");
    expect(again.json().id).toBe(first.json().id);
  });

  it("refuses a malformed key with 400", async () => {
    // broken quoted strings: no closing quote, a stray quote inside, an escape RFC 8941 lacks, empty, parameters after it
    for (const key of ["", "x".repeat(256), "tab\there", "ünï", '"k1', '"k"1"', '"k\\n"', '""', '"k1";p=1']) {
      const res = await inject(app, { method: "POST", url: "/v1/buildings", payload: buildingBody(), headers: { "idempotency-key": key } });
      expect(res.statusCode, JSON.stringify(key)).toBe(400);
      expect(res.json().errors[0].path).toBe("headers.idempotency-key");
    }
  });
});
