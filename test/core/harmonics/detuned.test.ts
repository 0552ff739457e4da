import { describe, expect, it } from "vitest";
import { chooseDetuning, nearestStandardKvar, proposeDetunedDesign, standardCapacitorVoltageV } from "../../../src/core/harmonics/harmonics-api.js";

describe("detuning choice", () => {
  it.each([
    // industry practice: 14 % for a significant 3rd, 7 % default; the engine's own rule: 5.67 % when nothing below the 7th
    [[5, 7, 11, 13], false, 7],
    [[3, 5, 7], true, 14],
    [[11, 13, 23, 25], false, 5.67],
    [[3, 5, 7], false, 7],
  ])("orders %j, 3rd significant %s → %d %%", (orders, third, pct) => {
    expect(chooseDetuning(orders, third).choice.reactorPct).toBe(pct);
  });
});

describe("standard sizes", () => {
  it.each([
    // catalogue list, no standard: smallest at or above the need
    [451.6, 480],
    [541.9, 550],
    [600, 600],
    [601, 690],
    [4500, 4800],
    [40_000, 40_000],
  ])("voltage need %d V → %d V", (need, v) => {
    expect(standardCapacitorVoltageV(need)).toBe(v);
  });

  it.each([
    // catalogue list, no standard: nearest, ties up
    [122.1, 125],
    [112.5, 125],
    [74.07, 75],
    [3.7, 2.5],
    [620, 600],
  ])("kvar %d → %d", (q, s) => {
    expect(nearestStandardKvar(q)).toBe(s);
  });
});

describe("detuned design", () => {
  it("480 V 60 Hz, 100 kvar effective per step, six-pulse orders", () => {
    // hand calculation: 480/(1 − 0.07)·1.05 = 541.9 V → 550 V;
    //   nameplate = 100·0.93·(550/480)² = 122.10 kvar → 125; effective = 125/(0.93·1.31293) = 102.37 kvar
    const d = proposeDetunedDesign({
      voltageV: 480,
      frequencyHz: 60,
      requiredEffectiveKvarPerStep: [100, 100],
      presentOrders: [5, 7, 11, 13],
      thirdHarmonicSignificant: false,
    });
    expect(d.reactorPct).toBe(7);
    expect(d.tuningOrder).toBe(3.78);
    expect(d.ratedVoltageV).toBe(550);
    expect(d.capacitorFundamentalVoltageV).toBeCloseTo(516.13, 2);
    expect(d.steps).toHaveLength(2);
    expect(d.steps[0]!.nameplateKvar).toBe(125);
    expect(d.steps[0]!.effectiveKvar).toBeCloseTo(102.37, 2);
    const exact = proposeDetunedDesign({
      voltageV: 480,
      frequencyHz: 60,
      requiredEffectiveKvarPerStep: [100],
      presentOrders: [5, 7],
      thirdHarmonicSignificant: false,
      kvarRounding: "none",
    });
    expect(exact.steps[0]!.nameplateKvar).toBeCloseTo(122.103, 3);
    expect(exact.steps[0]!.effectiveKvar).toBeCloseTo(100, 9);
  });

  it("400 V 50 Hz with a significant 3rd → 14 %", () => {
    // hand calculation: 400/0.86·1.05 = 488.4 V → 525 V; nameplate 50·0.86·(525/400)² = 74.07 → 75;
    //   effective 75/(0.86·1.72266) = 50.62 kvar
    const d = proposeDetunedDesign({
      voltageV: 400,
      frequencyHz: 50,
      requiredEffectiveKvarPerStep: [50],
      presentOrders: [3, 5, 7],
      thirdHarmonicSignificant: true,
    });
    expect(d.reactorPct).toBe(14);
    expect(d.ratedVoltageV).toBe(525);
    expect(d.steps[0]!.nameplateKvar).toBe(75);
    expect(d.steps[0]!.effectiveKvar).toBeCloseTo(50.62, 2);
    expect(d.ratedFrequencyHz).toBe(50);
  });

  it("twelve-pulse orders → 5.67 % and a 550 V rating at 480 V", () => {
    // hand calculation: 480/(1 − 0.0567)·1.05 = 534.3 V → 550 V
    const d = proposeDetunedDesign({
      voltageV: 480,
      frequencyHz: 60,
      requiredEffectiveKvarPerStep: [50],
      presentOrders: [11, 13],
      thirdHarmonicSignificant: false,
    });
    expect(d.reactorPct).toBe(5.67);
    expect(d.tuningOrder).toBe(4.2);
    expect(d.ratedVoltageV).toBe(550);
  });
});
