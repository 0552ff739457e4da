/** Reports with installed banks: the steps table, the verdict on page 1, the capacitance chart across surveys. */
import type { FastifyInstance } from "fastify";
import { parse } from "node-html-parser";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { capacitanceChart } from "../../src/report/charts/index.js";
import { makeStoreApp } from "../helpers/db.js";
import { inject } from "../helpers/auth.js";
import { expectClose, TOL } from "../helpers/tolerance.js";
import { buildingBody, surveyBody } from "../store/fixtures.js";

let app: FastifyInstance;
const ids: string[] = [];
const bank = { label: "Wall bank", location: "service", control: "automatic", ratedVoltageV: 400, steps: [{ kvar: 25 }, { kvar: 25 }] };

beforeAll(async () => {
  ({ app } = await makeStoreApp());
  const b = (
    await inject(app, { method: "POST", url: "/v1/buildings", payload: buildingBody({ name: "Report bank hall", installedBanks: [bank] }) })
  ).json();
  // step 2 declines: 35.7 → 33.9 → 31.0 A against 36.0844 A expected (25 kvar at 400 V)
  for (const [i, a] of [35.7, 33.9, 31.0].entries()) {
    const body = surveyBody({
      surveyedAt: `2024-0${1 + 3 * i}-10`,
      bankReadings: [
        {
          bank: "Wall bank",
          inServiceSteps: [1, 2],
          stepCurrents: [
            { step: 1, amps: [36, 36, 36] },
            { step: 2, amps: [a, a, a] },
          ],
        },
      ],
    });
    ids.push((await inject(app, { method: "POST", url: `/v1/buildings/${b.id}/surveys`, payload: body })).json().id);
  }
});
afterAll(() => app.close());

describe("report of a survey with installed banks", () => {
  it("has the steps table, names the degraded step on page 1, and charts capacitance over the surveys so far", async () => {
    const res = await inject(app, `/v1/surveys/${ids[2]}/report`);
    expect(res.statusCode).toBe(200);
    const doc = parse(res.body);
    const section = doc.querySelector("#installed");
    expect(section?.textContent).toContain("Expected (A)");
    expect(section?.textContent).toContain("degraded");
    // page 1: the "Repair first" line names the step once, without repeating its own heading
    const verdict = doc.querySelector("#verdict")?.textContent ?? "";
    expect(verdict).toMatch(/Repair first\s*Wall bank step 2 \(degraded/);
    expect(verdict).not.toMatch(/repair first:/i);
    const series = doc.querySelectorAll('#installed [data-role="step-series"]');
    expect(series.map((s) => s.getAttribute("data-points"))).toEqual(["3", "3"]);
    // the first survey's report has one point per step: no line yet, only points
    const first = parse((await inject(app, `/v1/surveys/${ids[0]}/report`)).body);
    expect(first.querySelectorAll('#installed [data-role="step-series"]')).toHaveLength(0);
    expect(first.querySelectorAll('#installed [data-role="step-point"]')).toHaveLength(2);
    const pdf = await inject(app, `/v1/surveys/${ids[2]}/report.pdf`);
    expect(pdf.statusCode).toBe(200);
    expect(pdf.body.slice(0, 5)).toBe("%PDF-");
  });
});

describe("capacitance chart geometry", () => {
  it("puts each point at its percentage and draws the 95 % and 50 % lines", () => {
    const chart = capacitanceChart({
      surveys: ["2024-01-10", "2024-04-10"],
      lines: [{ label: "A step 1", pct: [98, 86] }],
      degradedBelowPct: 95,
      failedBelowPct: 50,
    });
    const area = chart.shapes.find((s) => s.role === "plot-area") as unknown as { y: number; h: number; data: { y0: string; y1: string } };
    const y0 = Number(area.data.y0);
    const y1 = Number(area.data.y1);
    const yOf = (pct: number) => area.y + area.h - ((pct - y0) / (y1 - y0)) * area.h; // linear axis, y down
    const pts = chart.shapes.filter((s) => s.role === "step-point") as unknown as { y: number; h: number }[];
    expect(pts).toHaveLength(2);
    expectClose(pts[0]!.y + pts[0]!.h / 2, yOf(98), TOL.ohm, "98 %");
    expectClose(pts[1]!.y + pts[1]!.h / 2, yOf(86), TOL.ohm, "86 %");
    const thresholds = chart.shapes.filter((s) => s.role === "threshold") as unknown as { y1: number; data: { pct: string } }[];
    expect(thresholds.map((t) => t.data.pct)).toEqual(["95", "50"]);
    expectClose(thresholds[0]!.y1, yOf(95), TOL.ohm, "95 % line");
  });
});
