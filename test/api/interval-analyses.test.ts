import type { FastifyInstance } from "fastify";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { expectClose } from "../helpers/tolerance.js";
import { CSV, makeIntervalApp } from "../core/interval/app-fixture.js";
import { csvOfSeries, ITOL, syntheticYear } from "../core/interval/fixtures.js";
import { inject } from "../helpers/auth.js";

let app: FastifyInstance;
let close: () => Promise<void>;
beforeAll(async () => ({ app, close } = await makeIntervalApp()));
afterAll(async () => close());

const TAN95 = Math.sqrt(1 - 0.95 ** 2) / 0.95;
/** January 2025, 15-minute intervals: 00–08 h 200 kW / 100 kvar, 08–24 h 600 kW / 450 kvar. */
const january = csvOfSeries(
  syntheticYear(96, (k) => (k < 32 ? { kW: 200, kvar: 100 } : { kW: 600, kvar: 450 }), 31),
  "Interval Start,Demand kW,kVAr",
);

const post = (query: string, payload: string, headers: Record<string, string> = CSV) =>
  inject(app, { method: "POST", url: `/v1/interval-analyses${query}`, headers, payload });

describe("POST /v1/interval-analyses (text/csv)", () => {
  it("answers the analysis with its documented top-level keys", async () => {
    const r = await post("", january);
    expect(r.statusCode).toBe(200);
    expect(r.headers["content-type"]).toMatch(/^application\/json/);
    const b = r.json();
    expect(Object.keys(b)).toEqual([
      "engineVersion",
      "input",
      "quality",
      "interval",
      "targetPF",
      "reactiveDemand",
      "neededKvar",
      "kW",
      "pf",
      "monthly",
      "total",
      "simulation",
      "summary",
      "warnings",
    ]);
    expect(b.input).toMatchObject({
      dataRows: 2976,
      acceptedRows: 2976,
      method: "kW_kvar",
      columns: { timestamp: "Interval Start", kW: "Demand kW", kvar: "kVAr" },
    });
    expect(b.interval).toMatchObject({ minutes: 15, source: "detected", count: 2976, firstTimestamp: "2025-01-01T00:00:00Z" });
    expect(b.targetPF).toBe(0.95);
    expect(b.simulation).toBeNull();
    expect(b.warnings.map((w: { code: string }) => w.code)).toEqual(["time_zone_assumed"]);
  });

  it("figures: exact percentiles of a two-level day, needed kvar and billing PF (hand calculation)", async () => {
    const b = (await post("?targetPF=0.95", january)).json();
    expect(b.reactiveDemand.percentilesKvar).toMatchObject({ P0: 100, P25: 100, P50: 450, P100: 450 });
    expect(b.reactiveDemand.minimum).toEqual({ minKvar: 100, p1Kvar: 100, p5Kvar: 100 });
    expectClose(b.neededKvar.hold95PctKvar, 450 - 600 * TAN95, ITOL.exact, "hold 95 %"); // 252.789
    expect(b.monthly).toHaveLength(1);
    // 31 × 11 200 kWh, 31 × 8 000 kvarh → 11 200/√(11 200² + 8 000²)
    expectClose(b.monthly[0].billingPF, 11_200 / Math.hypot(11_200, 8_000), ITOL.pf, "billing PF");
    expect(b.monthly[0]).toMatchObject({ month: "2025-01", peakKW: 600, peakKVA: 750 });
    expect(b.summary.summaryVersion).toBe(2);
    // version 2 keeps, per month, the kvar of the peak-kW interval (600 kW / 450 kvar) and the month's load points
    expect(b.summary.monthly[0].peakKWKvar).toBe(450);
    expect(b.summary.monthly[0].loadPoints.count.reduce((a: number, c: number) => a + c, 0)).toBe(b.monthly[0].intervals);
    expect(JSON.stringify(b.summary).length).toBeLessThan(20_000);
  });

  it("targetPF changes the needed kvar by the formula (0.90: 450 − 600·tan(acos 0.9) = 159.41)", async () => {
    const b = (await post("?targetPF=0.9", january)).json();
    expectClose(b.neededKvar.hold100PctKvar, 450 - 600 * (Math.sqrt(1 - 0.81) / 0.9), ITOL.exact, "hold 100 % at 0.90");
  });

  it("simulates a bank and gives the controller's C/k", async () => {
    const b = (await post("?fixedKvar=50&bankSteps=50,100,100&ctRatio=200&voltageV=480", january)).json();
    const sim = b.simulation;
    expect(sim.bank).toEqual({ fixedKvar: 50, stepsKvar: [50, 100, 100] });
    expectClose(sim.total.billingPFAfter, 4 / Math.sqrt(17), ITOL.pf, "billing PF after"); // see the core test's hand calculation
    expect(sim.switching.perStep.map((p: { operations: number }) => p.operations)).toEqual([61, 61, 61]); // 31 on, 30 off
    expect(sim.controllerSetting.smallestStepKvar).toBe(50);
    expectClose(sim.controllerSetting.ckA, 50_000 / (Math.sqrt(3) * 480) / 200, ITOL.exact, "C/k"); // 0.3007 A
    expect(sim.rule).toMatch(/best combination/);
  });

  it("takes column overrides from the query", async () => {
    const csv =
      "Read time,kW max,Demand kW,kvar,Q net\n2025-01-01 00:00,999,100,40,10\n2025-01-01 00:15,999,100,40,10\n2025-01-01 00:30,999,100,40,10\n";
    const auto = (await post("", csv)).json();
    expect(auto.input.columns).toMatchObject({ kW: "Demand kW", kvar: "kvar" });
    const over = (await post("?kWColumn=kw%20max&kvarColumn=Q%20net&timestampColumn=1", csv)).json();
    expect(over.input.columns).toEqual({ timestamp: "Read time", kW: "kW max", kvar: "Q net" });
    expect(over.kW.max).toBe(999);
    expect(over.reactiveDemand.percentilesKvar.P50).toBe(10);
  });

  it("kW + PF with a sense option; dates day-first; local times in Europe/Berlin", async () => {
    const csv = "Date,Time,kW,PF\n01/03/2026,00:00,300,0.6\n01/03/2026,00:30,300,0.6\n01/03/2026,01:00,300,0.6\n";
    const b = (await post("?sense=leading&dateOrder=dmy&timeZone=Europe/Berlin", csv)).json();
    // hand: PF 0.6 → Q = 300·0.8/0.6 = 400 kvar, leading → −400
    expectClose(b.reactiveDemand.percentilesKvar.P50, -400, ITOL.exact, "kvar");
    expect(b.pf.intervalsLeading).toBe(3);
    expect(b.interval.firstTimestamp).toBe("2026-03-01T00:00:00+01:00"); // 1 March, CET
    expect(b.monthly[0].month).toBe("2026-03");
    expect(b.warnings.map((w: { code: string }) => w.code)).not.toContain("time_zone_assumed");
  });

  it("local timestamps through the Chicago fall-back hour: 7 instants, no duplicates, months in Chicago", async () => {
    const locals = [
      "2026-10-31 23:30",
      "2026-11-01 00:00",
      "2026-11-01 00:30",
      "2026-11-01 01:00",
      "2026-11-01 01:30",
      "2026-11-01 01:00",
      "2026-11-01 01:30",
      "2026-11-01 02:00",
    ];
    const csv = ["time,kW,kvar", ...locals.map((t) => `${t},100,50`)].join("\n");
    const b = (await post("?timeZone=America/Chicago", csv)).json();
    expect(b.quality.duplicates.count).toBe(0);
    expect(b.quality.gaps.count).toBe(0);
    expect(b.interval.minutes).toBe(30);
    expect(b.interval.lastTimestamp).toBe("2026-11-01T02:00:00-06:00");
    expect(b.monthly.map((m: { month: string; intervals: number }) => [m.month, m.intervals])).toEqual([
      ["2026-10", 1],
      ["2026-11", 7],
    ]);
  });

  it("reports gaps, duplicates, out-of-order rows and accepted bad rows in quality, with warnings", async () => {
    const rows = january.trim().split("\n");
    const body = [...rows.slice(0, 5), rows[3]!, ...rows.slice(7, 40), rows[45]!.replace(/,\d+,/, ",x,"), ...rows.slice(46)].join("\n");
    const b = (await post("", body)).json();
    expect(b.quality.duplicates.count).toBe(1);
    expect(b.quality.outOfOrder.count).toBe(1);
    expect(b.quality.gaps.missingIntervals).toBeGreaterThanOrEqual(2);
    expect(b.quality.badRows.first[0]).toMatchObject({ line: 40, column: "Demand kW", reason: "unparseable number" });
    expect(b.warnings.map((w: { code: string }) => w.code)).toEqual(
      expect.arrayContaining(["bad_rows_skipped", "duplicate_timestamps", "out_of_order", "gaps"]),
    );
  });
});
