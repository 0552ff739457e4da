import { describe, expect, it } from "vitest";
import { analyseBank } from "../../../src/core/bank/stages.js";
import {
  bankReactanceOhm,
  capacitancePerPhase,
  capacitanceSinglePhaseUF,
  capacitiveReactanceOhm,
  capacitorCurrentA,
  capacitorVoltageWithReactorV,
  effectiveKvarWithReactor,
  inductiveReactanceOhm,
  kvarAtFrequency,
  kvarAtVoltage,
  seriesRlcImpedanceOhm,
  tuningOrder,
} from "../../../src/core/bank/capacitor.js";
import { expectClose, TOL } from "../../helpers/tolerance.js";

describe("series RLC impedance |Z| = √(R² + (X_L − X_C)²)", () => {
  // Worked value: R = 10 Ω, L = 50 mH, C = 100 µF.
  // hand calculation at 60 Hz: X_L = 2π·60·0.05 = 18.8496 Ω; X_C = 1/(2π·60·100e-6) = 26.5258 Ω;
  //   X_L − X_C = −7.6763 Ω; |Z| = √(100 + 58.924) = √158.924 = 12.6065 Ω
  // hand calculation at 50 Hz: X_L = 15.7080 Ω; X_C = 31.8310 Ω; |Z| = √(100 + 259.95) = 18.9724 Ω
  const ROWS = [
    { f: 60, xL: 18.8496, xC: 26.5258, z: 12.6065, source: "hand calculation (60 Hz, see comment)" },
    { f: 50, xL: 15.708, xC: 31.831, z: 18.9724, source: "hand calculation (50 Hz, see comment)" },
  ];
  const TOL_4DP = TOL.quoted4dp; // values above are quoted to 4 decimals

  it.each(ROWS)("at $f Hz: |Z| = $z Ω ($source)", ({ f, xL, xC, z }) => {
    const XL = inductiveReactanceOhm(0.05, f);
    const XC = capacitiveReactanceOhm(100e-6, f);
    expectClose(XL, xL, TOL_4DP, `X_L at ${f} Hz`);
    expectClose(XC, xC, TOL_4DP, `X_C at ${f} Hz`);
    expectClose(seriesRlcImpedanceOhm(10, XL, XC), z, TOL_4DP, `|Z| at ${f} Hz`);
  });

  it("at series resonance f₀ = 1/(2π√(LC)) = 71.176 Hz (hand: 1/(2π·√5e-6)) |Z| = R", () => {
    const f0 = 1 / (2 * Math.PI * Math.sqrt(0.05 * 100e-6));
    expectClose(f0, 71.1763, TOL_4DP, "f₀");
    expectClose(seriesRlcImpedanceOhm(10, inductiveReactanceOhm(0.05, f0), capacitiveReactanceOhm(100e-6, f0)), 10, TOL.ohm, "|Z| at resonance");
  });

  it("a 3-4-5 triangle: R = 3, X_L = 9, X_C = 5 → |Z| = 5 Ω (hand)", () => {
    expectClose(seriesRlcImpedanceOhm(3, 9, 5), 5, TOL.ohm, "|Z|");
  });
});

describe("capacitance per phase", () => {
  it("100 kvar, 480 V, 60 Hz three-phase: delta and wye µF (hand calculation)", () => {
    // per unit Q = 100 000/3 = 33 333.3 var; ω = 2π·60 = 376.991 rad/s
    // delta: each unit sees 480 V → C = 33 333.3/(376.991·480²) = 33 333.3/86 858 803 = 383.765 µF
    // wye: each unit sees 480/√3 = 277.13 V → C = 33 333.3/(376.991·76 800) = 1151.294 µF (3 × delta)
    const c = capacitancePerPhase(100, 480, 60);
    expectClose(c.deltaUF, 383.7648, TOL.capacitanceQuotedUF, "delta µF");
    expectClose(c.wyeUF, 1151.2944, TOL.capacitanceQuotedUF, "wye µF");
    expectClose(c.wyeUF / c.deltaUF, 3, TOL.capacitanceUF, "wye/delta ratio (hand: (√3)² = 3)");
  });

  it("50 kvar, 400 V, 50 Hz: delta 331.573 µF, wye 994.718 µF (hand: 16 666.7/(314.159·160 000))", () => {
    const c = capacitancePerPhase(50, 400, 50);
    expectClose(c.deltaUF, 331.5728, TOL.capacitanceQuotedUF, "delta µF");
    expectClose(c.wyeUF, 994.7184, TOL.capacitanceQuotedUF, "wye µF");
  });

  it("single-phase 10 kvar at 240 V, 60 Hz: C = 10 000/(376.991·57 600) = 460.518 µF (hand)", () => {
    expectClose(capacitanceSinglePhaseUF(10, 240, 60), 460.5178, TOL.capacitanceQuotedUF, "1φ µF");
  });
});

describe("kvar at another voltage and frequency (Q ∝ V²·f, from X_C = 1/(2πfC))", () => {
  const ROWS = [
    { what: "100 kvar 480 V unit at 460 V", got: () => kvarAtVoltage(100, 460, 480), kvar: 91.8403, source: "hand: 100·(460/480)² = 91.840" },
    { what: "100 kvar 480 V unit at 528 V", got: () => kvarAtVoltage(100, 528, 480), kvar: 121, source: "hand: 100·1.1² = 121" },
    { what: "100 kvar 60 Hz unit at 50 Hz", got: () => kvarAtFrequency(100, 50, 60), kvar: 83.3333, source: "hand: 100·50/60 = 83.333" },
    { what: "50 kvar 50 Hz unit at 60 Hz", got: () => kvarAtFrequency(50, 60, 50), kvar: 60, source: "hand: 50·60/50 = 60" },
  ];
  it.each(ROWS)("$what → $kvar kvar ($source)", ({ got, kvar, what }) => {
    expectClose(got(), kvar, TOL.powerQuoted, what);
  });

  it("analyseBank combines both: a 100 kvar 480 V 60 Hz bank on 400 V 50 Hz", () => {
    const { analysis, warnings } = analyseBank(
      { ratedVoltageV: 480, ratedFrequencyHz: 60, steps: [{ kvar: 100 }] },
      { voltageV: 400, frequencyHz: 50, phases: 3 },
      { shortCircuitKVA: null, harmonicOrders: [] },
      "proposedBank",
    );
    // hand calculation: 100·(400/480)²·(50/60) = 100·0.694444·0.833333 = 57.870 kvar
    expectClose(analysis.capacitorKvar, 57.8704, TOL.powerQuoted, "capacitor kvar");
    expectClose(analysis.effectiveKvar, 57.8704, TOL.powerQuoted, "no reactor: effective = capacitor kvar");
    expect(warnings.map((w) => w.code)).toEqual(["capacitor_frequency_mismatch"]);
  });
});

describe("series reactor (detuned branch), p = X_L/X_C", () => {
  it("capacitor voltage U/(1 − p): 400/(1 − 0.07) = 430.1 V (hand)", () => {
    expectClose(capacitorVoltageWithReactorV(400, 0.07), 430.1, TOL.voltageRoundedV, "U_C");
  });

  it("effective kvar Q_C/(1 − p): 100/0.93 = 107.53 kvar (hand)", () => {
    expectClose(effectiveKvarWithReactor(100, 0.07), 100 / 0.93, TOL.power, "Q_eff");
  });

  it("tuning order 1/√p: 7 % → 3.78, 14 % → 2.67, 5.67 % → 4.20 (hand: 1/√0.07 = 3.7796; 1/√0.14 = 2.6726; 1/√0.0567 = 4.1996)", () => {
    expectClose(tuningOrder(0.07), 3.78, TOL.order, "7 %");
    expectClose(tuningOrder(0.14), 2.67, TOL.order, "14 %");
    expectClose(tuningOrder(0.0567), 4.2, TOL.order, "5.67 %");
  });

  it("an 80 kvar 525 V capacitor with 7 % reactor on 400 V delivers ≈ 49.9 kvar", () => {
    // hand calculation: 80·(400/525)² = 46.440 kvar at the bus voltage; /(1 − 0.07) = 49.935 kvar
    const { analysis, warnings } = analyseBank(
      { ratedVoltageV: 525, steps: [{ kvar: 80 }], reactorPct: 7 },
      { voltageV: 400, frequencyHz: 50, phases: 3 },
      { shortCircuitKVA: null, harmonicOrders: [] },
      "proposedBank",
    );
    expectClose(analysis.capacitorKvar, 46.44, TOL.powerRounded, "capacitor kvar at 400 V");
    expectClose(analysis.effectiveKvar, 49.9, TOL.powerRounded, "effective kvar");
    expectClose(analysis.capacitorVoltageV, 430.1, TOL.voltageRoundedV, "capacitor voltage");
    // 430.1/525 = 81.9 % of rating: no voltage warning
    expectClose(analysis.capacitorVoltagePctOfRated, 81.93, TOL.pct, "percent of rated");
    expect(warnings).toEqual([]);
    expectClose(analysis.tuningOrder, 3.78, TOL.order, "tuning order");
    // 3.7796 × 50 Hz = 188.98 Hz
    expectClose(analysis.tuningHz, 189, TOL.frequencyHz, "tuning Hz");
  });
});

describe("IEEE Std 18 voltage limit (110 % of rated, continuous)", () => {
  const run = (busV: number, ratedV: number, reactorPct: number) =>
    analyseBank(
      { ratedVoltageV: ratedV, steps: [{ kvar: 50 }], reactorPct },
      { voltageV: busV, frequencyHz: 60, phases: 3 },
      { shortCircuitKVA: null, harmonicOrders: [] },
      "proposedBank",
    );
  const ROWS = [
    { busV: 480, ratedV: 480, reactorPct: 0, code: null, why: "hand: 480/480 = 100 %, at rating" },
    { busV: 400, ratedV: 525, reactorPct: 7, code: null, why: "hand: 430.1/525 = 81.9 %" },
    { busV: 480, ratedV: 480, reactorPct: 7, code: "capacitor_above_rated_voltage", why: "hand: 516.1/480 = 107.5 %" },
    { busV: 480, ratedV: 480, reactorPct: 14, code: "capacitor_overvoltage", why: "hand: 480/0.86 = 558.1 V = 116.3 %" },
    { busV: 500, ratedV: 480, reactorPct: 0, code: "capacitor_above_rated_voltage", why: "hand: 500/480 = 104.2 %" },
    { busV: 530, ratedV: 480, reactorPct: 0, code: "capacitor_overvoltage", why: "hand: 530/480 = 110.4 % > 110 %" },
    { busV: 525, ratedV: 480, reactorPct: 0, code: "capacitor_above_rated_voltage", why: "hand: 525/480 = 109.4 % ≤ 110 %" },
  ];
  it.each(ROWS)("$busV V bus, $ratedV V rated, $reactorPct % reactor → $code ($why)", ({ busV, ratedV, reactorPct, code }) => {
    const { warnings } = run(busV, ratedV, reactorPct);
    const codes = warnings.map((w) => w.code).filter((c) => c.startsWith("capacitor_"));
    expect(codes).toEqual(code === null ? [] : [code]);
    if (code) expect(warnings[0]?.path).toBe("proposedBank.ratedVoltageV");
  });
});

describe("bank current and reactance", () => {
  it("I = Q/(√3·V): 100 kvar at 480 V = 120.28 A; single-phase 10 kvar at 240 V = 41.67 A (hand)", () => {
    expectClose(capacitorCurrentA(100, 480, 3), 100_000 / (Math.sqrt(3) * 480), TOL.currentA, "3φ current");
    expectClose(capacitorCurrentA(10, 240, 1), 10_000 / 240, TOL.currentA, "1φ current");
  });

  it("wye-equivalent reactance V²/Q: 480²/100 000 = 2.304 Ω (hand)", () => {
    expectClose(bankReactanceOhm(100, 480), 2.304, TOL.ohm, "X_C per phase");
  });
});
