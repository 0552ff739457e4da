/** Harmonic current spectra: the ideal six-pulse spectrum and input validation. */
import { MAX_HARMONIC_ORDER, type Issue, type SpectrumLine } from "./study-types.js";

/** Above this total the data is almost surely mis-entered (common practice, no source). */
export const MAX_SPECTRUM_SUM_PCT = 300;

/**
 * Ideal six-pulse rectifier: I_h = I_1/h at h = 6k ± 1 (textbook idealisation: infinite DC inductance,
 * no commutation overlap). Real drives differ — a measured spectrum is better whenever available.
 */
export function sixPulseSpectrum(maxOrder = 49): SpectrumLine[] {
  const lines: SpectrumLine[] = [];
  for (let k = 1; 6 * k - 1 <= maxOrder; k++) {
    for (const h of [6 * k - 1, 6 * k + 1]) if (h <= maxOrder) lines.push({ order: h, pct: 100 / h });
  }
  return lines;
}

/** Orders must be integers 2..50, pct ≥ 0, no order twice, and the total at most 300 %. */
export function validateSpectrum(spectrum: readonly SpectrumLine[], path: string): Issue[] {
  const issues: Issue[] = [];
  const seen = new Set<number>();
  let sumPct = 0;
  spectrum.forEach((line, i) => {
    const at = `${path}[${i}]`;
    if (!Number.isInteger(line.order) || line.order < 2 || line.order > MAX_HARMONIC_ORDER) {
      issues.push({ path: `${at}.order`, message: `order must be an integer from 2 to ${MAX_HARMONIC_ORDER}` });
    } else if (seen.has(line.order)) {
      issues.push({ path: `${at}.order`, message: `order ${line.order} appears more than once` });
    } else {
      seen.add(line.order);
    }
    if (!Number.isFinite(line.pct) || line.pct < 0) {
      issues.push({ path: `${at}.pct`, message: "pct must be a number >= 0" });
    } else {
      sumPct += line.pct;
    }
  });
  if (sumPct > MAX_SPECTRUM_SUM_PCT) issues.push({ path, message: `spectrum sums to more than ${MAX_SPECTRUM_SUM_PCT} %` });
  return issues;
}
