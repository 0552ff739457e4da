import { describe, expect, it } from "vitest";
import {
  capacitorBranch,
  capacitorKvarAtSystem,
  defaultXOverR,
  effectiveKvar,
  loadDampingResistanceOhm,
  sourceImpedance,
  transformerShortCircuitKVA,
} from "../../../src/core/harmonics/harmonics-api.js";

const rel = (a: number, b: number): number => Math.abs(a - b) / Math.abs(b);

describe("source impedance", () => {
  it("splits Z_base by X/R (480 V, 1500 kVA 5.75 % transformer, X/R 8)", () => {
    // hand calculation: S_sc = 1500/0.0575 = 26 086.96 kVA; Z_base = 480²/(26 086.96·1000) = 0.008832 Ω;
    // X_s = Z_base·8/√65 = 0.0087638 Ω; R_s = X_s/8 = 0.00109547 Ω.
    const sc = transformerShortCircuitKVA(1500, 5.75);
    expect(rel(sc, 26_086.96)).toBeLessThan(1e-6);
    const s = sourceImpedance({ voltageV: 480, frequencyHz: 60, shortCircuitKVA: sc, xOverR: 8 });
    expect(rel(s.baseImpedanceOhm, 0.008832)).toBeLessThan(1e-9);
    expect(rel(s.reactanceOhm, 0.0087638)).toBeLessThan(1e-4);
    expect(rel(s.resistanceOhm, 0.00109547)).toBeLessThan(1e-4);
    expect(s.xOverRBasis).toBe("given");
  });

  it.each([
    // rule of thumb from typical transformer data, no standard (the engine's own table, band edges)
    [150, 3],
    [151, 5],
    [500, 5],
    [1000, 6],
    [2500, 8],
    [2501, 10],
  ])("estimates X/R %d kVA → %d when not given", (kVA, xr) => {
    expect(defaultXOverR(kVA)).toEqual({ xOverR: xr, basis: "transformer_rule_of_thumb" });
    const s = sourceImpedance({ voltageV: 480, frequencyHz: 60, shortCircuitKVA: 20_000, transformerKVA: kVA });
    expect(s.xOverR).toBe(xr);
  });

  it("falls back to a conservative X/R of 10 with nothing known", () => {
    // common practice, no source: high X/R = little damping = larger peaks
    expect(defaultXOverR(undefined)).toEqual({ xOverR: 10, basis: "unknown_default" });
  });
});

describe("load and capacitor branches", () => {
  it("models linear load as R = V²/P", () => {
    // hand calculation: 480²/(200·1000) = 1.152 Ω
    expect(loadDampingResistanceOhm(480, 200)).toBeCloseTo(1.152, 12);
    expect(loadDampingResistanceOhm(480, 0)).toBeNull();
    expect(loadDampingResistanceOhm(480, undefined)).toBeNull();
  });

  it("scales capacitor kvar with V² and f", () => {
    // hand calculation: 100·(480/525)² = 83.5918; at 50 Hz of a 60 Hz unit: ×50/60 → 69.6599
    expect(capacitorKvarAtSystem(100, 525, 60, 480, 60)).toBeCloseTo(83.5918, 3);
    expect(capacitorKvarAtSystem(100, 525, 60, 480, 50)).toBeCloseTo(69.6599, 3);
  });

  it("gives X_C, X_L and R_r of a 7 % stage", () => {
    // hand calculation: X_C = 480²/300 000 = 0.768 Ω; X_L = 0.07·0.768 = 0.05376 Ω; R_r = 0.05376/50 = 0.0010752 Ω
    const b = capacitorBranch(480, 300, 7, 50);
    expect(b.capacitorReactanceOhm).toBeCloseTo(0.768, 12);
    expect(b.reactorReactanceOhm).toBeCloseTo(0.05376, 12);
    expect(b.reactorResistanceOhm).toBeCloseTo(0.0010752, 12);
    // hand calculation: effective kvar 300/(1 − 0.07) = 322.58
    expect(effectiveKvar(300, 7)).toBeCloseTo(322.58, 2);
  });
});
