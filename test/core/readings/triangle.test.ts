import { describe, expect, it } from "vitest";
import type { Measurement } from "../../../src/core/inputs.js";
import { triangleOf } from "../../../src/core/readings/triangle.js";
import { evaluateSite } from "../../../src/core/readings/site-totals.js";
import { expectClose, TOL } from "../../helpers/tolerance.js";

const AT = ["loads", 0, "measurement"];

/** Reference readings, each row hand-computed (source beside it). */
const CASES: {
  name: string;
  phases: 1 | 3;
  m: Measurement;
  kW: number;
  kvar: number;
  kVA: number;
  pf: number;
  measuredKVA?: number;
  source: string;
}[] = [
  {
    name: "kw_kva lagging (default sense)",
    phases: 3,
    m: { method: "kw_kva", kW: 80, kVA: 100 },
    kW: 80,
    kvar: 60,
    kVA: 100,
    pf: 0.8,
    measuredKVA: 100,
    source: "hand calculation: Q = √(100² − 80²) = 60 kvar, PF 80/100",
  },
  {
    name: "kw_kva leading",
    phases: 3,
    m: { method: "kw_kva", kW: 80, kVA: 100, sense: "leading" },
    kW: 80,
    kvar: -60,
    kVA: 100,
    pf: 0.8,
    measuredKVA: 100,
    source: "hand calculation: Q = −√(100² − 80²) = −60 kvar",
  },
  {
    name: "kw_kvar",
    phases: 3,
    m: { method: "kw_kvar", kW: 120, kvar: 90 },
    kW: 120,
    kvar: 90,
    kVA: 150,
    pf: 0.8,
    source: "hand calculation: S = √(120² + 90²) = 150 kVA, PF 120/150",
  },
  {
    name: "kw_pf",
    phases: 3,
    m: { method: "kw_pf", kW: 50, pf: 0.5, sense: "lagging" },
    kW: 50,
    kvar: 50 * Math.sqrt(3),
    kVA: 100,
    pf: 0.5,
    source: "hand calculation: tan(acos 0.5) = √3 → Q = 86.603 kvar, S = 50/0.5 = 100 kVA",
  },
  {
    name: "v_i_kw three-phase",
    phases: 3,
    m: { method: "v_i_kw", volts: 400, amps: 100, kW: 55 },
    kW: 55,
    kvar: Math.sqrt(1775),
    kVA: 40 * Math.sqrt(3),
    pf: 55 / (40 * Math.sqrt(3)),
    measuredKVA: 40 * Math.sqrt(3),
    source: "hand calculation: S = √3·400·100/1000 = 69.282 kVA; Q = √(4800 − 3025) = √1775 = 42.131 kvar; PF 0.79386",
  },
  {
    name: "v_i_kw single-phase",
    phases: 1,
    m: { method: "v_i_kw", volts: 240, amps: 50, kW: 9.6 },
    kW: 9.6,
    kvar: 7.2,
    kVA: 12,
    pf: 0.8,
    measuredKVA: 12,
    source: "hand calculation: S = 240·50/1000 = 12 kVA; Q = √(144 − 92.16) = 7.2 kvar",
  },
  {
    name: "v_i_pf three-phase (the contract example)",
    phases: 3,
    m: { method: "v_i_pf", volts: 480, amps: 120, pf: 0.78, sense: "lagging" },
    kW: 0.78 * 57.6 * Math.sqrt(3),
    kvar: Math.sqrt(1 - 0.78 ** 2) * 57.6 * Math.sqrt(3),
    kVA: 57.6 * Math.sqrt(3),
    pf: 0.78,
    measuredKVA: 57.6 * Math.sqrt(3),
    source: "hand calculation: S = √3·480·120/1000 = 99.766 kVA; P = 0.78·S = 77.818 kW; Q = 0.62578·S = 62.432 kvar",
  },
  {
    name: "v_i_pf single-phase leading",
    phases: 1,
    m: { method: "v_i_pf", volts: 120, amps: 20, pf: 0.9, sense: "leading" },
    kW: 2.16,
    kvar: -2.4 * Math.sqrt(0.19),
    kVA: 2.4,
    pf: 0.9,
    measuredKVA: 2.4,
    source: "hand calculation: S = 120·20/1000 = 2.4 kVA; P = 2.16 kW; Q = −2.4·√0.19 = −1.0461 kvar",
  },
];

describe("measurement methods → power triangle", () => {
  it.each(CASES)("$name ($source)", ({ name, phases, m, kW, kvar, kVA, pf, measuredKVA }) => {
    const out = triangleOf(m, phases, AT);
    expect(out.issues).toEqual([]);
    const t = out.triangle;
    expect(t).toBeDefined();
    expectClose(t?.kW, kW, TOL.power, `${name} kW`);
    expectClose(t?.kvar, kvar, TOL.power, `${name} kvar`);
    expectClose(t?.kVA, kVA, TOL.power, `${name} kVA`);
    expectClose(t?.displacementPF, pf, TOL.pf, `${name} PF`);
    expect(t?.sense).toBe(kvar > 0 ? "lagging" : "leading");
    if (measuredKVA === undefined) expect(t?.measuredKVA).toBeUndefined();
    else expectClose(t?.measuredKVA, measuredKVA, TOL.power, `${name} measured kVA`);
  });
});

describe("kW against kVA plausibility (1 % meter tolerance, common practice)", () => {
  it("kw_kva: kW more than 1 % above kVA is an issue on the kW path", () => {
    // 102 > 100·1.01 = 101
    const out = triangleOf({ method: "kw_kva", kW: 102, kVA: 100 }, 3, AT);
    expect(out.triangle).toBeUndefined();
    expect(out.issues).toHaveLength(1);
    expect(out.issues[0]?.path).toEqual(["loads", 0, "measurement", "kW"]);
    expect(out.issues[0]?.message).toMatch(/kW exceeds kVA/);
  });

  it("v_i_kw: kW above V·I·√3 by more than 1 % is an issue", () => {
    // hand calculation: √3·400·100/1000 = 69.282 kVA; 70.1/69.282 = 1.0118 → 1.18 % above
    const out = triangleOf({ method: "v_i_kw", volts: 400, amps: 100, kW: 70.1 }, 3, AT);
    expect(out.issues.map((i) => i.path.join("."))).toEqual(["loads.0.measurement.kW"]);
    expect(out.issues[0]?.message).toMatch(/kW exceeds kVA/);
  });

  it("within 1 % it is clamped to unity with warning kw_clamped_to_kva", () => {
    // 100.5 kW on 100 kVA: 0.5 % above
    const out = triangleOf({ method: "kw_kva", kW: 100.5, kVA: 100, sense: "lagging" }, 3, AT);
    expect(out.issues).toEqual([]);
    expect(out.warnings.map((w) => [w.code, w.path])).toEqual([["kw_clamped_to_kva", "loads.0.measurement.kW"]]);
    expect(out.triangle?.sense).toBe("unity");
    expect(out.triangle?.kvar).toBe(0);
    expectClose(out.triangle?.displacementPF, 1, TOL.pf, "clamped PF");
    expectClose(out.triangle?.kVA, 100.5, TOL.power, "triangle kVA = kW at unity");
  });

  it("kW equal to kVA is unity without a warning", () => {
    const out = triangleOf({ method: "kw_kva", kW: 100, kVA: 100 }, 3, AT);
    expect(out.warnings).toEqual([]);
    expect(out.triangle?.sense).toBe("unity");
  });
});

describe("sense", () => {
  it('"unity" with a PF well below 1 is an issue on the sense path', () => {
    const out = triangleOf({ method: "kw_pf", kW: 10, pf: 0.9, sense: "unity" }, 3, AT);
    expect(out.issues.map((i) => i.path.join("."))).toEqual(["loads.0.measurement.sense"]);
  });

  it("pf = 1 is unity whatever sense was given", () => {
    const t = triangleOf({ method: "kw_pf", kW: 10, pf: 1, sense: "leading" }, 3, AT).triangle;
    expect(t?.sense).toBe("unity");
    expect(t?.kvar).toBe(0);
  });
});

describe("true PF readings", () => {
  it("true PF + current THD → DPF = PF·√(1 + THD²) (IEEE Std 1459-2010 distortion factor, sinusoidal voltage)", () => {
    const out = triangleOf({ method: "kw_pf", kW: 100, pf: 0.8, sense: "lagging", pfType: "true", currentTHDPct: 30 }, 3, AT);
    // hand calculation: DPF = 0.8·√1.09 = 0.835225; Q = 100·√(1 − 0.6976)/0.835225 = 100·0.549909/0.835225 = 65.840 kvar
    expectClose(out.triangle?.displacementPF, 0.8 * Math.sqrt(1.09), TOL.pf, "derived DPF");
    expectClose(out.triangle?.kvar, (100 * Math.sqrt(0.3024)) / (0.8 * Math.sqrt(1.09)), TOL.power, "kvar from DPF");
    expectClose(out.triangle?.truePF, 0.8, TOL.pf, "true PF kept");
    expect(out.warnings.map((w) => w.code)).toEqual(["displacement_pf_derived"]);
  });

  it("DPF is capped at 1", () => {
    // hand calculation: 0.9·√(1 + 0.36) = 1.0496 > 1 → 1, no kvar
    const out = triangleOf({ method: "kw_pf", kW: 100, pf: 0.9, sense: "lagging", pfType: "true", currentTHDPct: 60 }, 3, AT);
    expectClose(out.triangle?.displacementPF, 1, TOL.pf, "capped DPF");
    expect(out.triangle?.kvar).toBe(0);
  });

  it("true PF without THD warns true_pf_without_thd and is used as displacement PF", () => {
    const out = triangleOf({ method: "kw_pf", kW: 100, pf: 0.8, sense: "lagging", pfType: "true" }, 3, AT);
    expect(out.warnings.map((w) => [w.code, w.path])).toEqual([["true_pf_without_thd", "loads.0.measurement.pfType"]]);
    // hand calculation: 100·0.75 = 75 kvar, as for a displacement reading
    expectClose(out.triangle?.kvar, 75, TOL.power, "kvar");
  });

  it("v_i_pf true PF: kW = V·I·√3·PF_true, the meter's kVA kept as measuredKVA", () => {
    const out = triangleOf({ method: "v_i_pf", volts: 400, amps: 100, pf: 0.7, sense: "lagging", pfType: "true", currentTHDPct: 40 }, 3, AT);
    // hand calculation: S = 69.282 kVA; P = 0.7·69.282 = 48.497 kW; DPF = 0.7·√1.16 = 0.753923
    expectClose(out.triangle?.kW, 0.7 * 40 * Math.sqrt(3), TOL.power, "kW");
    expectClose(out.triangle?.measuredKVA, 40 * Math.sqrt(3), TOL.power, "measured kVA");
    expectClose(out.triangle?.displacementPF, 0.7 * Math.sqrt(1.16), TOL.pf, "DPF");
  });
});

describe("quantity", () => {
  it("multiplies kW, kvar, kVA, measured kVA and the entry's line current", () => {
    const out = evaluateSite({ voltageV: 480, frequencyHz: 60, phases: 3 }, [
      { label: "4 fans", quantity: 4, measurement: { method: "kw_pf", kW: 10, pf: 0.8, sense: "lagging" } },
      { label: "3 pumps", quantity: 3, measurement: { method: "v_i_pf", volts: 480, amps: 20, pf: 0.85, sense: "lagging" } },
    ]);
    const [fans, pumps] = out.loads;
    // hand calculation: 4 × (10 kW, 7.5 kvar, 12.5 kVA)
    expectClose(fans?.kW, 40, TOL.power, "fans kW");
    expectClose(fans?.kvar, 30, TOL.power, "fans kvar");
    expectClose(fans?.kVA, 50, TOL.power, "fans kVA");
    expect(fans?.quantity).toBe(4);
    // hand calculation: one pump √3·480·20/1000 = 16.628 kVA; three 49.883 kVA; line current 3·20 = 60 A
    expectClose(pumps?.measuredKVA, 3 * Math.sqrt(3) * 9.6, TOL.power, "pumps measured kVA");
    expectClose(pumps?.kW, 3 * Math.sqrt(3) * 9.6 * 0.85, TOL.power, "pumps kW");
    expectClose(pumps?.lineCurrentA, 60, TOL.currentA, "pumps line current");
    // site: 40 + 42.401 kW (hand: 49.883·0.85)
    expectClose(out.site?.kW, 40 + 3 * Math.sqrt(3) * 9.6 * 0.85, TOL.power, "site kW");
  });
});
