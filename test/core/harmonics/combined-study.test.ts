import { Complex } from "complex.js";
import { describe, expect, it } from "vitest";
import { studyCombinedStages, type RatedSwitchUnit } from "../../../src/core/harmonics/combined-study.js";
import { buildBusModel, type InjectedCurrents, type NetworkInput, type StudyContext } from "../../../src/core/harmonics/harmonics-api.js";
import type { SizingInput } from "../../../src/core/inputs.js";
import { size } from "../../../src/core/pipeline/size.js";
import { expectClose, TOL } from "../../helpers/tolerance.js";

/**
 * The small case worked by hand: 480 V, 60 Hz, three-phase bus of S_sc = 10 000 kVA at X/R 10, no linear load;
 * one source injecting 20 A of 5th harmonic per phase. Installed: one plain 50 kvar step rated 480 V. New: one
 * 50 kvar step rated 480 V behind a 7 % reactor (reactor X/R 50, the default).
 *
 * Z_base = 480²/10 000 000 = 0.02304 Ω; X_s = 0.02304·sin(atan 10) = 0.022926 Ω, R_s = X_s/10 = 0.0022926 Ω.
 * X_C = 480²/50 000 = 4.608 Ω for each step; X_L = 0.07·4.608 = 0.32256 Ω; R_r = 0.32256/50 = 0.0064512 Ω.
 * At h = 5: Z_s = 0.0022926 + j0.114628; plain −j4.608/5 = −j0.9216; detuned 0.0064512 + j(1.6128 − 0.9216) = 0.0064512 + j0.6912.
 * Admittances: Y_s = 0.174407 − j8.720362; Y_plain = +j1.085069; Y_detuned = 0.013502 − j1.446633.
 * Both in: Y = 0.187909 − j9.081926 → |Z| = 1/|Y| = 0.110085 Ω; V_5 = 20·0.110085 = 2.20170 V
 *   = 2.20170/(480/√3 = 277.128) = 0.7945 % (THD_v: the only order).
 * Plain alone: Y = 0.174407 − j7.635293 → |Z| = 0.130937 Ω; V_5 = 2.61873 V = 0.9450 %: the detuned step in parallel
 *   lowers the 5th (its branch is inductive at h = 5 > 1/√0.07 = 3.78 and shares the current).
 * Duty with both in (IEEE Std 18 quantities, rated current 50 000/(√3·480) = 60.1407 A):
 *   plain: I_1 = 277.128/4.608 = 60.1407 A, I_5 = 2.20170/0.9216 = 2.38900 A → I_rms = √(60.1407² + 2.389²) = 100.079 %.
 *   detuned: V_c1 = 277.128/0.93 = 297.987 V, I_1 = 297.987/4.608 = 64.6674 A; I_5 = 2.20170/|0.0064512 + j0.6912|
 *   = 3.18520 A; V_c5 = 3.18520·4.608/5 = 2.93548 V → I_rms 107.657 %, V_rms = √(297.987² + 2.935²)/277.128 = 107.532 %,
 *   V_peak = (297.987 + 2.935)/277.128 = 108.586 %, kvar = 3·(297.987·64.6674 + 2.935·3.1852)/50 000 = 115.676 %.
 */
const network: NetworkInput = { voltageV: 480, frequencyHz: 60, phases: 3, shortCircuitKVA: 10_000, xOverR: 10 };

function context(): StudyContext {
  const byOrderA = new Float64Array(51);
  byOrderA[5] = 20;
  const currents: InjectedCurrents = { byOrderA, fundamentalA: 100, orders: [5], sources: [] };
  return {
    network,
    model: buildBusModel(network),
    currents,
    background: [],
    presentOrders: [5],
    scan: {},
    includeScanSeries: false,
    reactorQualityFactor: 50,
  };
}

const wallStep: RatedSwitchUnit = {
  label: "Wall bank",
  bank: "Wall bank",
  capacitorKvar: 50,
  reactorFraction: 0,
  effectiveKvar: 50,
  fixed: false,
  nameplateKvar: 50,
  ratedVoltageV: 480,
  ratedFrequencyHz: 60,
};
const newBank = {
  name: "recommended",
  reactorPct: 7,
  ratedVoltageV: 480,
  ratedFrequencyHz: 60,
  stages: [{ nameplateKvar: 50, effectiveKvar: 50 / 0.93 }],
};

/** Independent oracle: |Z(5)| of the bus from raw parameters, complex.js admittances. */
function oracleZ5(withDetuned: boolean): number {
  const zb = 480 ** 2 / 10_000_000;
  const xs = (zb * 10) / Math.sqrt(101);
  const xc = 480 ** 2 / 50_000;
  const one = new Complex(1, 0);
  let y = one.div(new Complex(xs / 10, 5 * xs)).add(one.div(new Complex(0, -xc / 5)));
  if (withDetuned) y = y.add(one.div(new Complex((0.07 * xc) / 50, 5 * 0.07 * xc - xc / 5)));
  return one.div(y).abs();
}

describe("harmonic study of installed and new steps together", () => {
  const r = studyCombinedStages(context(), [wallStep], newBank);
  const both = r.flagged.find((s) => s.newStage === 1)!;
  const alone = r.flagged.find((s) => s.newStage === 0)!;

  it("studies the two combinations with the installed step in (the new step alone is the bank's own study)", () => {
    expect(r.stagesStudied).toBe(2);
    expect(r.truncated).toBe(false);
    expect(both.installed).toEqual(["Wall bank"]);
    expectClose(both.totalKvar, 50 + 50 / 0.93, TOL.power, "total kvar");
  });

  it("THD_v with both branches in: 0.7945 % by hand, and the complex.js oracle", () => {
    expectClose(both.thdVPct, 0.7945, TOL.pct, "THD_v, both in (hand)");
    expectClose(both.thdVPct, ((20 * oracleZ5(true)) / (480 / Math.sqrt(3))) * 100, TOL.oracle, "THD_v, both in (oracle)");
    expect(both.worstIndividual?.order).toBe(5);
    expect(both.ieee519.pass).toBe(true);
    expectClose(alone.thdVPct, 0.945, TOL.pct, "THD_v, plain alone (hand)");
    expectClose(alone.thdVPct, ((20 * oracleZ5(false)) / (480 / Math.sqrt(3))) * 100, TOL.oracle, "THD_v, plain alone (oracle)");
    expect(r.worstThdV?.newStage).toBe(0);
  });

  it("each bank's capacitor duty in the combined stage, worked by hand", () => {
    const plain = both.duty.find((d) => d.bank === "Wall bank")!;
    const detuned = both.duty.find((d) => d.bank === "new")!;
    expectClose(plain.rmsCurrentPct, 100.079, TOL.pct, "plain rms current");
    expectClose(detuned.rmsCurrentPct, 107.657, TOL.pct, "detuned rms current");
    expectClose(detuned.rmsVoltagePct, 107.532, TOL.pct, "detuned rms voltage");
    expectClose(detuned.peakVoltagePct, 108.586, TOL.pct, "detuned peak voltage");
    expectClose(detuned.reactivePowerPct, 115.676, TOL.pct, "detuned kvar");
    // 107.5 % rms voltage is within the IEEE 18 limit of 110 %: passes, but above rating
    expect(detuned.pass).toBe(true);
  });

  it("without a new bank: the installed combinations alone", () => {
    const only = studyCombinedStages(context(), [wallStep, { ...wallStep, label: "Wall bank step 2" }], null);
    // identical steps counted, not permuted: one in, both in
    expect(only.stagesStudied).toBe(2);
  });
});

describe("inside the sizing: one warning per concern", () => {
  it("a plain installed bank beside a drive-heavy site is studied with the new bank, findings grouped", () => {
    const input: SizingInput = {
      system: { voltageV: 480, frequencyHz: 60, phases: 3 },
      targetPF: 0.95,
      loads: [
        { label: "Kiln fan drive", kind: "drive", measurement: { method: "kw_pf", kW: 250, pf: 0.95, sense: "lagging" } },
        { label: "Mixer motors", kind: "motor", measurement: { method: "kw_pf", kW: 400, pf: 0.72, sense: "lagging" } },
      ],
      transformer: { kVA: 1500, impedancePct: 5.75 },
      installedBanks: [
        { label: "Old wall bank", location: "service", control: "automatic", ratedVoltageV: 480, steps: [{ kvar: 50 }, { kvar: 50 }, { kvar: 100 }] },
      ],
      bankReadings: [{ bank: "Old wall bank", inServiceSteps: [] }],
    };
    const out = size(input);
    expect(out.ok).toBe(true);
    if (!out.ok) return;
    const screens = out.result.combinedStages ?? [];
    expect(screens.length).toBeGreaterThan(0);
    for (const sc of screens) {
      expect(sc.harmonics).toBeDefined();
      // every combination the screen counted with an installed step in is studied
      expect(sc.harmonics!.stagesStudied).toBeGreaterThan(2);
      expect(sc.harmonics!.stagesStudied).toBeLessThanOrEqual(sc.stagesScreened);
      expect(sc.harmonics!.worstThdV).not.toBeNull();
    }
    for (const code of ["combined_stage_thd_v_exceeds_limit", "combined_stage_harmonic_exceeds_limit"]) {
      expect(out.result.warnings.filter((w) => w.code === code).length).toBeLessThanOrEqual(screens.length);
    }
    const duty = out.result.warnings.filter((w) => w.code === "combined_stage_capacitor_duty");
    const keys = duty.map((w) => w.message.split(":")[0]);
    // one per bank and new-bank option
    expect(new Set(keys).size).toBe(keys.length);
    expect(duty.length).toBeGreaterThan(0);
  });
});
