import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { FastifyInstance } from "fastify";
import { sizingWithHarmonicsSchema } from "../../src/http/schemas/results.js";
import { makeStoreApp } from "../helpers/db.js";
import { expectClose } from "../helpers/tolerance.js";
import { api } from "../helpers/auth.js";

let app: FastifyInstance;
beforeAll(async () => {
  ({ app } = await makeStoreApp());
});
afterAll(async () => {
  await app.close();
});

// Invented site: one kw_kvar reading at the main, 400 kW and 300 kvar lagging (PF 0.80).
const base = {
  system: { voltageV: 480, frequencyHz: 60, phases: 3 },
  targetPF: 0.95,
  transformer: { kVA: 1500, impedancePct: 5.75 },
  loads: [{ label: "Main", measurement: { method: "kw_kvar", kW: 400, kvar: 300 } }],
};

describe("economics through /v1/sizing", () => {
  it("a kVA demand tariff: saving = (kVA before − kVA after) × rate, payback = cost / yearly saving", async () => {
    const res = await api(app)
      .post("/v1/sizing")
      .send({ ...base, economics: { currency: "USD", tariff: { form: "kva_demand", chargePerKVA: 8 }, cost: { perKvar: 40, fixed: 2000 } } });
    expect(res.status).toBe(200);
    expect(() => sizingWithHarmonicsSchema.parse(res.body)).not.toThrow();
    const e = res.body.economics;
    expect(e.basis).toBe("survey_demand");
    const installed = res.body.recommendedBank.effectiveKvar as number;
    // hand calculation: before √(400² + 300²) = 500 kVA. The bank delivers what the controller rule switches in:
    // the fixed part, then the least step combination leaving at most 400·tan(acos 0.95) = 131.47 kvar (and not
    // leading beyond 0.98). This design: fixed 75 + steps 20/40/40 → combinations 0…100 by 20; 225 − 100 = 125 ≤ 131.47,
    // so 125 kvar left, √(400² + 125²) = 419.08 kVA, saving (500 − 419.08)·8 = 647.39 a month.
    const steps = res.body.recommendedBank.physicalSteps as { role: string; effectiveKvar: number }[];
    const fixed = steps.filter((s) => s.role === "fixed").reduce((a, s) => a + s.effectiveKvar, 0);
    const switched = steps.filter((s) => s.role === "switched").map((s) => s.effectiveKvar);
    const sums = Array.from({ length: 1 << switched.length }, (_, m) => switched.reduce((a, k, i) => a + (m & (1 << i) ? k : 0), 0)).sort(
      (a, b) => a - b,
    );
    const on = sums.find((x) => 300 - fixed - x <= 400 * Math.tan(Math.acos(0.95)) + 1e-9) ?? sums[sums.length - 1]!;
    const afterKvar = 300 - fixed - on;
    const saving = (500 - Math.hypot(400, afterKvar)) * 8;
    expectClose(saving, 647.39, { abs: 0.01 }, "this design's hand figure");
    expectClose(e.savingPerMonth, saving, { abs: 0.01 }, "per month");
    expectClose(e.savingPerYear, 12 * saving, { abs: 0.01 }, "per year");
    expectClose(e.installedCost, installed * 40 + 2000, { abs: 0.01 }, "cost");
    expectClose(e.simplePaybackYears, (installed * 40 + 2000) / (12 * saving), { abs: 1e-6 }, "payback");
  });

  it("a site already at the target saves nothing and has no payback", async () => {
    const res = await api(app)
      .post("/v1/sizing")
      .send({
        ...base,
        loads: [{ label: "Main", measurement: { method: "kw_pf", kW: 400, pf: 0.97, sense: "lagging" } }],
        economics: { currency: "EUR", tariff: { form: "kw_demand_pf_adjusted", chargePerKW: 10, basePF: 0.9 }, cost: { fixed: 1000 } },
      });
    expect(res.status).toBe(200);
    expect(res.body.economics.savingPerYear).toBe(0);
    expect(res.body.economics.simplePaybackYears).toBeNull();
  });

  it("a PF-adjusted tariff echoes its pfBasis (default average) and works the survey path on it", async () => {
    const send = (tariff: object) =>
      api(app)
        .post("/v1/sizing")
        .send({ ...base, economics: { currency: "USD", tariff } });
    const avg = await send({ form: "kw_demand_pf_adjusted", chargePerKW: 10, basePF: 0.9 });
    expect(avg.status).toBe(200);
    expect(avg.body.economics.tariff.pfBasis).toBe("average");
    // hand calculation: one typical month, PF 400/500 = 0.8 on either basis → billed 400·0.9/0.8 = 450 kW before
    expectClose(avg.body.economics.periods[0].before.billedQuantity, 450, { abs: 1e-9 }, "billed kW");
    expectClose(avg.body.economics.periods[0].before.pf, 0.8, { abs: 1e-12 }, "PF");
    const peak = await send({ form: "kw_demand_pf_adjusted", chargePerKW: 10, basePF: 0.9, pfBasis: "at_peak" });
    expect(peak.body.economics.tariff.pfBasis).toBe("at_peak");
    expectClose(peak.body.economics.periods[0].before.billedQuantity, 450, { abs: 1e-9 }, "billed kW at peak");
    const bad = await send({ form: "kw_demand_pf_adjusted", chargePerKW: 10, basePF: 0.9, pfBasis: "peak" });
    expect(bad.status).toBe(400);
    expect(JSON.stringify(bad.body)).toContain("pfBasis");
  });

  it("rejects a bad tariff with its path", async () => {
    const res = await api(app)
      .post("/v1/sizing")
      .send({ ...base, economics: { currency: "dollars", tariff: { form: "kvarh_excess", chargePerKvarh: -1, allowanceRatio: 0.5 } } });
    expect(res.status).toBe(400);
    const paths = res.body.errors.map((x: { path: string }) => x.path);
    expect(paths).toEqual(expect.arrayContaining(["economics.currency", "economics.tariff.chargePerKvarh"]));
  });
});
