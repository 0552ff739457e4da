/** Reports of stored surveys sized with a building's interval analysis: the analysis's summary is drawn. */
import type { FastifyInstance } from "fastify";
import { parse } from "node-html-parser";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { csvOfSeries, syntheticYear } from "../core/interval/fixtures.js";
import { makeStoreApp } from "../helpers/db.js";
import { buildingBody, surveyBody } from "../store/fixtures.js";
import { inject } from "../helpers/auth.js";

let app: FastifyInstance;
let withIntervals: string;
let withoutIntervals: string;
let analysisId: string;

/** January 2025, 15-minute intervals: 00–08 h 200 kW / 100 kvar, 08–24 h 600 kW / 450 kvar (invented). */
const january = csvOfSeries(syntheticYear(96, (k) => (k < 32 ? { kW: 200, kvar: 100 } : { kW: 600, kvar: 450 }), 31));

beforeAll(async () => {
  ({ app } = await makeStoreApp());
  const b = (await inject(app, { method: "POST", url: "/v1/buildings", payload: buildingBody({ name: "Report interval hall" }) })).json();
  const survey = async (body: unknown) =>
    (await inject(app, { method: "POST", url: `/v1/buildings/${b.id}/surveys`, payload: body as object })).json().id as string;
  withoutIntervals = await survey(surveyBody());
  const a = await inject(app, {
    method: "POST",
    url: `/v1/buildings/${b.id}/interval-analyses?timeZone=UTC`,
    headers: { "content-type": "text/csv" },
    payload: january,
  });
  expect(a.statusCode).toBe(201);
  analysisId = a.json().id;
  withIntervals = await survey(surveyBody());
});
afterAll(() => app.close());

const reportOf = async (id: string) => {
  const res = await inject(app, `/v1/surveys/${id}/report`);
  expect(res.statusCode).toBe(200);
  return parse(res.body);
};

describe("survey report with a stored interval analysis", () => {
  it("draws the duration curve and states the analysis's period", async () => {
    expect((await inject(app, `/v1/surveys/${withIntervals}`)).json().building.intervalAnalysisId).toBe(analysisId);
    const doc = await reportOf(withIntervals);
    const section = doc.querySelector("#interval");
    expect(section).not.toBeNull();
    const text = section!.text.replace(/\s+/g, " ");
    expect(text).toContain("2976 intervals of 15 min"); // 31 days × 96
    expect(text).not.toContain("No interval data was analysed");
    expect(section!.querySelectorAll('svg[data-chart="duration-curve"]')).toHaveLength(1);
  });

  it("a survey stored before the analysis says it had none", async () => {
    const doc = await reportOf(withoutIntervals);
    const section = doc.querySelector("#interval");
    expect(section!.text).toContain("No interval data was analysed");
    expect(section!.querySelectorAll("svg")).toHaveLength(0);
  });
});
