import type { FastifyInstance } from "fastify";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Store } from "../../src/store/ports.js";
import { makeStoreApp, rowCounts } from "../helpers/db.js";
import { buildingBody, surveyBody } from "../store/fixtures.js";
import { inject } from "../helpers/auth.js";

let app: FastifyInstance;
let store: Store;
let buildingId: string;
let surveyId: string;
beforeAll(async () => {
  ({ app, store } = await makeStoreApp({ BODY_LIMIT_BYTES: 64 * 1024 }));
  buildingId = (await inject(app, { method: "POST", url: "/v1/buildings", payload: buildingBody() })).json().id;
  const s = await inject(app, {
    method: "POST",
    url: `/v1/buildings/${buildingId}/surveys`,
    payload: surveyBody(),
    headers: { "idempotency-key": "taken" },
  });
  surveyId = s.json().id;
});
afterAll(() => app.close());

describe("rejected requests change nothing", () => {
  it("leaves every table's row count unchanged after a batch of bad requests, none a 500", async () => {
    const before = await rowCounts(store);
    const json = { "content-type": "application/json" };
    const implausible = surveyBody();
    implausible.loads[2] = { label: "x", kind: "lighting", measurement: { method: "v_i_kw", volts: 400, amps: 1, kW: 99 } } as never;
    const batch = [
      { method: "POST", url: "/v1/buildings", payload: {} },
      { method: "POST", url: "/v1/buildings", payload: "{not json", headers: json },
      { method: "POST", url: "/v1/buildings", payload: "", headers: json },
      { method: "POST", url: "/v1/buildings", payload: "name=x", headers: { "content-type": "application/x-www-form-urlencoded" } },
      { method: "POST", url: "/v1/buildings", payload: JSON.stringify({ ...buildingBody(), notes: "x".repeat(70_000) }), headers: json },
      { method: "POST", url: "/v1/buildings", payload: [buildingBody()] },
      { method: "PATCH", url: `/v1/buildings/${buildingId}`, payload: { system: { voltageV: "400" } } },
      { method: "PATCH", url: `/v1/buildings/${buildingId}`, payload: {} },
      { method: "PATCH", url: "/v1/buildings/bld_none", payload: { name: "x" } },
      { method: "POST", url: `/v1/buildings/${buildingId}/surveys`, payload: { ...surveyBody(), loads: [] } },
      { method: "POST", url: `/v1/buildings/${buildingId}/surveys`, payload: implausible },
      { method: "POST", url: `/v1/buildings/${buildingId}/surveys`, payload: { ...surveyBody(), result: { site: {} } } },
      {
        method: "POST",
        url: `/v1/buildings/${buildingId}/surveys`,
        payload: surveyBody({ surveyor: "other" }),
        headers: { "idempotency-key": "taken" },
      },
      { method: "POST", url: "/v1/buildings/bld_none/surveys", payload: surveyBody() },
      { method: "POST", url: `/v1/surveys/${surveyId}/revisions`, payload: surveyBody() },
      { method: "POST", url: `/v1/surveys/${surveyId}/revisions`, payload: { ...implausible, reason: "x" } },
      { method: "POST", url: "/v1/surveys/srv_none/revisions", payload: { ...surveyBody(), reason: "x" } },
      { method: "GET", url: `/v1/buildings/${buildingId}/surveys?limit=-1` },
      { method: "GET", url: `/v1/buildings/${buildingId}/surveys?cursor=%00%01` },
      { method: "GET", url: `/v1/surveys/${surveyId}/revisions/abc` },
      { method: "DELETE", url: `/v1/surveys/${surveyId}` },
    ] as const;
    const statuses: number[] = [];
    for (const req of batch) {
      const res = await inject(app, req as never);
      statuses.push(res.statusCode);
      expect(res.statusCode, `${req.method} ${req.url}`).toBeGreaterThanOrEqual(400);
      expect(res.statusCode, `${req.method} ${req.url}`).toBeLessThan(500);
      expect(res.headers["content-type"], `${req.method} ${req.url}`).toMatch(/^application\/problem\+json/);
      const p = res.json();
      expect(typeof p.detail).toBe("string");
      expect(p.status).toBe(res.statusCode);
    }
    expect(new Set(statuses)).toEqual(new Set([400, 404, 405, 413, 415, 422])); // 405: DELETE on a survey
    expect(await rowCounts(store)).toEqual(before);
  });
});

describe("a reading far outside the system is a 400 and stores nothing (issue 11 point 9)", () => {
  it("a 120 V reading on the 400 V building: new survey and revision rejected at the field, nothing stored changes", async () => {
    // hand: 120/400 = 0.3 < 0.4 → rejected; the building is 400 V three-phase (test/store/fixtures.ts)
    const far = surveyBody();
    (far.loads[0] as { measurement: Record<string, unknown> }).measurement = { method: "v_i_pf", volts: 120, amps: 80, pf: 0.78, sense: "lagging" };
    const before = await rowCounts(store);
    const read = await inject(app, { method: "GET", url: `/v1/surveys/${surveyId}` });
    expect(read.statusCode).toBe(200);
    const latestBefore = read.body;
    for (const req of [
      { method: "POST", url: `/v1/buildings/${buildingId}/surveys`, payload: far },
      { method: "POST", url: `/v1/surveys/${surveyId}/revisions`, payload: { ...far, reason: "re-read" } },
    ] as const) {
      const res = await inject(app, req as never);
      expect(res.statusCode, req.url).toBe(400);
      expect(res.headers["content-type"]).toMatch(/^application\/problem\+json/);
      expect(res.json().errors.map((e: { path: string }) => e.path)).toContain("loads.0.measurement.volts");
    }
    expect(await rowCounts(store)).toEqual(before);
    expect((await inject(app, { method: "GET", url: `/v1/surveys/${surveyId}` })).body).toBe(latestBefore);
  });

  it("a 230 V reading of a three-phase load on the 400 V building is accepted with reading_line_to_neutral", async () => {
    // hand: 400/√3 = 230.9 V; 230 V is within 10 % of it
    const ln = surveyBody();
    (ln.loads[0] as { measurement: Record<string, unknown> }).measurement = { method: "v_i_pf", volts: 230, amps: 80, pf: 0.78, sense: "lagging" };
    const res = await inject(app, { method: "POST", url: `/v1/buildings/${buildingId}/surveys`, payload: ln });
    expect(res.statusCode).toBe(201);
    const codes = (res.json().latest?.result?.warnings ?? res.json().result?.warnings ?? []).map((w: { code: string }) => w.code);
    expect(codes).toContain("reading_line_to_neutral");
  });
});

describe("text PostgreSQL cannot store is refused on both stores, at the field", () => {
  it("U+0000 anywhere in a body, and a year outside 1900–2200, are 400s naming the field; nothing stored changes", async () => {
    // text refuses U+0000 (PostgreSQL 15 docs §8.3), jsonb its \u0000 escape (§8.14), timestamptz year 0000 (§8.5; from memory)
    const before = await rowCounts(store);
    const cases = [
      { req: { method: "POST", url: "/v1/buildings", payload: { ...buildingBody(), name: "Boiler\u0000house" } }, path: "name", reason: /NUL/ },
      { req: { method: "PATCH", url: `/v1/buildings/${buildingId}`, payload: { notes: "\u0000" } }, path: "notes", reason: /NUL/ },
      {
        req: { method: "POST", url: `/v1/buildings/${buildingId}/surveys`, payload: surveyBody({ surveyor: "A\u0000" }) },
        path: "surveyor",
        reason: /NUL/,
      },
      {
        req: {
          method: "POST",
          url: `/v1/buildings/${buildingId}/surveys`,
          payload: { ...surveyBody(), loads: surveyBody().loads.map((l, i) => (i === 1 ? { ...l, label: "x\u0000" } : l)) },
        },
        path: "loads.1.label",
        reason: /NUL/,
      },
      { req: { method: "POST", url: "/v1/sizing", payload: { "\u0000": 1 } }, path: "\u0000", reason: /NUL/ },
      {
        req: { method: "POST", url: `/v1/buildings/${buildingId}/surveys`, payload: surveyBody({ surveyedAt: "0000-01-01" }) },
        path: "surveyedAt",
        reason: /1900 and 2200/,
      },
      {
        req: { method: "POST", url: `/v1/buildings/${buildingId}/surveys`, payload: surveyBody({ surveyedAt: "9999-12-31T23:59:59Z" }) },
        path: "surveyedAt",
        reason: /1900 and 2200/,
      },
      {
        req: { method: "POST", url: `/v1/surveys/${surveyId}/revisions`, payload: { ...surveyBody({ surveyedAt: "1899-12-31" }), reason: "r" } },
        path: "surveyedAt",
        reason: /1900 and 2200/,
      },
      { req: { method: "GET", url: `/v1/buildings/${buildingId}/surveys?from=0000-01-01` }, path: "from", reason: /1900 and 2200/ },
    ];
    for (const { req, path, reason } of cases) {
      const res = await inject(app, req as never);
      expect(res.statusCode, `${req.method} ${req.url}`).toBe(400);
      const errors = res.json().errors as { path: string; message: string }[];
      expect(
        errors.map((e) => e.path),
        `${req.method} ${req.url}`,
      ).toContain(path);
      expect(errors.find((e) => e.path === path)?.message).toMatch(reason);
    }
    // the edges are accepted
    const edge = await inject(app, { method: "POST", url: `/v1/buildings/${buildingId}/surveys`, payload: surveyBody({ surveyedAt: "1900-01-01" }) });
    expect(edge.statusCode).toBe(201);
    const after = await rowCounts(store);
    expect(after.surveys).toBe((before.surveys ?? 0) + 1);
  });
});
