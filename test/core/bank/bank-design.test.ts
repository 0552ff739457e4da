import { describe, expect, it } from "vitest";
import { analyseBank } from "../../../src/core/bank/stages.js";
import { designBank, type DesignBankInput } from "../../../src/core/bank/bank-design.js";
import { expectClose, TOL } from "../../helpers/tolerance.js";
import { DTOL } from "./tolerances.js";
import { STANDARD_UNIT_KVAR } from "../../../src/core/bank/standard-sizes.js";

const system = { voltageV: 480, frequencyHz: 60, phases: 3 } as const;
const readings: DesignBankInput = {
  system,
  targetPF: 0.95,
  demand: { kind: "readings", survey: { kW: 300, kvar: 250 }, lightLoad: { kW: 60, kvar: 30 } },
  ctRatio: 200,
};

function design(input: DesignBankInput) {
  const out = designBank(input);
  if (!out.ok) throw new Error(JSON.stringify(out.issues));
  return out.design;
}

/** All sums of subsets of the steps (brute force), each plus the fixed part. */
function reachableTotals(fixed: number, steps: number[]): number[] {
  const set = new Set<number>();
  for (let m = 0; m < 1 << steps.length; m++) set.add(fixed + steps.reduce((s, x, i) => s + (m & (1 << i) ? x : 0), 0));
  return [...set].sort((a, b) => a - b);
}

describe("designBank", () => {
  it("survey and light load at 480 V: fixed 30 + 25/50/100 switched, with its protection", () => {
    // steps from the step-search hand calculation (steps.test.ts); currents I = Q·1000/(√3·480):
    // 30 kvar 36.08 A ×1.65 = 59.54 → 60 A; 25 kvar 30.07 A → 49.62 → 50 A; 50 kvar 60.14 → 99.23 → 100 A;
    // 100 kvar 120.28 → 198.46 → 200 A; bank 205 kvar 246.58 A → 406.85 → 450 A (NFPA 70 240.6(A) ratings)
    const d = design(readings);
    expect(d.steps.map((s) => [s.role, s.effectiveKvar])).toEqual([
      ["fixed", 30],
      ["switched", 25],
      ["switched", 50],
      ["switched", 100],
    ]);
    expect(d.bank?.steps).toEqual([{ kvar: 30 }, { kvar: 25 }, { kvar: 50 }, { kvar: 100 }]);
    expect(d.totalKvar).toBe(205);
    expect(d.protection?.steps.map((p) => p.ocpdRatingA)).toEqual([60, 50, 100, 200]);
    expectClose(d.protection?.bank.ratedCurrentA, 246.57667746640269, TOL.currentA, "bank current");
    expect(d.protection?.bank.ocpdRatingA).toBe(450);
    expect(d.discharge.map((x) => x.kvar)).toEqual([30, 25, 50, 100]);
    expect(d.reason).toMatch(/fixed 30 kvar.*1:2:4 program of 3 steps \(25, 50, 100 kvar = 175 kvar\)/);
  });

  it("C/k from the CT ratio: 25 kvar, 480 V, 1000/5", () => {
    // hand calculation: 25000/(1.7321·480·200) = 0.1504 A
    expectClose(design(readings).controller?.responseA, 0.1504, DTOL.currentRoundedA, "C/k");
  });

  it("the screen bank has one stage per reachable total, so analyseBank screens every combination", () => {
    const d = design(readings);
    const stages = analyseBank(d.screenBank!, system, { shortCircuitKVA: 20000, harmonicOrders: [5, 7] }, "designed").analysis.stages;
    const totals = stages.map((s) => Math.round(s.cumulativeKvar * 1e6) / 1e6);
    expect(totals).toEqual(reachableTotals(30, [25, 50, 100]).filter((t) => t > 0));
  });

  it("detuned at 7 % with 525 V capacitors: standard nameplates at 525 V, delivered kvar at 480 V beside them", () => {
    // hand calculation: one 525 V nameplate kvar behind 7 % delivers (480/525)²/(1 − 0.07) = 0.835918/0.93 = 0.898837 kvar
    // at 480 V; light-load cap 30 kvar → fixed 30 kvar nameplate (26.965 kvar); need 151.39 − 26.97 = 124.43 kvar switched
    // → 1:2:4 of 25/50/100 kvar nameplate = 22.471/44.942/89.884 kvar delivered (157.30 kvar ≥ 124.43)
    const f = (480 / 525) ** 2 / 0.93;
    const d = design({ ...readings, reactorPct: 7, ratedVoltageV: 525 });
    expect(d.steps.map((s) => [s.role, s.nameplateKvar])).toEqual([
      ["fixed", 30],
      ["switched", 25],
      ["switched", 50],
      ["switched", 100],
    ]);
    d.steps.forEach((s) => expectClose(s.effectiveKvar, s.nameplateKvar * f, TOL.power, `delivered ${s.nameplateKvar} kvar`));
    expectClose(d.steps[1]?.effectiveKvar, 22.4709, TOL.powerQuoted, "25 kvar step delivered (hand: 25·0.898837)");
    expect([d.fixedNameplateKvar, d.switchedNameplateKvar]).toEqual([30, 175]);
    const a = analyseBank(d.bank!, system, { shortCircuitKVA: null, harmonicOrders: [] }, "designed").analysis;
    expectClose(a.effectiveKvar, d.totalKvar, TOL.power, "effective kvar through analyseBank");
    // circuit current: max(25e3/(√3·525) = 27.4929 A at nameplate, 22.4709e3/(√3·480) = 27.0285 A at the bus) = 27.4929 A
    expectClose(d.protection?.steps[1]?.ratedCurrentA, 27.492869961410754, TOL.currentA, "detuned step current");
    expect(d.protection?.steps[1]?.label).toBe("switched step 2 (25 kvar nameplate, 22.47 kvar delivered)");
    expect(d.warnings.map((w) => w.code)).toEqual([]);
  });

  it("440 V units on a 400 V bus: every step a standard size at 440 V, delivering (400/440)² of it", () => {
    // hand calculation: 50 kvar at 440 V on 400 V delivers 50·(400/440)² = 50·0.826446 = 41.32 kvar (IEEE Std 18 basis);
    // before this rule the design bought 48.4 / 18.15 / 72.6 kvar nameplates (40, 15, 60 kvar × (440/400)²): not sold
    const f = (400 / 440) ** 2;
    const sys400 = { voltageV: 400, frequencyHz: 50, phases: 3 } as const;
    const d = design({
      system: sys400,
      targetPF: 0.95,
      demand: { kind: "readings", survey: { kW: 350, kvar: 280 }, lightLoad: { kW: 90, kvar: 55 } },
      ctRatio: 200,
      ratedVoltageV: 440,
    });
    const standard = new Set<number>(STANDARD_UNIT_KVAR);
    expect(d.steps.length).toBeGreaterThan(1);
    for (const s of d.steps) {
      expect(standard.has(s.nameplateKvar) || s.nameplateKvar % 100 === 0, `${s.nameplateKvar} kvar is a standard size`).toBe(true);
      expectClose(s.effectiveKvar, s.nameplateKvar * f, TOL.power, `${s.nameplateKvar} kvar delivered`);
    }
    expectClose(50 * f, 41.32, TOL.powerRounded, "50 kvar 440 V unit at 400 V (hand: 41.32)");
    // the fixed part stays under the light-load reading's 55 kvar: 60 kvar nameplate would deliver 49.59, 75 → 61.98 > 55
    expect(d.fixedNameplateKvar).toBe(60);
    expect(d.bank?.steps.map((s) => s.kvar)).toEqual(d.steps.map((s) => s.nameplateKvar));
  });

  it("warns when the capacitors of a detuned bank are rated at the system voltage", () => {
    // hand calculation: 480/(1 − 0.07) = 516 V across the capacitors
    const d = design({ ...readings, reactorPct: 7 });
    expect(d.warnings.map((w) => w.code)).toContain("detuned_rated_voltage_needed");
  });

  it("asks for the CT ratio, and warns of a C/k too small to resolve", () => {
    const { ctRatio: _omit, ...noCt } = readings;
    expect(design(noCt).warnings.map((w) => w.code)).toContain("ct_ratio_needed");
    // hand calculation: 25 kvar at 480 V on a 4000/5 CT: 25000/(1.7321·480·800) = 0.0376 A < 0.05 A
    expect(design({ ...readings, ctRatio: 800 }).warnings.map((w) => w.code)).toContain("controller_response_too_small");
  });

  it("capacitors placed locally reduce the central bank", () => {
    // hand calculation: 250 − 40 = 210 kvar at the survey, 30 − 40 < 0 at light load → no fixed part;
    // need 210 − 98.605 = 111.4 kvar
    const d = design({ ...readings, localCorrectionKvar: 40 });
    expect(d.fixedKvar).toBe(0);
    expectClose(d.stepPlan.needAtCoverageKvar, 210 - 300 * 0.3286841051788632, TOL.power, "need");
  });

  it("nothing to correct: no bank, and says so", () => {
    const d = design({ system, demand: { kind: "readings", survey: { kW: 100, kvar: 10 } } });
    expect(d.bank).toBeNull();
    expect(d.protection).toBeNull();
    expect(d.reason).toMatch(/^no correction needed/);
  });

  it.each([
    { patch: { targetPF: 0.5 }, path: ["targetPF"] },
    { patch: { ctRatio: 0 }, path: ["ctRatio"] },
    { patch: { demand: { kind: "intervals", samples: [] } }, path: ["demand", "samples"] },
    { patch: { system: { voltageV: 0, frequencyHz: 60, phases: 3 } }, path: ["system", "voltageV"] },
  ] as const)("rejects bad input at $path", ({ patch, path }) => {
    const out = designBank({ ...readings, ...(patch as Partial<DesignBankInput>) });
    expect(out.ok).toBe(false);
    if (!out.ok) expect(out.issues.map((i) => i.path)).toContainEqual(path);
  });

  it("a year of quarter-hours (35 040 samples): coherent design, input untouched", () => {
    // invented year: weekday days ≈ 600 kW, nights and weekends ≈ 150 kW, PF 0.76–0.86, deterministic generator
    let seed = 12345;
    const rnd = () => (seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648;
    const samples = Array.from({ length: 35040 }, (_, i) => {
      const hour = (i % 96) / 4;
      const workday = Math.floor(i / 96) % 7 < 5 && hour >= 7 && hour < 18;
      const kW = (workday ? 600 : 150) * (0.85 + 0.3 * rnd());
      return { kW, kvar: kW * Math.tan(Math.acos(0.76 + 0.1 * rnd())) };
    });
    const input: DesignBankInput = {
      system: { voltageV: 400, frequencyHz: 50, phases: 3 },
      demand: { kind: "intervals", samples, intervalMinutes: 15 },
      ctRatio: 200,
    };
    const before = structuredClone(input);
    const d = design(input);
    expect(input).toEqual(before);
    const minKvar = Math.min(...samples.map((s) => s.kvar));
    expect(d.fixedKvar).toBeLessThanOrEqual(minKvar);
    expect(d.stepPlan.samples).toBe(35040);
    // search-space bound: 1 fixed-only + 3 ratios × 10 step counts (3…12) × 2 roundings = 61
    expect(d.stepPlan.candidatesEvaluated).toBeLessThanOrEqual(61);
    // hand calculation: 35 040 × 15 min = 525 600 min = 365 days
    expectClose(d.stepPlan.switchingOperationsPerDay, d.stepPlan.switchingOperations / 365, { rel: 1e-12 }, "operations per day");
    expect(d.stepPlan.metCoveredShare).toBeGreaterThan(0.95);
    expect(d.bank?.steps.length).toBe((d.fixedKvar > 0 ? 1 : 0) + (d.stepPlan.switched?.stepCount ?? 0));
  });
});
