import type { FastifyInstance } from "fastify";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { intervalDemandOf } from "../../src/core/interval/stored-demand.js";
import { size } from "../../src/core/pipeline/size.js";
import { engineInputOf } from "../../src/application/survey-sizing.js";
import type { Store } from "../../src/store/ports.js";
import { csvOfSeries, syntheticYear } from "../core/interval/fixtures.js";
import { makeStoreApp, rowCounts } from "../helpers/db.js";
import { buildingBody, surveyBody } from "../store/fixtures.js";
import { api, inject } from "../helpers/auth.js";

let app: FastifyInstance;
let store: Store;
let buildingId: string;
let otherBuildingId: string;
beforeAll(async () => {
  ({ app, store } = await makeStoreApp());
  const tariff = { currency: "EUR", tariff: { form: "kva_demand", chargePerKVA: 8 } };
  buildingId = (
    await inject(app, { method: "POST", url: "/v1/buildings", payload: buildingBody({ name: "Interval hall", economics: tariff }) })
  ).json().id;
  otherBuildingId = (await inject(app, { method: "POST", url: "/v1/buildings", payload: buildingBody({ name: "Other hall" }) })).json().id;
});
afterAll(() => app.close());

const CSV = { "content-type": "text/csv" };
/** January 2025, 15-minute intervals: 00–08 h 200 kW / 100 kvar, 08–24 h 600 kW / 450 kvar (invented). */
const january = csvOfSeries(
  syntheticYear(96, (k) => (k < 32 ? { kW: 200, kvar: 100 } : { kW: 600, kvar: 450 }), 31),
  "Interval Start,Demand kW,kVAr",
);
/** A week of hourly data at a flat 300 kW / 200 kvar (invented). */
const flatWeek = csvOfSeries(syntheticYear(24, () => ({ kW: 300, kvar: 200 }), 7));

const attach = (csv: string, query = "", b = buildingId, headers: Record<string, string> = CSV) =>
  inject(app, { method: "POST", url: `/v1/buildings/${b}/interval-analyses${query}`, headers, payload: csv });
const postSurvey = (payload: unknown, b = buildingId) =>
  inject(app, { method: "POST", url: `/v1/buildings/${b}/surveys`, payload: payload as object });

describe("POST /v1/buildings/{id}/interval-analyses", () => {
  it("stores the analysis: 201 with id, buildingId and the same analysis as the stateless route", async () => {
    const res = await attach(flatWeek, "?timeZone=UTC");
    expect(res.statusCode).toBe(201);
    const body = res.json();
    expect(body.id).toMatch(/^iva_/);
    expect(body.buildingId).toBe(buildingId);
    expect(res.headers.location).toBe(`/v1/interval-analyses/${body.id}`);
    const stateless = (await inject(app, { method: "POST", url: "/v1/interval-analyses?timeZone=UTC", headers: CSV, payload: flatWeek })).json();
    const { id: _i, buildingId: _b, createdAt: _c, ...analysis } = body;
    expect(analysis).toEqual(stateless);
    // hand: flat 200 kvar at 300 kW; needed to 0.95 = 200 − 300·tan(acos 0.95) = 101.40
    expect(body.summary.neededKvar.hold99PctKvar).toBeCloseTo(200 - 300 * Math.tan(Math.acos(0.95)), 3);
    const audit = (await inject(app, "/v1/audit-log?limit=1")).json().items[0];
    expect(audit).toMatchObject({ action: "interval_analysis.create", resourceType: "interval_analysis", resourceId: body.id });
  });

  it("takes multipart uploads with form-field options", async () => {
    const res = await api(app)
      .post(`/v1/buildings/${buildingId}/interval-analyses`)
      .field("targetPF", "0.9")
      .attach("file", Buffer.from(flatWeek), { filename: "week.csv", contentType: "text/csv" });
    expect(res.status).toBe(201);
    expect(res.body.summary.targetPF).toBe(0.9);
    expect((await inject(app, `/v1/interval-analyses/${res.body.id}`)).json().targetPF).toBe(0.9);
  });

  it("GET /v1/interval-analyses/{id} returns the stored summary; lists are newest first with a cursor", async () => {
    const ids: string[] = [];
    for (let i = 0; i < 3; i++) ids.push((await attach(flatWeek, `?targetPF=0.9${i}`)).json().id);
    const one = await inject(app, `/v1/interval-analyses/${ids[1]}`);
    expect(one.statusCode).toBe(200);
    expect(one.json()).toMatchObject({ id: ids[1], buildingId, targetPF: 0.91, intervalCount: 168, intervalMinutes: 60 });
    expect(one.json().summary.firstTimestamp).toBe("2025-01-01T00:00:00Z");

    const page1 = (await inject(app, `/v1/buildings/${buildingId}/interval-analyses?limit=2`)).json();
    expect(page1.items.map((i: { id: string }) => i.id)).toEqual([ids[2], ids[1]]);
    const item = page1.items[1];
    const s = one.json().summary;
    expect(item).toEqual({
      id: ids[1],
      createdAt: one.json().createdAt,
      targetPF: 0.91,
      intervalCount: 168,
      intervalMinutes: 60,
      firstTimestamp: s.firstTimestamp,
      lastTimestamp: s.lastTimestamp,
      hold99PctKvar: s.neededKvar.hold99PctKvar,
      minKvar: 200,
    });
    const page2 = (await inject(app, `/v1/buildings/${buildingId}/interval-analyses?limit=2&cursor=${page1.nextCursor}`)).json();
    expect(page2.items[0].id).toBe(ids[0]);
    const other = (await inject(app, `/v1/buildings/${otherBuildingId}/interval-analyses`)).json();
    expect(other).toEqual({ buildingId: otherBuildingId, items: [], nextCursor: null });
  });

  it("404 for an unknown analysis, an unknown building, or another organisation's analysis", async () => {
    expect((await inject(app, "/v1/interval-analyses/iva_nope")).statusCode).toBe(404);
    expect((await inject(app, "/v1/buildings/bld_nope/interval-analyses")).statusCode).toBe(404);
    const at = new Date().toISOString();
    const theirs = await store.transaction(async (tx) => {
      await tx.keys.createOrganisation("org_x", "Other org", at);
      const b = await tx.buildings.create("org_x", "bld_x", { ...buildingBody(), address: null, notes: null, economics: null } as never, "x", at);
      const summary = (await tx.intervalAnalyses.get("org_default", (await tx.intervalAnalyses.newestOf("org_default", buildingId))!.id))!.summary;
      return tx.intervalAnalyses.create("org_x", { id: "iva_x", buildingId: b.id, createdAt: at, actor: "x", requestId: null, summary });
    });
    const res = await inject(app, `/v1/interval-analyses/${theirs.id}`);
    expect(res.statusCode).toBe(404);
    expect(res.headers["content-type"]).toMatch(/^application\/problem\+json/);
    const survey = await postSurvey(surveyBody({ intervalAnalysisId: theirs.id }));
    expect(survey.statusCode).toBe(400);
    expect(survey.json().errors[0].path).toBe("intervalAnalysisId");
  });
});

describe("surveys use the building's interval analyses", () => {
  let januaryId: string;
  beforeAll(async () => {
    januaryId = (await attach(january, "?timeZone=UTC")).json().id;
  });

  it("a new survey designs its bank from the newest analysis and bills its months (basis interval_data)", async () => {
    const res = await postSurvey(surveyBody({ scope: "whole_site" }));
    expect(res.statusCode).toBe(201);
    const r = res.json().result;
    expect(r.recommendedBank.stepPlan.source).toBe("intervals");
    expect(r.economics.basis).toBe("interval_data");
    // hand: one month, January; its peak kVA is √(600² + 450²) = 750, billed at 8 a kVA
    expect(r.economics.periods.map((p: { label: string }) => p.label)).toEqual(["2025-01"]);
    expect(r.economics.periods[0].before.billedQuantity).toBeCloseTo(750, 9);
    expect(r.economics.periods[0].before.charge).toBeCloseTo(6000, 6);
    const stored = (await inject(app, `/v1/surveys/${res.json().id}`)).json();
    expect(stored.building.intervalAnalysisId).toBe(januaryId);
    // recomputed from the snapshot and the stored summary: the same result
    const summary = (await inject(app, `/v1/interval-analyses/${januaryId}`)).json().summary;
    const again = size(engineInputOf(stored.building, stored.inputs, intervalDemandOf(summary)));
    expect(again.ok && again.result).toEqual(r);
  });

  it("intervalAnalysisId picks an older analysis; null sizes from the readings alone", async () => {
    const older = (await inject(app, `/v1/buildings/${buildingId}/interval-analyses?limit=100`)).json().items.at(-1).id;
    const picked = await postSurvey(surveyBody({ intervalAnalysisId: older, scope: "whole_site" }));
    expect(picked.statusCode).toBe(201);
    expect((await inject(app, `/v1/surveys/${picked.json().id}`)).json().building.intervalAnalysisId).toBe(older);
    // the flat week has one month whose peak kVA is √(300² + 200²) = 360.555 (a summary keeps kVA to 0.001)
    expect(picked.json().result.economics.periods[0].before.billedQuantity).toBeCloseTo(Math.hypot(300, 200), 3);

    const none = await postSurvey(surveyBody({ intervalAnalysisId: null, scope: "whole_site" }));
    expect(none.statusCode).toBe(201);
    expect(none.json().result.recommendedBank.stepPlan.source).not.toBe("intervals");
    expect(none.json().result.economics.basis).toBe("survey_demand");
    expect((await inject(app, `/v1/surveys/${none.json().id}`)).json().building.intervalAnalysisId).toBeNull();
  });

  it("400 at intervalAnalysisId for another building's or an unknown analysis, on surveys and revisions; nothing written", async () => {
    const theirs = (await attach(flatWeek, "", otherBuildingId)).json().id;
    const survey = (await postSurvey(surveyBody())).json();
    const before = await rowCounts(store);
    for (const id of [theirs, "iva_unknown"]) {
      for (const res of [
        await postSurvey(surveyBody({ intervalAnalysisId: id })),
        await inject(app, {
          method: "POST",
          url: `/v1/surveys/${survey.id}/revisions`,
          payload: { ...surveyBody({ intervalAnalysisId: id }), reason: "r" },
        }),
      ]) {
        expect(res.statusCode).toBe(400);
        expect(res.headers["content-type"]).toMatch(/^application\/problem\+json/);
        expect(res.json().errors).toEqual([{ path: "intervalAnalysisId", message: expect.stringContaining(id) }]);
      }
    }
    const empty = await postSurvey(surveyBody({ intervalAnalysisId: "" }));
    expect(empty.json().errors[0].path).toBe("intervalAnalysisId");
    expect(await rowCounts(store)).toEqual(before);
  });

  it("a building without analyses sizes from the readings", async () => {
    const b = (await inject(app, { method: "POST", url: "/v1/buildings", payload: buildingBody({ name: "No intervals hall" }) })).json();
    const res = await postSurvey(surveyBody(), b.id);
    expect(res.json().result.recommendedBank.stepPlan.source).toBe("survey_only");
  });
});
