import { describe, expect, it } from "vitest";
import { buildBusModel, capacitorBranch, scanImpedance, validateScanOptions } from "../../../src/core/harmonics/harmonics-api.js";

const lowDamping = (voltageV: number, frequencyHz: number, shortCircuitKVA: number) =>
  ({ voltageV, frequencyHz, shortCircuitKVA, xOverR: 200 }) as const;

describe("parallel resonance of a plain bank", () => {
  it.each([
    // closed form h = √(S_sc/Q_c) (IEEE 519 practice); hand calculation of each root:
    [480, 60, 26_087, 300, 9.325], // √86.96
    [480, 60, 20_000, 500, 6.325], // √40
    [4160, 60, 100_000, 1200, 9.129], // √83.33
    [400, 50, 16_000, 100, 12.649], // √160
  ])("%d V %d Hz, S_sc %d kVA, %d kvar → h ≈ %d", (v, f, sc, q, h) => {
    const model = buildBusModel(lowDamping(v, f, sc), [capacitorBranch(v, q, 0)]);
    const scan = scanImpedance(model);
    expect(scan.peaks).toHaveLength(1);
    expect(Math.abs(scan.peaks[0]!.order - h) / h).toBeLessThan(0.02);
    expect(scan.dips).toHaveLength(0);
  });
});

describe("detuned stage", () => {
  it.each([
    // tuning 1/√p (industry practice: 7 % → 3.78, 5.67 % → 4.20, 14 % → 2.67);
    // parallel resonance √(1/(Q_c/S_sc + p)) from X_s·h + p·X_C·h = X_C/h, Q_c/S_sc = 200/20 000 = 0.01:
    [7, 3.78, 3.5355], // 1/√0.08
    [5.67, 4.2, 3.872], // 1/√0.0667
    [14, 2.67, 2.582], // 1/√0.15
  ])("p = %d %%: dip at %d, resonance at %d below it", (pct, tuned, resonance) => {
    const model = buildBusModel(lowDamping(480, 60, 20_000), [capacitorBranch(480, 200, pct)]);
    const scan = scanImpedance(model, { fromOrder: 1, toOrder: 50, stepOrder: 0.01 });
    expect(scan.peaks).toHaveLength(1);
    expect(scan.dips).toHaveLength(1);
    const peak = scan.peaks[0]!;
    const dip = scan.dips[0]!;
    expect(peak.order).toBeLessThan(dip.order);
    expect(Math.abs(dip.order - tuned) / tuned).toBeLessThan(0.005); // trade rounds to 2 decimals
    expect(Math.abs(peak.order - resonance) / resonance).toBeLessThan(0.01);
  });

  it("reports the peak as a multiple of |Z_s(h)| and of Z_base", () => {
    // hand calculation (lossless estimate): at the peak |Z| ≫ |Z_s|, so both ratios must exceed 1; and
    // |Z|/Z_base = (|Z|/|Z_s|)·h·sin(atan 200) ≈ (|Z|/|Z_s|)·h.
    const model = buildBusModel(lowDamping(480, 60, 20_000), [capacitorBranch(480, 200, 7)]);
    const peak = scanImpedance(model).peaks[0]!;
    expect(peak.timesSourceImpedance).toBeGreaterThan(1);
    expect(Math.abs(peak.timesBaseImpedance / (peak.timesSourceImpedance * peak.order) - 1)).toBeLessThan(1e-4);
  });
});

describe("scan grid", () => {
  it("defaults to 1..50 step 0.01", () => {
    // hand calculation: (50 − 1)/0.01 + 1 = 4901 points
    const scan = scanImpedance(buildBusModel(lowDamping(480, 60, 20_000)));
    expect(scan.ordersH.length).toBe(4901);
    expect(scan.ordersH[0]).toBe(1);
    expect(scan.ordersH[4900]).toBeCloseTo(50, 9);
    expect(scan.peaks).toHaveLength(0); // source alone: |Z| rises with h
  });

  it("rejects bad options with paths", () => {
    expect(validateScanOptions({ stepOrder: 0 }).map((i) => i.path)).toEqual(["scan.stepOrder"]);
    expect(validateScanOptions({ fromOrder: 10, toOrder: 5 }).map((i) => i.path)).toEqual(["scan.toOrder"]);
    // hand calculation: (50 − 1)/0.0001 + 1 = 490 001 points > 100 000
    expect(validateScanOptions({ stepOrder: 0.0001 })[0]?.message).toMatch(/100000 points/);
    expect(() => scanImpedance(buildBusModel(lowDamping(480, 60, 20_000)), { stepOrder: -1 })).toThrow(RangeError);
  });
});
