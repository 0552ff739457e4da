import type { IntervalSeries } from "../../../src/core/interval/interval-api.js";

/** Tolerances of the interval tests (same rule as test/helpers/tolerance.ts: |a − e| ≤ max(abs, rel·|e|)). */
export const ITOL = {
  /** kW, kvar, kWh, kvarh against exact arithmetic on exactly representable inputs. */
  exact: { abs: 1e-9, rel: 1e-12 },
  /** Sums over a year of intervals: float accumulation over ~5·10⁵ terms. */
  sum: { rel: 1e-9 },
  /** PF against exact arithmetic. */
  pf: { abs: 1e-9 },
} as const;

export const MINUTE_MS = 60_000;
export const DAY_MS = 86_400_000;

/** A series from plain arrays (timestamps in ms). */
export function seriesOf(timestampsMs: number[], kW: number[], kvar: number[], intervalMinutes: number, timeZone?: string): IntervalSeries {
  return {
    timestampsMs: Float64Array.from(timestampsMs),
    kW: Float64Array.from(kW),
    kvar: Float64Array.from(kvar),
    length: timestampsMs.length,
    intervalMinutes,
    ...(timeZone ? { timeZone } : {}),
  };
}

/**
 * A year (2025, 365 days, UTC) of `perDay` equal intervals a day; kW and kvar from the interval's index k
 * within its day (0 … perDay − 1) and its day number d.
 */
export function syntheticYear(perDay: number, f: (k: number, d: number) => { kW: number; kvar: number }, days = 365): IntervalSeries {
  const n = perDay * days;
  const step = DAY_MS / perDay;
  const start = Date.UTC(2025, 0, 1);
  const s: IntervalSeries = {
    timestampsMs: new Float64Array(n),
    kW: new Float64Array(n),
    kvar: new Float64Array(n),
    length: n,
    intervalMinutes: 1440 / perDay,
  };
  for (let i = 0; i < n; i++) {
    const d = Math.floor(i / perDay);
    const v = f(i - d * perDay, d);
    s.timestampsMs[i] = start + i * step;
    s.kW[i] = v.kW;
    s.kvar[i] = v.kvar;
  }
  return s;
}

/** The CSV of a series with UTC "Z" timestamps, header timestamp,kW,kvar. */
export function csvOfSeries(s: IntervalSeries, header = "timestamp,kW,kvar"): string {
  const lines = [header];
  for (let i = 0; i < s.length; i++) lines.push(`${new Date(s.timestampsMs[i] as number).toISOString()},${s.kW[i]},${s.kvar[i]}`);
  return lines.join("\n") + "\n";
}
