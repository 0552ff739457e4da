import { describe, expect, it } from "vitest";
import { runHarmonicStudy, type HarmonicStudyResult } from "../../../src/core/harmonics/harmonics-api.js";
import { size } from "../../../src/core/pipeline/size.js";
import { expectClose, TOL } from "../../helpers/tolerance.js";

function study(input: Parameters<typeof runHarmonicStudy>[0]): HarmonicStudyResult {
  const o = runHarmonicStudy(input);
  if (!o.ok) throw new Error(JSON.stringify(o.issues));
  return o.result;
}

/**
 * Reference case A, worked by hand: a 120/240 V three-wire single-phase service, modelled between its two line
 * conductors at 240 V, 60 Hz. Single-phase transformer 50 kVA, 2 % (infinite upstream), X/R 3 given.
 * One nonlinear load of 12 kVA (fundamental) across the 240 V with a measured 5th of 20 %; one 10 kvar, 240 V
 * plain capacitor.
 *
 *   S_sc = 50/0.02 = 2500 kVA; Z_base = 240²/2 500 000 = 0.02304 Ω
 *   X_s = 0.02304·3/√10 = 0.0218577 Ω; R_s = X_s/3 = 0.0072859 Ω
 *   I_1 = 12 000/240 = 50 A (not 12 000·√3/240 = 86.6 A as a line-to-neutral load of a wye model); I_5 = 10 A
 *   without the capacitor: |Z_s(5)| = √(0.0072859² + 0.109289²) = 0.109531 Ω → V_5 = 1.09531 V = 0.45638 % of 240 V
 *   X_C = 240²/10 000 = 5.76 Ω, X_C/5 = 1.152 Ω;
 *   Z(5) = Z_s·(−j1.152)/(Z_s − j1.152) = (0.125901 − j0.0083934)/(0.0072859 − j1.042711) → |Z(5)| = 0.121008 Ω
 *   with the capacitor: V_5 = 1.21008 V = 0.50420 % of 240 V
 *   capacitor: rated current Q/V = 10 000/240 = 41.667 A; I_c1 = 240/5.76 = 41.667 A; I_c5 = 1.21008/1.152 = 1.05042 A
 *     rms current √(41.667² + 1.0504²)/41.667 = 100.032 %; rms voltage √(240² + 1.21008²)/240 = 100.0013 %
 *     peak (Σ) (240 + 1.21008)/240 = 100.504 %; kvar (240·41.667 + 1.21008·1.05042)/10 000 = 100.0127 %
 *   resonance order √(S_sc/Q) = √(2500/10) = 15.81
 */
describe("single-phase study, case A: 120/240 V three-wire at 240 V line to line", () => {
  const r = study({
    network: { voltageV: 240, frequencyHz: 60, phases: 1, shortCircuitKVA: 2500, xOverR: 3 },
    sources: [{ label: "bench rectifiers", kVA: 12, phases: 1, isDrive: false, spectrum: [{ order: 5, pct: 20 }] }],
    banks: [{ name: "shop capacitor", ratedVoltageV: 240, reactorPct: 0, steps: [{ kvar: 10 }] }],
  });
  const stage = r.banks[0]!.stages[0]!;

  it("source impedance from the single-phase short-circuit kVA", () => {
    expectClose(r.source.baseImpedanceOhm, 0.02304, TOL.quoted4dp, "Z_base");
    expectClose(r.source.reactanceOhm, 0.0218577, { abs: 1e-6 }, "X_s");
  });

  it("the load's current is S/V and the 5th is 0.456 % of 240 V without the capacitor", () => {
    expectClose(r.sources[0]!.fundamentalA, 50, TOL.currentA, "I_1");
    const line = r.withoutCapacitors.distortion.lines.find((l) => l.order === 5)!;
    expectClose(line.currentA, 10, TOL.currentA, "I_5");
    expectClose(line.impedanceOhm, 0.109531, { abs: 1e-5 }, "|Z_s(5)|");
    expectClose(line.voltagePct, 0.45638, { abs: 1e-4 }, "V_5 %");
    expectClose(r.withoutCapacitors.distortion.thdVPct, 0.45638, { abs: 1e-4 }, "THD_v");
  });

  it("with the capacitor: V_5 0.504 %, resonance 15.81", () => {
    const line = stage.distortion.lines.find((l) => l.order === 5)!;
    expectClose(line.impedanceOhm, 0.121008, { abs: 1e-5 }, "|Z(5)|");
    expectClose(line.voltagePct, 0.5042, { abs: 1e-4 }, "V_5 %");
    expectClose(stage.estimatedResonanceOrder, 15.81, TOL.order, "h_r");
  });

  it("capacitor duty on the single-phase rating: rated current Q/V", () => {
    expectClose(stage.duty.ratedCurrentA, 41.667, { abs: 1e-3 }, "rated current");
    expectClose(stage.duty.ratedPhaseV, 240, TOL.voltageV, "rated voltage across the capacitor");
    expectClose(stage.duty.rmsCurrent.valuePct, 100.032, { abs: 1e-3 }, "rms current %");
    expectClose(stage.duty.rmsVoltage.valuePct, 100.0013, { abs: 1e-4 }, "rms voltage %");
    expectClose(stage.duty.peakVoltage.valuePct, 100.504, { abs: 1e-3 }, "peak voltage %");
    expectClose(stage.duty.reactivePower.valuePct, 100.0127, { abs: 1e-4 }, "kvar %");
  });

  it("says it used the single-phase model", () => {
    expect(r.assumptions[0]).toMatch(/^Single-phase model/);
    expect(r.assumptions.some((a) => /line-to-neutral loads/.test(a))).toBe(false);
  });
});

/**
 * Reference case B, worked by hand: a 230 V, 50 Hz single-phase workshop. Single-phase transformer 25 kVA, 4 %,
 * X/R 2 given; one 6.9 kVA (fundamental) load with a measured 3rd of 40 %; a 5 kvar, 230 V plain capacitor.
 *
 *   S_sc = 25/0.04 = 625 kVA; Z_base = 230²/625 000 = 0.08464 Ω; X_s = 0.08464·2/√5 = 0.075704 Ω; R_s = 0.037852 Ω
 *   I_1 = 6900/230 = 30 A; I_3 = 12 A
 *   without the capacitor: |Z_s(3)| = √(0.037852² + 0.227113²) = 0.230246 Ω → V_3 = 2.76295 V = 1.20128 % of 230 V
 *   X_C = 230²/5000 = 10.58 Ω, X_C/3 = 3.52667 Ω; |Z(3)| = |Z_s(3) ∥ −j3.52667| = 0.246078 Ω
 *   with the capacitor: V_3 = 2.95293 V = 1.28388 %; rated current 5000/230 = 21.739 A; resonance √(625/5) = 11.18
 */
describe("single-phase study, case B: 230 V", () => {
  const r = study({
    network: { voltageV: 230, frequencyHz: 50, phases: 1, shortCircuitKVA: 625, xOverR: 2 },
    sources: [{ label: "kiln controller", kVA: 6.9, phases: 1, isDrive: false, spectrum: [{ order: 3, pct: 40 }] }],
    banks: [{ name: "workshop capacitor", ratedVoltageV: 230, reactorPct: 0, steps: [{ kvar: 5 }] }],
  });
  const stage = r.banks[0]!.stages[0]!;

  it("V_3 without and with the capacitor, on the 230 V between the conductors", () => {
    expectClose(r.withoutCapacitors.distortion.lines[0]!.currentA, 12, TOL.currentA, "I_3");
    expectClose(r.withoutCapacitors.distortion.thdVPct, 1.20128, { abs: 1e-4 }, "THD_v without");
    expectClose(stage.distortion.thdVPct, 1.28388, { abs: 1e-4 }, "THD_v with");
    expectClose(stage.distortion.lines[0]!.voltagePhaseV, 2.95293, { abs: 1e-4 }, "V_3 volts");
  });

  it("rated current Q/V and resonance √(S_sc/Q)", () => {
    expectClose(stage.duty.ratedCurrentA, 21.739, { abs: 1e-3 }, "rated current");
    expectClose(stage.estimatedResonanceOrder, 11.18, TOL.order, "h_r");
  });
});

describe("single-phase sizing: the study agrees with the sizing's own single-phase figures", () => {
  // The same 230 V workshop through the whole sizing: the kiln controller read as 6.9 kVA fundamental (kw_kvar),
  // plus a 20 kW, PF 0.75 lagging compressor so that a bank is designed.
  const outcome = size({
    system: { voltageV: 230, frequencyHz: 50, phases: 1 },
    transformer: { kVA: 25, impedancePct: 4, xOverR: 2 },
    loads: [
      // 6.9 kVA fundamental: 6 kW with √(6.9² − 6²) = 3.4073 kvar
      {
        label: "kiln controller",
        kind: "drive",
        measurement: { method: "kw_kvar", kW: 6, kvar: Math.sqrt(6.9 ** 2 - 36) },
        harmonics: [{ order: 3, pct: 40 }],
      },
      { label: "compressor", kind: "motor", measurement: { method: "kw_pf", kW: 20, pf: 0.75, sense: "lagging" } },
    ],
  });
  if (!outcome.ok) throw new Error(JSON.stringify(outcome.issues));
  const { result } = outcome;

  it("V_3 without capacitors: case B's source damped by the compressor, R = 230²/20 000 = 2.645 Ω", () => {
    // hand: Z_s(3) = 0.037852 + j0.227113 in parallel with 2.645 Ω:
    //   Z = (0.037852 + j0.227113)·2.645/(2.682852 + j0.227113) → |Z| = 0.230246·2.645/2.692448 = 0.609000/2.692448 = 0.226188 Ω
    //   V_3 = 12·0.226188 = 2.71426 V = 1.18011 % of 230 V (the wye model would have said 3 × that)
    expectClose(result.harmonics!.withoutCapacitors.distortion.thdVPct, 1.18011, { abs: 1e-4 }, "THD_v");
  });

  it("the study's rated current of the full bank equals the sizing's Q/V", () => {
    const bank = result.recommendedBank!;
    expect(bank.ratedVoltageV).toBe(230);
    const stages = result.harmonics!.banks.find((b) => b.name === "recommended")!.stages;
    const last = stages[stages.length - 1]!;
    // The sizing's own figure: Q_eff/V with no reactor and rated voltage = system voltage.
    expectClose(last.duty.ratedCurrentA, (bank.effectiveKvar * 1000) / 230, TOL.currentA, "Q/V");
    expectClose(last.duty.ratedCurrentA, bank.ratedCurrentA, TOL.currentA, "sizing's ratedCurrentA");
  });
});
