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
    // hand calculation: before √(400² + 300²) = 500 kVA; the bank brings the site to the target as far as it reaches:
    // after kvar = max(400·tan(acos 0.95), 300 − Q_bank) = max(131.47, 300 − Q_bank)
    const afterKvar = Math.max(400 * Math.tan(Math.acos(0.95)), 300 - installed);
    const saving = (500 - Math.hypot(400, afterKvar)) * 8;
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

  it("rejects a bad tariff with its path", async () => {
    const res = await api(app)
      .post("/v1/sizing")
      .send({ ...base, economics: { currency: "dollars", tariff: { form: "kvarh_excess", chargePerKvarh: -1, allowanceRatio: 0.5 } } });
    expect(res.status).toBe(400);
    const paths = res.body.errors.map((x: { path: string }) => x.path);
    expect(paths).toEqual(expect.arrayContaining(["economics.currency", "economics.tariff.chargePerKvarh"]));
  });
});
