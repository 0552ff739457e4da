import { describe, expect, it } from "vitest";
import { economics, periodCharge, type BillingState, type Tariff } from "../../../src/core/economics/economics-api.js";
import { expectClose } from "../../helpers/tolerance.js";

const MONEY = { abs: 0.005 }; // currency amounts to the cent
const before: BillingState = { peakKW: 400, peakKVA: 500, peakPF: 0.8, kWh: 200_000, kvarh: 150_000 };
const after: BillingState = { peakKW: 400, peakKVA: 421.05, peakPF: 0.95, kWh: 200_000, kvarh: 65_700 };

describe("tariff forms, each with a hand-computed case", () => {
  it.each<[string, Tariff, BillingState, number, number]>([
    // hand calculation: 500 kVA × 9.00 = 4 500.00
    ["per kVA of billing demand", { form: "kva_demand", chargePerKVA: 9 }, before, 500, 4500],
    // hand calculation: billed kW = 400 × 0.90 / 0.80 = 450 kW; 450 × 12.00 = 5 400.00
    ["kW demand adjusted below base PF", { form: "kw_demand_pf_adjusted", chargePerKW: 12, basePF: 0.9 }, before, 450, 5400],
    // hand calculation: PF 0.95 ≥ base 0.90, billed kW = 400; 400 × 12.00 = 4 800.00
    ["kW demand at or above base PF", { form: "kw_demand_pf_adjusted", chargePerKW: 12, basePF: 0.9 }, after, 400, 4800],
    // hand calculation: allowance 0.5 × 200 000 = 100 000 kvarh; excess 50 000 × 0.02 = 1 000.00
    ["kvarh above an allowance", { form: "kvarh_excess", chargePerKvarh: 0.02, allowanceRatio: 0.5 }, before, 50_000, 1000],
    // hand calculation: 65 700 < 100 000 allowance → no excess
    ["kvarh within the allowance", { form: "kvarh_excess", chargePerKvarh: 0.02, allowanceRatio: 0.5 }, after, 0, 0],
    ["no reactive charge", { form: "none" }, before, 0, 0],
  ])("%s", (_name, tariff, state, quantity, charge) => {
    const c = periodCharge(tariff, state);
    expectClose(c.billedQuantity, quantity, { abs: 1e-9 }, "billed quantity");
    expectClose(c.charge, charge, MONEY, "charge");
  });
});

describe("savings and payback", () => {
  it("per month, per year and simple payback", () => {
    const r = economics({
      currency: "EUR",
      tariff: { form: "kva_demand", chargePerKVA: 9 },
      periods: [{ label: "typical month", before, after }],
      periodsPerYear: 12,
      cost: { perKvar: 30, perStep: 200, fixed: 1500 },
      bank: { installedKvar: 175, steps: 7 },
      basis: "survey_demand",
    });
    // hand calculation: (500 − 421.05) × 9 = 710.55 per month; × 12 = 8 526.60 per year
    expectClose(r.savingPerMonth, 710.55, MONEY, "per month");
    expectClose(r.savingPerYear, 8526.6, MONEY, "per year");
    // hand calculation: 175 × 30 + 7 × 200 + 1 500 = 5 250 + 1 400 + 1 500 = 8 150
    expectClose(r.installedCost ?? NaN, 8150, MONEY, "cost");
    // hand calculation: 8 150 / 8 526.60 = 0.9558 years
    expectClose(r.simplePaybackYears ?? NaN, 0.9558, { abs: 0.0001 }, "payback");
    expect(r.currency).toBe("EUR");
  });

  it("adds I²R loss savings when asked", () => {
    const r = economics({
      currency: "USD",
      tariff: { form: "none" },
      periods: [{ label: "m", before, after }],
      periodsPerYear: 12,
      losses: { lossesPct: 2, energyPricePerKWh: 0.1 },
      // 1 − (0.80/0.95)² = 0.29086 (common practice loss ratio)
      lossReductionFraction: 1 - (0.8 / 0.95) ** 2,
      basis: "survey_demand",
    });
    // hand calculation: 200 000 kWh × 2 % × 0.29086 = 1 163.4 kWh; × 0.10 = 116.34 per month
    expectClose(r.periods[0]!.lossSavingKWh, 1163.43, { abs: 0.01 }, "kWh");
    expectClose(r.savingPerMonth, 116.34, MONEY, "per month");
    expect(r.assumptions.some((a) => a.includes("I²R"))).toBe(true);
  });

  it("already above target: zero saving, no payback", () => {
    const r = economics({
      currency: "USD",
      tariff: { form: "kw_demand_pf_adjusted", chargePerKW: 12, basePF: 0.9 },
      periods: [{ label: "m", before: after, after }],
      periodsPerYear: 12,
      cost: { fixed: 1000 },
      bank: { installedKvar: 25, steps: 1 },
      basis: "survey_demand",
    });
    expect(r.savingPerYear).toBe(0);
    expect(r.simplePaybackYears).toBeNull();
  });

  it("a bank that makes the bill worse gives a negative saving and no payback", () => {
    // leading site over-corrected: kVA rises from 421.05 to 450 → (421.05 − 450) × 9 = −260.55 per month
    const worse: BillingState = { ...after, peakKVA: 450 };
    const r = economics({
      currency: "USD",
      tariff: { form: "kva_demand", chargePerKVA: 9 },
      periods: [{ label: "m", before: after, after: worse }],
      periodsPerYear: 12,
      cost: { perKvar: 30 },
      bank: { installedKvar: 100, steps: 2 },
      basis: "survey_demand",
    });
    expectClose(r.savingPerMonth, -260.55, MONEY, "per month");
    expect(r.simplePaybackYears).toBeNull();
  });

  it("monthly periods from interval data average into the month and sum into the year", () => {
    const t: Tariff = { form: "kva_demand", chargePerKVA: 10 };
    const r = economics({
      currency: "USD",
      tariff: t,
      periods: [
        { label: "2026-01", before: { ...before, peakKVA: 500 }, after: { ...after, peakKVA: 420 } },
        { label: "2026-02", before: { ...before, peakKVA: 460 }, after: { ...after, peakKVA: 400 } },
      ],
      periodsPerYear: 12,
      basis: "interval_data",
    });
    // hand calculation: (80 + 60) × 10 = 1 400 over 2 months → 700 per month → 8 400 per year
    expectClose(r.savingPerMonth, 700, MONEY, "per month");
    expectClose(r.savingPerYear, 8400, MONEY, "per year");
  });
});
