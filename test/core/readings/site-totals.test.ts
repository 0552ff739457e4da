import { describe, expect, it } from "vitest";
import type { LoadInput, SystemInput } from "../../../src/core/inputs.js";
import { evaluateSite } from "../../../src/core/readings/site-totals.js";
import { size } from "../../../src/core/pipeline/size.js";
import { expectClose, TOL } from "../../helpers/tolerance.js";

const SYSTEM: SystemInput = { voltageV: 480, frequencyHz: 60, phases: 3 };

// Loads: A 100 kW + 80 kvar; B 50 kW at 0.6 lagging (Q = 50·0.8/0.6 = 66.667 kvar); C 20 kW − 10 kvar (leading).
const LOADS: LoadInput[] = [
  { label: "A", kind: "motor", measurement: { method: "kw_kvar", kW: 100, kvar: 80 } },
  { label: "B", kind: "hvac", measurement: { method: "kw_pf", kW: 50, pf: 0.6, sense: "lagging" } },
  { label: "C", kind: "lighting", measurement: { method: "kw_kvar", kW: 20, kvar: -10 } },
];
// hand calculation: ΣP = 170 kW; ΣQ = 80 + 66.6667 − 10 = 136.6667 kvar
const SUM_KW = 170;
const SUM_KVAR = 80 + 200 / 3 - 10;
const SUM_KVA = Math.sqrt(170 ** 2 + SUM_KVAR ** 2); // √(28 900 + 18 677.8) = 218.124 kVA

describe("site from the sum of loads", () => {
  const out = evaluateSite(SYSTEM, LOADS);

  it("sums kW and signed kvar, then forms kVA and PF (hand calculation)", () => {
    expect(out.issues).toEqual([]);
    expect(out.site?.basis).toBe("sum_of_loads");
    expectClose(out.site?.kW, SUM_KW, TOL.power, "site kW");
    expectClose(out.site?.kvar, SUM_KVAR, TOL.power, "site kvar");
    expectClose(out.site?.kVA, SUM_KVA, TOL.power, "site kVA (hand: 218.124)");
    expectClose(out.site?.displacementPF, SUM_KW / SUM_KVA, TOL.pf, "site PF (hand: 0.77938)");
    expect(out.site?.sense).toBe("lagging");
  });

  it("line current I = S/(√3·V) (hand: 218 124/(1.73205·480) = 262.36 A)", () => {
    expectClose(out.site?.lineCurrentA, (SUM_KVA * 1000) / (Math.sqrt(3) * 480), TOL.currentA, "site line current");
  });

  it("kVA is the phasor sum, less than the arithmetic sum of the loads' kVA", () => {
    // hand: 128.06 + 83.33 + 22.36 = 233.76 kVA arithmetic vs 218.12 kVA phasor
    const arithmetic = out.loads.reduce((s, l) => s + l.kVA, 0);
    expectClose(arithmetic, Math.hypot(100, 80) + 50 / 0.6 + Math.hypot(20, 10), TOL.power, "arithmetic ΣkVA");
    expect(out.site?.kVA ?? Infinity).toBeLessThan(arithmetic);
  });
});

describe("service entrance", () => {
  it("the main reading is the basis; the unmetered remainder is main − Σloads", () => {
    const out = evaluateSite(SYSTEM, LOADS, { label: "main", measurement: { method: "kw_kvar", kW: 200, kvar: 150 } });
    expect(out.site?.basis).toBe("service_entrance");
    expectClose(out.site?.kW, 200, TOL.power, "site kW = main");
    expectClose(out.site?.kvar, 150, TOL.power, "site kvar = main");
    expectClose(out.site?.kVA, 250, TOL.power, "site kVA (hand: √(200² + 150²) = 250)");
    // hand calculation: 200 − 170 = 30 kW; 150 − 136.667 = 13.333 kvar
    expectClose(out.site?.unmetered?.kW, 30, TOL.power, "unmetered kW");
    expectClose(out.site?.unmetered?.kvar, 150 - SUM_KVAR, TOL.power, "unmetered kvar");
    expectClose(out.site?.sumOfLoads.kW, SUM_KW, TOL.power, "sum of loads kept");
    expect(out.warnings.map((w) => w.code)).not.toContain("loads_exceed_main");
  });

  it("loads more than 10 % above the main warn loads_exceed_main (common practice, no source)", () => {
    // 170 kW > 150·1.1 = 165 kW
    const out = evaluateSite(SYSTEM, LOADS, { measurement: { method: "kw_kvar", kW: 150, kvar: 100 } });
    expect(out.warnings.map((w) => [w.code, w.path])).toContainEqual(["loads_exceed_main", "serviceEntrance"]);
    expectClose(out.site?.unmetered?.kW, -20, TOL.power, "negative unmetered kW (hand: 150 − 170)");
  });

  it("loads up to 10 % above the main do not warn", () => {
    // 170 kW ≤ 160·1.1 = 176 kW
    const out = evaluateSite(SYSTEM, LOADS, { measurement: { method: "kw_kvar", kW: 160, kvar: 100 } });
    expect(out.warnings.map((w) => w.code)).not.toContain("loads_exceed_main");
  });

  it("an implausible main reading is an issue on the serviceEntrance path", () => {
    const out = evaluateSite(SYSTEM, LOADS, { measurement: { method: "kw_kva", kW: 300, kVA: 200 } });
    expect(out.site).toBeUndefined();
    expect(out.issues.map((i) => i.path.join("."))).toEqual(["serviceEntrance.measurement.kW"]);
  });

  it("through size(): the correction works on the main, not on Σloads", () => {
    const out = size({
      system: SYSTEM,
      targetPF: 0.95,
      loads: LOADS,
      serviceEntrance: { measurement: { method: "kw_kvar", kW: 200, kvar: 150 } },
    });
    expect(out.ok).toBe(true);
    if (!out.ok) return;
    // hand calculation: 150 − 200·0.328684 = 150 − 65.737 = 84.263 kvar
    expectClose(out.result.correction.kvarRequired, 150 - (200 * Math.sqrt(0.0975)) / 0.95, TOL.power, "kvar required on main");
    // kVA released: 250 − 200/0.95 = 250 − 210.526 = 39.474 kVA
    expectClose(out.result.correction.kVAReleased, 250 - 200 / 0.95, TOL.power, "kVA released");
    // line currents: 250 000/(√3·480) = 300.70 A → 210 526/(√3·480) = 253.23 A
    expectClose(out.result.correction.lineCurrentBeforeA, 250_000 / (Math.sqrt(3) * 480), TOL.currentA, "I before");
    expectClose(out.result.correction.lineCurrentAfterA, 200_000 / 0.95 / (Math.sqrt(3) * 480), TOL.currentA, "I after");
    // loss reduction: 1 − (0.8/0.95)² = 29.086 %
    expectClose(out.result.correction.lossReductionPct, 29.0859, TOL.pct, "loss reduction");
  });
});

describe("mixed phases", () => {
  it("a single-phase load on a three-phase system: its line current is S/V_LL", () => {
    const out = evaluateSite(SYSTEM, [
      { label: "welder", phases: 1, measurement: { method: "v_i_pf", volts: 480, amps: 50, pf: 0.6, sense: "lagging" } },
    ]);
    // hand calculation: S = 480·50/1000 = 24 kVA (single-phase); I = 24 000/480 = 50 A
    expectClose(out.loads[0]?.kVA, 24, TOL.power, "1φ load kVA");
    expectClose(out.loads[0]?.lineCurrentA, 50, TOL.currentA, "1φ load current");
    // site line current is three-phase: 24 000/(√3·480) = 28.868 A
    expectClose(out.site?.lineCurrentA, 24_000 / (Math.sqrt(3) * 480), TOL.currentA, "site current");
  });
});
