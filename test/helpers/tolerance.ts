import { expect } from "vitest";

/**
 * Every float comparison of the test suite takes its tolerance from here, one entry per quantity.
 * A value passes when |actual − expected| ≤ max(abs, rel·|expected|).
 */
export interface Tolerance {
  /** Absolute tolerance, in the quantity's unit. */
  abs?: number;
  /** Relative tolerance, a fraction of |expected|. */
  rel?: number;
}

export const TOL = {
  /** kvar-per-kW multipliers: handbook tables print three decimals. */
  kvarPerKW: { abs: 0.001 },
  /** kW, kvar, kVA against exact arithmetic (expected written as the formula). */
  power: { rel: 1e-6, abs: 1e-9 },
  /** kW, kvar, kVA quoted to one decimal in a worked example (e.g. 107.5 kvar). */
  powerRounded: { abs: 0.05 },
  /** kW, kvar, kVA quoted to three or four decimals in a hand calculation (e.g. 36.854 kvar). */
  powerQuoted: { abs: 1e-3 },
  /** kW, kvar, kVA quoted to two decimals in a hand calculation (e.g. 263.68 kVA). */
  powerQuoted2: { abs: 0.005 },
  /** Short-circuit strength kVA against exact arithmetic. */
  shortCircuitKVA: { rel: 1e-6 },
  /** Short-circuit strength quoted to the nearest kVA. */
  shortCircuitKVARounded: { abs: 0.5 },
  /** Short-circuit strength quoted to 0.1 kVA (e.g. 23 809.5). */
  shortCircuitKVAQuoted: { abs: 0.05 },
  /** Power factor (dimensionless). */
  pf: { abs: 1e-6 },
  /** Harmonic orders (resonance, tuning) quoted to two decimals. */
  order: { abs: 0.01 },
  /** Frequency in Hz derived from orders. */
  frequencyHz: { abs: 0.5 },
  /** Voltages quoted to 0.1 V. */
  voltageRoundedV: { abs: 0.05 },
  /** Voltages against exact arithmetic. */
  voltageV: { rel: 1e-9 },
  /** Currents in A against exact arithmetic. */
  currentA: { rel: 1e-6 },
  /** Percentages (loss reduction, voltage rise, shares) in percent points, quoted to 0.01. */
  pct: { abs: 0.01 },
  /** Capacitance in µF against exact arithmetic. */
  capacitanceUF: { rel: 1e-6 },
  /** Capacitance in µF quoted to four decimals in a hand calculation. */
  capacitanceQuotedUF: { abs: 1e-3 },
  /** Impedance and reactance in ohm against exact arithmetic. */
  ohm: { rel: 1e-9, abs: 1e-12 },
  /** Impedance, reactance (Ω) and frequency (Hz) quoted to four decimals in a hand calculation. */
  quoted4dp: { abs: 1e-4 },
  /** Angles in degrees. */
  angleDeg: { abs: 1e-9 },
  /** Independent oracle (complex.js phasor arithmetic): only float rounding differs. */
  oracle: { rel: 1e-9, abs: 1e-9 },
  /**
   * Oracle for kvar derived from kW and kVA (or PF): Q = √(S² − P²) is ill-conditioned near unity PF
   * (dQ ≈ S·√(2·ε)), so compare with an absolute tolerance of `rel` × |S| (√(2·1e-15) ≈ 4.5e-8 < 1e-7).
   */
  oracleReactive: { rel: 1e-7 },
} as const satisfies Record<string, Tolerance>;

export function isClose(actual: number, expected: number, tol: Tolerance): boolean {
  if (!Number.isFinite(actual) || !Number.isFinite(expected)) return false;
  const allowed = Math.max(tol.abs ?? 0, (tol.rel ?? 0) * Math.abs(expected));
  return Math.abs(actual - expected) <= allowed;
}

/** Assert `actual` is a finite number within `tol` of `expected`; the message names the quantity. */
export function expectClose(actual: unknown, expected: number, tol: Tolerance, label: string): void {
  const ok = typeof actual === "number" && isClose(actual, expected, tol);
  const shown = typeof actual === "number" ? actual : JSON.stringify(actual);
  const diff = typeof actual === "number" ? Math.abs(actual - expected) : NaN;
  expect(ok, `${label}: got ${shown}, expected ${expected} (|diff| ${diff}, tolerance abs ${tol.abs ?? 0} / rel ${tol.rel ?? 0})`).toBe(true);
}
