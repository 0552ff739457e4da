import { describe, expect, it } from "vitest";
import {
  buildBusModel,
  busDistortion,
  capacitorBranch,
  drivingPointImpedanceOhm,
  injectedCurrents,
} from "../../../src/core/harmonics/harmonics-api.js";

/**
 * 480 V 60 Hz bus fed by a 1500 kVA, 5.75 % transformer (infinite upstream), X/R 8;
 * one 300 kVA six-pulse drive; one 300 kvar, 480 V plain bank; no linear load.
 *
 * hand calculation:
 *   S_sc = 1500/0.0575 = 26 087 kVA; Z_base = 480²/26 087 000 = 0.008832 Ω; X_s = 0.008832·8/√65 = 0.0087638 Ω
 *   I_1 = 300 000/(√3·480) = 360.84 A; I_5 = I_1/5 = 72.169 A (ideal six-pulse)
 *   X_C = 480²/300 000 = 0.768 Ω; at h = 5: X_s·5 = 0.043819 Ω, X_C/5 = 0.1536 Ω
 *   |Z(5)| ≈ 0.043819·0.1536/(0.1536 − 0.043819) = 0.0067306/0.109781 = 0.061310 Ω (resistance ignored: < 0.1 %)
 *   V_5 = 72.169·0.061310 = 4.4247 V phase; V_phase = 480/√3 = 277.128 V → 1.5966 %
 *   without the bank: |Z_s(5)| ≈ 0.043819 Ω (R_s adds 0.03 %) → V_5 = 3.1624 V → 1.1411 %
 */
describe("worked example: 480 V, 1500 kVA transformer, 300 kVA drive, 300 kvar", () => {
  const network = { voltageV: 480, frequencyHz: 60, shortCircuitKVA: 1500 / 0.0575, xOverR: 8 };
  const currents = injectedCurrents([{ label: "vfd", kVA: 300, phases: 3, isDrive: true }], 480);
  const withBank = buildBusModel(network, [capacitorBranch(480, 300, 0)]);

  it("I_5, |Z(5)| and V_5 with the bank", () => {
    expect(currents.byOrderA[5]).toBeCloseTo(72.169, 3);
    const z5 = drivingPointImpedanceOhm(withBank, 5);
    expect(Math.abs(z5 - 0.06131) / 0.06131).toBeLessThan(0.002);
    const line = busDistortion(withBank, currents).lines.find((l) => l.order === 5)!;
    expect(Math.abs(line.injectedPhaseV - 4.4247) / 4.4247).toBeLessThan(0.002);
    expect(Math.abs(line.voltagePct - 1.5966) / 1.5966).toBeLessThan(0.002);
  });

  it("V_5 without the bank", () => {
    const line = busDistortion(buildBusModel(network), currents).lines.find((l) => l.order === 5)!;
    expect(Math.abs(line.voltagePct - 1.1411) / 1.1411).toBeLessThan(0.002);
  });

  it("adds background distortion arithmetically and THD over all orders", () => {
    // hand calculation, single 20 % 5th source (I_5 = 72.169 A) on the bus without the bank:
    //   injected 1.1411 % + background 1.0 % = 2.1411 %; 7th background only 2.0 %;
    //   THD = √(2.1411² + 2.0²) = √8.5843 = 2.9299 %; worst order 5 at 2.1411 %
    const single = injectedCurrents([{ label: "x", kVA: 300, phases: 3, isDrive: false, spectrum: [{ order: 5, pct: 20 }] }], 480);
    const d = busDistortion(buildBusModel(network), single, [
      { order: 5, pct: 1 },
      { order: 7, pct: 2 },
    ]);
    expect(d.lines.map((l) => l.order)).toEqual([5, 7]);
    expect(d.lines[0]!.voltagePct).toBeCloseTo(2.1411, 3);
    expect(d.lines[1]!.voltagePct).toBeCloseTo(2.0, 12);
    expect(d.thdVPct).toBeCloseTo(2.9299, 3);
    expect(d.worstIndividual?.order).toBe(5);
    expect(d.worstIndividual?.pct).toBeCloseTo(2.1411, 3);
  });
});
