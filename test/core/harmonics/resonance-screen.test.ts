import { describe, expect, it } from "vitest";
import type { LoadInput, SizingInput } from "../../../src/core/inputs.js";
import { harmonicOrdersPresent, nearHarmonic, parallelResonanceOrder, voltageRisePct } from "../../../src/core/harmonics/resonance.js";
import { shortCircuitAtBus } from "../../../src/core/harmonics/short-circuit.js";
import { size } from "../../../src/core/pipeline/size.js";
import { expectClose, TOL } from "../../helpers/tolerance.js";

describe("short-circuit strength at the bus (MVA method: series per-unit impedances add)", () => {
  it("1500 kVA, 5.5 % Z, 48 MVA utility → 17 391 kVA", () => {
    const sc = shortCircuitAtBus({ kVA: 1500, impedancePct: 5.5 }, { faultMVA: 48 });
    // hand calculation: transformer alone 1500/0.055 = 27 272.7 kVA;
    //   1/(1/48 000 + 1/27 272.7) = 1/(2.08333e-5 + 3.66667e-5) = 1/5.75e-5 = 17 391.3 kVA
    expectClose(sc?.shortCircuitKVA, 17_391, TOL.shortCircuitKVARounded, "S_sc");
    expectClose(sc?.transformerShortCircuitKVA, 27_272.7, TOL.shortCircuitKVAQuoted, "transformer alone");
    expectClose(sc?.utilityShortCircuitKVA, 48_000, TOL.shortCircuitKVA, "utility");
  });

  it("contract example: 1500 kVA 6 %, 500 MVA → 1/(1/500 000 + 0.06/1500) = 1/4.2e-5 = 23 809.5 kVA (hand)", () => {
    expectClose(shortCircuitAtBus({ kVA: 1500, impedancePct: 6 }, { faultMVA: 500 })?.shortCircuitKVA, 1 / 4.2e-5, TOL.shortCircuitKVA, "S_sc");
  });

  it("transformer on an infinite utility, utility alone, and neither", () => {
    const tx = shortCircuitAtBus({ kVA: 1500, impedancePct: 5.5 }, undefined);
    expectClose(tx?.shortCircuitKVA, 1500 / 0.055, TOL.shortCircuitKVA, "transformer alone (hand: 27 272.7)");
    expect(tx?.utilityShortCircuitKVA).toBeNull();
    const ut = shortCircuitAtBus(undefined, { faultMVA: 250 });
    expectClose(ut?.shortCircuitKVA, 250_000, TOL.shortCircuitKVA, "utility alone");
    expect(ut?.transformerShortCircuitKVA).toBeNull();
    expect(shortCircuitAtBus(undefined, undefined)).toBeNull();
  });
});

describe("parallel resonance order h = √(1/(Q_C/S_sc + p))", () => {
  const ROWS = [
    { q: 350, ssc: 1 / (1 / 48_000 + 0.055 / 1500), p: 0, h: 7.05, source: "hand: √(17 391.3/350) = √49.689 = 7.049" },
    { q: 350, ssc: 1500 / 0.055, p: 0, h: 8.83, source: "hand: √(27 272.7/350) = √77.922 = 8.827 (transformer alone)" },
    { q: 100, ssc: 1 / 4.2e-5, p: 0.07, h: 3.671, source: "hand: √(1/(100/23 809.5 + 0.07)) = √(1/0.0742) = 3.6711" },
    { q: 200, ssc: 1 / 4.2e-5, p: 0.07, h: 3.571, source: "hand: √(1/(200/23 809.5 + 0.07)) = √(1/0.0784) = 3.5714" },
    { q: 1000, ssc: 25_000, p: 0, h: 5, source: "hand: √(25 000/1000) = 5" },
  ];
  it.each(ROWS)("Q = $q kvar, p = $p → h = $h ($source)", ({ q, ssc, p, h }) => {
    expectClose(parallelResonanceOrder(q, ssc, p), h, TOL.order, "h");
  });

  it("a reactor always keeps h below the tuning order 1/√p (hand: 1/√0.07 = 3.78)", () => {
    for (const q of [10, 100, 1000]) expect(parallelResonanceOrder(q, 1e6, 0.07)).toBeLessThan(3.78);
  });
});

describe("voltage rise ΔV % ≈ Q/S_sc·100 (common practice)", () => {
  it("350 kvar on 17 391.3 kVA → 2.01 % (hand: 350/17 391.3·100 = 2.0125)", () => {
    expectClose(voltageRisePct(350, 1 / (1 / 48_000 + 0.055 / 1500)), 2.0125, TOL.pct, "ΔV %");
  });
});

describe("harmonic orders present and the ±10 % band", () => {
  const drive: LoadInput = { label: "VFD", kind: "drive", measurement: { method: "kw_kva", kW: 90, kVA: 100 } };
  const motor: LoadInput = { label: "motor", kind: "motor", measurement: { method: "kw_pf", kW: 90, pf: 0.8, sense: "lagging" } };

  it("drives bring 5, 7, 11, 13; declared sources their own; measured spectra ≥ 1 %", () => {
    expect(harmonicOrdersPresent([motor])).toEqual([]);
    expect(harmonicOrdersPresent([drive])).toEqual([5, 7, 11, 13]);
    expect(harmonicOrdersPresent([motor], ["twelve_pulse"])).toEqual([11, 13]);
    expect(harmonicOrdersPresent([motor], ["single_phase_electronic"])).toEqual([3]);
    const measured = {
      ...motor,
      harmonics: [
        { order: 3, pct: 12 },
        { order: 9, pct: 0.5 },
      ],
    };
    expect(harmonicOrdersPresent([measured])).toEqual([3]);
  });

  // band of 7: 6.3 … 7.7; of 5: 4.5 … 5.5 (10 % of the order, common practice, no source)
  const BAND = [
    { h: 7.69, orders: [5, 7, 11, 13], near: 7 },
    { h: 7.71, orders: [5, 7, 11, 13], near: null },
    { h: 6.31, orders: [5, 7, 11, 13], near: 7 },
    { h: 6.0, orders: [5, 7, 11, 13], near: null },
    { h: 4.6, orders: [5, 7, 11, 13], near: 5 },
    { h: 3.2, orders: [3], near: 3 },
    { h: 3.2, orders: [5, 7], near: null },
  ];
  it.each(BAND)("h = $h against $orders → $near", ({ h, orders, near }) => {
    expect(nearHarmonic(h, orders)).toBe(near);
  });
});

/** The 1500 kVA / 5.5 % / 48 MVA supply (S_sc = 17 391.3 kVA) with one site and a proposed bank rated at the bus voltage. */
function supplyCase(loads: LoadInput[], steps: number[], extra: Partial<SizingInput> = {}): SizingInput {
  return {
    system: { voltageV: 480, frequencyHz: 60, phases: 3 },
    loads,
    transformer: { kVA: 1500, impedancePct: 5.5 },
    utility: { faultMVA: 48 },
    proposedBank: { ratedVoltageV: 480, steps: steps.map((kvar) => ({ kvar })) },
    ...extra,
  };
}
const MOTOR: LoadInput = { label: "motors", kind: "motor", measurement: { method: "kw_pf", kW: 600, pf: 0.75, sense: "lagging" } };
const SMALL_DRIVE: LoadInput = { label: "VFD", kind: "drive", measurement: { method: "kw_kva", kW: 100, kVA: 125 } };

function run(input: SizingInput) {
  const out = size(input);
  if (!out.ok) throw new Error(`unexpected issues: ${JSON.stringify(out.issues)}`);
  return out.result;
}
const codes = (r: ReturnType<typeof run>) => r.warnings.map((w) => w.code);
/** Warnings about the proposed bank only (the recommended bank is screened too, with its own paths). */
const proposedCodes = (r: ReturnType<typeof run>) => r.warnings.filter((w) => w.path?.startsWith("proposedBank")).map((w) => w.code);

describe("resonance screen in size()", () => {
  it("a 350 kvar stage (h ≈ 7.05) with a drive on site → resonance_near_harmonic at the 7th", () => {
    const r = run(supplyCase([MOTOR, SMALL_DRIVE], [350]));
    const stage = r.proposedBank?.stages[0];
    expectClose(stage?.resonanceOrder, 7.05, TOL.order, "h");
    // 7.049 × 60 Hz = 422.9 Hz
    expectClose(stage?.resonanceHz, 422.9, TOL.frequencyHz, "resonance Hz");
    expect(stage?.nearHarmonic).toBe(7);
    const flagged = r.warnings.filter((w) => w.code === "resonance_near_harmonic" && w.path?.startsWith("proposedBank"));
    expect(flagged.map((w) => [w.path, w.subjects])).toEqual([["proposedBank.steps", ["stage 1"]]]);
    expectClose(stage?.voltageRisePct, 2.0125, TOL.pct, "stage voltage rise (hand: 350/17 391.3)");
    expectClose(r.resonance?.proposedBankVoltageRisePct, 2.0125, TOL.pct, "bank voltage rise");
    expectClose(r.resonance?.shortCircuitKVA, 17_391, TOL.shortCircuitKVARounded, "S_sc in summary");
    expect(r.resonance?.harmonicOrdersPresent).toEqual([5, 7, 11, 13]);
  });

  it("stages are cumulative: 100 / 200 / 350 kvar → h 13.19 (near 13), 9.33 (clear), 7.05 (near 7)", () => {
    // hand calculation: √(17 391.3/100) = 13.188; √(17 391.3/200) = 9.325; √(17 391.3/350) = 7.049
    const r = run(supplyCase([MOTOR, SMALL_DRIVE], [100, 100, 150]));
    const stages = r.proposedBank?.stages ?? [];
    expect(stages.map((s) => s.cumulativeNameplateKvar)).toEqual([100, 200, 350]);
    expectClose(stages[0]?.resonanceOrder, 13.19, TOL.order, "stage 1 h");
    expectClose(stages[1]?.resonanceOrder, 9.33, TOL.order, "stage 2 h");
    expectClose(stages[2]?.resonanceOrder, 7.05, TOL.order, "stage 3 h");
    expect(stages.map((s) => s.nearHarmonic)).toEqual([13, null, 7]);
    const flagged = r.warnings.filter((w) => w.code === "resonance_near_harmonic" && w.path?.startsWith("proposedBank"));
    // One concern, one warning: both resonant stages listed in it, each with its order and harmonic.
    expect(flagged.map((w) => [w.path, w.subjects])).toEqual([["proposedBank.steps", ["stage 1", "stage 3"]]]);
    expect(flagged[0]!.message).toMatch(/^stages 1, 3 resonate .* 7th and 13th harmonics/);
    expect(flagged[0]!.message).toContain("stage 1 (100.0 kvar) at 13.19; stage 3 (350.0 kvar) at 7.05");
  });

  it("the same bank with only motors (no harmonic source) is not flagged", () => {
    const r = run(supplyCase([MOTOR], [350]));
    expect(r.proposedBank?.stages[0]?.nearHarmonic).toBeNull();
    expect(codes(r)).not.toContain("resonance_near_harmonic");
    expect(r.resonance?.harmonicOrdersPresent).toEqual([]);
  });

  it("harmonicSources six_pulse flags it without a drive load; twelve_pulse does not (7.05 is not near 11 or 13)", () => {
    expect(proposedCodes(run(supplyCase([MOTOR], [350], { harmonicSources: ["six_pulse"] })))).toContain("resonance_near_harmonic");
    expect(proposedCodes(run(supplyCase([MOTOR], [350], { harmonicSources: ["twelve_pulse"] })))).not.toContain("resonance_near_harmonic");
  });

  it("single_phase_electronic flags a stage near the 3rd", () => {
    // 1000 kVA 5 % on an infinite utility: S_sc = 20 000 kVA (hand); 2000 kvar → h = √10 = 3.162, within 2.7 … 3.3
    const input: SizingInput = {
      system: { voltageV: 480, frequencyHz: 60, phases: 3 },
      loads: [{ label: "offices", kind: "lighting", measurement: { method: "kw_pf", kW: 1500, pf: 0.6, sense: "lagging" } }],
      transformer: { kVA: 1000, impedancePct: 5 },
      proposedBank: { ratedVoltageV: 480, steps: [{ kvar: 2000 }] },
      harmonicSources: ["single_phase_electronic"],
    };
    const r = run(input);
    expectClose(r.proposedBank?.stages[0]?.resonanceOrder, 3.162, TOL.order, "h");
    expect(r.proposedBank?.stages[0]?.nearHarmonic).toBe(3);
    expect(proposedCodes(r)).toContain("resonance_near_harmonic");
    // the same bank with six-pulse sources only: 3.162 is near none of 5, 7, 11, 13
    expect(proposedCodes(run({ ...input, harmonicSources: ["six_pulse"] }))).not.toContain("resonance_near_harmonic");
  });

  it("drive kVA above 15 % of the transformer → harmonic_study_advised (makers' rule of thumb)", () => {
    // 300 kVA of drives on 1500 kVA = 20 % (hand)
    const big: LoadInput = { label: "VFDs", kind: "drive", quantity: 2, measurement: { method: "kw_kva", kW: 135, kVA: 150 } };
    const r = run(supplyCase([MOTOR, big], [50]));
    expect(codes(r)).toContain("harmonic_study_advised");
    expect(r.resonance?.harmonicStudyAdvised).toBe(true);
    expectClose(r.resonance?.nonlinearKVA, 300, TOL.power, "nonlinear kVA");
    expectClose(r.resonance?.nonlinearSharePct, 20, TOL.pct, "nonlinear share");
  });

  it("drive kVA at or below 15 % → not advised", () => {
    // 125/1500 = 8.3 %; 225/1500 = 15 % exactly (not above)
    expect(codes(run(supplyCase([MOTOR, SMALL_DRIVE], [50])))).not.toContain("harmonic_study_advised");
    const at15: LoadInput = { label: "VFD", kind: "drive", measurement: { method: "kw_kva", kW: 200, kVA: 225 } };
    const r = run(supplyCase([MOTOR, at15], [50]));
    expectClose(r.resonance?.nonlinearSharePct, 15, TOL.pct, "share");
    expect(codes(r)).not.toContain("harmonic_study_advised");
    // The share rule does not fire; the flag is still true when the study changed the design, and says so.
    expect(r.resonance?.harmonicStudyReasons.some((x) => /nonlinear/.test(x))).toBe(false);
    expect(r.resonance?.harmonicStudyAdvised).toBe((r.harmonics?.proposals.length ?? 0) > 0);
  });

  it("harmonic sources without any supply data → resonance_not_screened", () => {
    const r = run({ system: { voltageV: 480, frequencyHz: 60, phases: 3 }, loads: [MOTOR, SMALL_DRIVE] });
    expect(r.recommendedBank).not.toBeNull();
    expect(r.resonance).toBeUndefined();
    expect(r.warnings.map((w) => [w.code, w.path])).toContainEqual(["resonance_not_screened", "transformer"]);
  });
});
