import { describe, expect, it } from "vitest";
import type { SystemInput, TransformerInput } from "../../src/core/inputs.js";
import type { PowerTriangle } from "../../src/core/measurement.js";
import { recommendBank } from "../../src/core/recommend.js";
import { size } from "../../src/core/sizing.js";
import { expectClose, TOL } from "../helpers/tolerance.js";

/**
 * The first bank rule (src/core/recommend.ts): one fixed unit, rounded up from the standard list
 * 2.5 … 100 kvar, when the need is ≤ one unit and ≤ 15 % of the transformer (or site) kVA; the next size
 * down if the rounded-up unit would make the site lead; otherwise an automatic bank of 4–12 equal standard
 * steps with the least excess, then the fewest steps. The list and the 15 % share are the project's
 * rule of thumb (common practice, no single source).
 */
const SYSTEM: SystemInput = { voltageV: 480, frequencyHz: 60, phases: 3 };
const TX: TransformerInput = { kVA: 1500, impedancePct: 5.75 };
const TAN95 = Math.sqrt(0.0975) / 0.95; // hand: tan(acos 0.95) = 0.328684

function site(kW: number, kvar: number): PowerTriangle {
  const kVA = Math.hypot(kW, kvar);
  return { kW, kvar, kVA, displacementPF: kW / kVA, sense: kvar > 0 ? "lagging" : kvar < 0 ? "leading" : "unity" };
}
const stepsOf = (c: ReturnType<typeof recommendBank>) => c?.bank.steps.map((s) => s.kvar);

describe("fixed unit", () => {
  it("rounds up to the next standard size: 42.13 kvar → 50 kvar", () => {
    // 100 kW at 0.80: 75 − 32.868 = 42.132 kvar (hand); 2.8 % of 1500 kVA; next size up 50 ≤ 75 kvar on site
    const c = recommendBank(75 - 100 * TAN95, site(100, 75), SYSTEM, TX);
    expect(c?.arrangement).toBe("fixed");
    expect(stepsOf(c)).toEqual([50]);
    expect(c?.belowTarget).toBe(false);
    expect(c?.bank).toMatchObject({ ratedVoltageV: 480, ratedFrequencyHz: 60, reactorPct: 0 });
  });

  it("a need equal to a standard size is not rounded up: 25 kvar → 25 kvar (target 1.0)", () => {
    expect(stepsOf(recommendBank(25, site(100, 25), SYSTEM, TX))).toEqual([25]);
  });

  it("when rounding up would make the site lead, the next size down: 23 kvar need on a 23 kvar site → 20 kvar, below target", () => {
    // target 1.0: need = site kvar = 23; 25 > 23 would lead; largest standard ≤ 23 is 20
    const c = recommendBank(23, site(100, 23), SYSTEM, TX);
    expect(c?.arrangement).toBe("fixed");
    expect(stepsOf(c)).toEqual([20]);
    expect(c?.belowTarget).toBe(true);
  });

  it("the same at 0.95: 10 kW + 45 kvar needs 41.71 kvar; 50 would lead, so 40", () => {
    // hand: 45 − 10·0.328684 = 41.713 kvar; 41.713/1500 = 2.8 %; 50 > 45 → 40
    const c = recommendBank(45 - 10 * TAN95, site(10, 45), SYSTEM, TX);
    expect(stepsOf(c)).toEqual([40]);
    expect(c?.belowTarget).toBe(true);
  });

  it("below the smallest unit with no size that would not lead: no bank", () => {
    // need 2 kvar on a 2 kvar site: 2.5 would lead, nothing smaller exists
    expect(recommendBank(2, site(100, 2), SYSTEM, TX)).toBeNull();
  });

  it("no requirement: no bank", () => {
    expect(recommendBank(0, site(100, 20), SYSTEM, TX)).toBeNull();
  });
});

describe("automatic bank", () => {
  it("more than one unit: 500 kW at 0.70 → 345.76 kvar → 7 × 50 kvar", () => {
    // hand calculation: Q = 500·√0.51/0.7 = 510.10 kvar; need = 510.10 − 164.34 = 345.76 kvar
    // n = 4…12, smallest standard s with n·s ≥ need: 4×100=400, 5×75=375, 6×60=360, 7×50=350, 8×50=400,
    // 9×40=360, 10×40=400, 11×40=440, 12×30=360 → least excess 350 − 345.76 = 4.24 at 7 × 50
    const q = (500 * Math.sqrt(0.51)) / 0.7;
    const c = recommendBank(q - 500 * TAN95, site(500, q), SYSTEM, TX);
    expect(c?.arrangement).toBe("automatic");
    expect(stepsOf(c)).toEqual(Array(7).fill(50));
  });

  it("at most one unit but above 15 % of the transformer: 60 kvar on 300 kVA (20 %) → 4 × 15 kvar", () => {
    // target 1.0: need 60; 4 × 15 = 60 exactly, the least excess with the fewest steps
    const c = recommendBank(60, site(100, 60), SYSTEM, { kVA: 300, impedancePct: 4 });
    expect(c?.arrangement).toBe("automatic");
    expect(stepsOf(c)).toEqual([15, 15, 15, 15]);
    expect(c?.reason).toMatch(/20\.0 % of the transformer kVA/);
  });

  it("without a transformer the share is of the site kVA: 100 kW at 0.70 → 69.15 kvar (48 %) → 7 × 10 kvar", () => {
    // hand: Q = 102.02 kvar, S = 142.86 kVA; need = 102.02 − 32.87 = 69.15 kvar, 48.4 % of S
    // 4×20=80, 5×15=75, 6×12.5=75, 7×10=70, 8×10=80, 9×10=90, 10×7.5=75, 11×7.5=82.5, 12×7.5=90 → 7 × 10
    const q = (100 * Math.sqrt(0.51)) / 0.7;
    const c = recommendBank(q - 100 * TAN95, site(100, q), SYSTEM);
    expect(c?.arrangement).toBe("automatic");
    expect(stepsOf(c)).toEqual(Array(7).fill(10));
    expect(c?.reason).toMatch(/of the site kVA/);
  });

  it("beyond 12 × 100 kvar: steps of 100 kvar, ceil(need/100) of them (2009.3 kvar → 21)", () => {
    // hand: 2000 kW at 0.6: Q = 2666.67 kvar; need = 2666.67 − 657.37 = 2009.30 kvar → ⌈20.09⌉ = 21
    const c = recommendBank(2000 / 0.75 - 2000 * TAN95, site(2000, 2000 / 0.75), SYSTEM, TX);
    expect(c?.arrangement).toBe("automatic");
    expect(stepsOf(c)).toEqual(Array(21).fill(100));
  });
});

describe("through size()", () => {
  it("the recommended bank is analysed and a below-target choice is warned", () => {
    const out = size({
      system: SYSTEM,
      targetPF: 1,
      loads: [{ label: "m", measurement: { method: "kw_kvar", kW: 100, kvar: 23 } }],
      transformer: TX,
    });
    expect(out.ok).toBe(true);
    if (!out.ok) return;
    const b = out.result.recommendedBank;
    expect(b?.arrangement).toBe("fixed");
    expect(b?.steps).toEqual([{ kvar: 20 }]);
    expect(b?.belowTarget).toBe(true);
    expectClose(b?.effectiveKvar, 20, TOL.power, "effective kvar at rated voltage, no reactor");
    // hand: I = 20 000/(√3·480) = 24.06 A
    expectClose(b?.ratedCurrentA, 20_000 / (Math.sqrt(3) * 480), TOL.currentA, "bank current");
    expect(out.result.warnings.map((w) => [w.code, w.path])).toContainEqual(["recommended_bank_below_target", "recommendedBank"]);
  });

  it("the contract example's recommendation: 36.85 kvar → one fixed 40 kvar unit", () => {
    // hand: 62.432 − 77.818·0.328684 = 62.432 − 25.577 = 36.854 kvar; 2.5 % of 1500 kVA
    const out = size({
      system: SYSTEM,
      targetPF: 0.95,
      loads: [{ label: "Press line motor", kind: "motor", measurement: { method: "v_i_pf", volts: 480, amps: 120, pf: 0.78, sense: "lagging" } }],
      transformer: { kVA: 1500, impedancePct: 6 },
    });
    expect(out.ok).toBe(true);
    if (!out.ok) return;
    expectClose(out.result.correction.kvarRequired, 36.854, TOL.powerQuoted, "kvar required");
    expect(out.result.recommendedBank?.arrangement).toBe("fixed");
    expect(out.result.recommendedBank?.steps).toEqual([{ kvar: 40 }]);
  });
});
