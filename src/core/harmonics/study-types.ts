/** Shared shapes of the harmonic-study engine. */

/** One line of a spectrum: harmonic order and magnitude in percent of the fundamental. */
export interface SpectrumLine {
  order: number;
  pct: number;
}

/** A problem in caller input; `path` locates it, e.g. "sources[0].spectrum[2].order". */
export interface Issue {
  path: string;
  message: string;
}

/** A value checked against a limit; margin = limit − value (positive is headroom). */
export interface LimitCheck {
  valuePct: number;
  limitPct: number;
  marginPct: number;
  pass: boolean;
}

/** Highest harmonic order the engine models (IEEE Std 519 evaluates up to the 50th). */
export const MAX_HARMONIC_ORDER = 50;

export const SQRT3 = Math.sqrt(3);

export function limitCheck(valuePct: number, limitPct: number): LimitCheck {
  return { valuePct, limitPct, marginPct: limitPct - valuePct, pass: valuePct <= limitPct };
}
