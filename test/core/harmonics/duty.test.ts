import { describe, expect, it } from "vitest";
import { capacitorDuty } from "../../../src/core/harmonics/harmonics-api.js";

const plain480 = { voltageV: 480, frequencyHz: 60, rating: { ratedVoltageV: 480, ratedKvar: 300, ratedFrequencyHz: 60 }, reactorPct: 0 };

describe("IEEE 18 capacitor duty", () => {
  it("plain bank at rated voltage, 10 % 5th and 5 % 7th on the bus: all within limits, all above rating", () => {
    // hand calculation (p = 0, so V_c,h = V_bus,h; I_c,h/I_r = h·V_c,h/V_r):
    //   rms V = √(1 + 0.10² + 0.05²) = √1.0125 = 1.006231 → 100.62 % (limit 110, IEEE Std 18)
    //   peak  = 1 + 0.10 + 0.05 = 1.15 → 115 % (limit 120)
    //   rms I = √(1 + 0.5² + 0.35²) = √1.3725 = 1.171538 → 117.15 % (limit 135)
    //   kvar  = 1 + 5·0.01 + 7·0.0025 = 1.0675 → 106.75 % (limit 135)
    const d = capacitorDuty({
      ...plain480,
      busHarmonics: [
        { order: 5, pct: 10 },
        { order: 7, pct: 5 },
      ],
    });
    expect(d.rmsVoltage.valuePct).toBeCloseTo(100.6231, 3);
    expect(d.peakVoltage.valuePct).toBeCloseTo(115, 6);
    expect(d.rmsCurrent.valuePct).toBeCloseTo(117.1538, 3);
    expect(d.reactivePower.valuePct).toBeCloseTo(106.75, 6);
    expect(d.pass).toBe(true);
    expect(d.aboveRating).toBe(true);
    expect(d.peakVoltage.marginPct).toBeCloseTo(5, 6);
  });

  it("fails peak voltage and current with 15 % 5th and 8 % 7th", () => {
    // hand calculation: peak 1 + 0.15 + 0.08 = 1.23 → 123 % > 120 (fail);
    //   rms I = √(1 + 0.75² + 0.56²) = √1.8761 = 1.369708 → 136.97 % > 135 (fail);
    //   rms V = √1.0289 = 1.014347 → 101.43 % (pass); kvar 1 + 0.1125 + 0.0448 = 1.1573 → 115.73 % (pass)
    const d = capacitorDuty({
      ...plain480,
      busHarmonics: [
        { order: 5, pct: 15 },
        { order: 7, pct: 8 },
      ],
    });
    expect(d.peakVoltage.valuePct).toBeCloseTo(123, 6);
    expect(d.peakVoltage.pass).toBe(false);
    expect(d.rmsCurrent.valuePct).toBeCloseTo(136.9708, 3);
    expect(d.rmsCurrent.pass).toBe(false);
    expect(d.rmsVoltage.valuePct).toBeCloseTo(101.4347, 3);
    expect(d.reactivePower.valuePct).toBeCloseTo(115.73, 6);
    expect(d.pass).toBe(false);
  });

  it("7 % detuned 125 kvar 550 V unit on a 480 V bus with 2 % 5th", () => {
    // hand calculation:
    //   V_c,1/V_r = 480/(0.93·550) = 0.938416 (fundamental rise V/(1 − p))
    //   |Z_cap(5)|/X_C = |0.07/50 + j(5·0.07 − 1/5)| = |0.0014 + j0.15| = 0.1500065
    //   V_c,5 = 0.02·277.128/(5·0.1500065) = 7.38976 V; /317.543 V rated phase = 0.023272
    //   rms V = √(0.938416² + 0.023272²) = 0.938705 → 93.870 %; peak 0.961688 → 96.169 %
    //   rms I = √(0.938416² + (5·0.023272)²) = 0.945603 → 94.560 %; kvar 0.880625 + 5·0.000542 → 88.333 %
    const d = capacitorDuty({
      voltageV: 480,
      frequencyHz: 60,
      rating: { ratedVoltageV: 550, ratedKvar: 125, ratedFrequencyHz: 60 },
      reactorPct: 7,
      reactorQualityFactor: 50,
      busHarmonics: [{ order: 5, pct: 2 }],
    });
    expect(d.rmsVoltage.valuePct).toBeCloseTo(93.87, 2);
    expect(d.peakVoltage.valuePct).toBeCloseTo(96.169, 2);
    expect(d.rmsCurrent.valuePct).toBeCloseTo(94.56, 2);
    expect(d.reactivePower.valuePct).toBeCloseTo(88.333, 2);
    expect(d.aboveRating).toBe(false);
    // hand calculation: rated current 125 000/(√3·550) = 131.216 A
    expect(d.ratedCurrentA).toBeCloseTo(131.216, 2);
  });
});
