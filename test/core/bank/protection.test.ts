import { describe, expect, it } from "vitest";
import { capacitorRatedCurrentA, circuitProtection, nextStandardRatingA, STANDARD_AMPERE_RATINGS_A } from "../../../src/core/bank/protection.js";
import { expectClose, TOL } from "../../helpers/tolerance.js";

describe("standard ampere ratings (NFPA 70 240.6(A))", () => {
  it("holds the table's 37 ratings from 15 A to 6000 A, ascending", () => {
    // NFPA 70 240.6(A): 15 … 6000 A, 37 values
    expect(STANDARD_AMPERE_RATINGS_A.length).toBe(37);
    expect(STANDARD_AMPERE_RATINGS_A[0]).toBe(15);
    expect(STANDARD_AMPERE_RATINGS_A.at(-1)).toBe(6000);
    expect([...STANDARD_AMPERE_RATINGS_A].sort((a, b) => a - b)).toEqual([...STANDARD_AMPERE_RATINGS_A]);
  });

  it.each([
    // source per row: NFPA 70 240.6(A) list (fuses add 1, 3, 6, 10, 601 A)
    { min: 59.54, device: "fuse", want: 60 },
    { min: 60, device: "fuse", want: 60 },
    { min: 60.01, device: "breaker", want: 70 },
    { min: 0.99, device: "fuse", want: 1 },
    { min: 0.99, device: "breaker", want: 15 },
    { min: 600.5, device: "fuse", want: 601 },
    { min: 600.5, device: "breaker", want: 700 },
    { min: 6000.1, device: "fuse", want: null },
  ] as const)("$min A, $device → $want A", ({ min, device, want }) => {
    expect(nextStandardRatingA(min, device)).toBe(want);
  });
});

describe("capacitor circuit protection (NFPA 70 460.8)", () => {
  it.each([
    // hand calculation: I = Q·1000/(√3·V); conductor and disconnect 1.35·I (460.8(A), (C)); device factor·I up to 240.6(A)
    {
      kvar: 25,
      v: 400,
      ph: 3,
      dev: "fuse",
      f: undefined,
      i: 36.08439182435161,
      ocpdMin: 59.539246510180156,
      rating: 60,
      src: "25000/(1.7321·400) = 36.084 A; ×1.65 = 59.54 → 60 A",
    },
    {
      kvar: 25,
      v: 400,
      ph: 3,
      dev: "breaker",
      f: undefined,
      i: 36.08439182435161,
      ocpdMin: 54.12658773652742,
      rating: 60,
      src: "×1.5 = 54.13 → 60 A",
    },
    {
      kvar: 100,
      v: 480,
      ph: 3,
      dev: "fuse",
      f: undefined,
      i: 120.28130608117205,
      ocpdMin: 198.46415503393388,
      rating: 200,
      src: "100000/(1.7321·480) = 120.28 A; ×1.65 = 198.46 → 200 A",
    },
    {
      kvar: 50,
      v: 480,
      ph: 3,
      dev: "fuse",
      f: 1.35,
      i: 60.140653040586024,
      ocpdMin: 81.18988160479114,
      rating: 90,
      src: "60.14 A ×1.35 = 81.19 → 90 A",
    },
    {
      kvar: 50,
      v: 480,
      ph: 3,
      dev: "breaker",
      f: undefined,
      i: 60.140653040586024,
      ocpdMin: 90.21097956087904,
      rating: 100,
      src: "60.14 A ×1.5 = 90.21 → 100 A",
    },
    {
      kvar: 5,
      v: 240,
      ph: 1,
      dev: "fuse",
      f: undefined,
      i: 20.833333333333332,
      ocpdMin: 34.37499999999999,
      rating: 35,
      src: "5000/240 = 20.83 A; ×1.65 = 34.38 → 35 A",
    },
    {
      kvar: 0.5,
      v: 480,
      ph: 3,
      dev: "fuse",
      f: undefined,
      i: 0.6014065304058602,
      ocpdMin: 0.9923207751696693,
      rating: 1,
      src: "0.601 A ×1.65 = 0.99 → 1 A (fuse-only rating)",
    },
  ] as const)("$kvar kvar $v V $ph φ $dev: $src", ({ kvar, v, ph, dev, f, i, ocpdMin, rating }) => {
    const current = capacitorRatedCurrentA(kvar, v, ph);
    expectClose(current, i, TOL.currentA, "rated current");
    const { protection: p, warnings } = circuitProtection("step", kvar, current, { device: dev, ...(f ? { ocpdFactor: f } : {}) });
    expect(warnings).toEqual([]);
    expectClose(p.conductorMinAmpacityA, 1.35 * i, TOL.currentA, "conductor ampacity");
    expectClose(p.disconnectMinA, 1.35 * i, TOL.currentA, "disconnect");
    expectClose(p.ocpdMinA, ocpdMin, TOL.currentA, "device minimum");
    expect(p.ocpdRatingA).toBe(rating);
  });

  it("a device factor below 135 % is raised to 135 % with a warning", () => {
    // hand calculation: 36.084 A × 1.35 = 48.71 A → 50 A
    const { protection: p, warnings } = circuitProtection("step", 25, 36.08439182435161, { ocpdFactor: 1.2 });
    expect(warnings.map((w) => w.code)).toEqual(["ocpd_factor_below_minimum"]);
    expect(p.ocpdFactor).toBe(1.35);
    expect(p.ocpdRatingA).toBe(50);
  });

  it("above 6000 A there is no standard rating: null and a warning", () => {
    // hand calculation: 5000 kvar at 480 V = 6014 A, ×1.65 = 9923 A > 6000 A
    const { protection: p, warnings } = circuitProtection("bank", 5000, capacitorRatedCurrentA(5000, 480, 3));
    expect(p.ocpdRatingA).toBeNull();
    expect(warnings.map((w) => w.code)).toEqual(["ocpd_above_standard_ratings"]);
  });
});
