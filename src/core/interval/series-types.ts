/**
 * Types of the interval-data analysis. Units: kW, kvar, kVA; timestamps in epoch milliseconds (UTC);
 * kvar > 0 lagging, < 0 leading (src/core/conventions.ts).
 */

/** A demand series, sorted by time with unique timestamps: one entry per interval. Treat it as immutable once built. */
export interface IntervalSeries {
  /** Interval timestamps, epoch ms UTC, strictly increasing. */
  timestampsMs: Float64Array;
  /** Average real power over each interval, kW (≥ 0). */
  kW: Float64Array;
  /** Average reactive power over each interval, kvar (signed). */
  kvar: Float64Array;
  /** Number of intervals used (the arrays may be longer). */
  length: number;
  /** Interval length in minutes (detected as the median step, or given). */
  intervalMinutes: number;
  /** Zone for calendar months: an IANA name or a fixed offset like "+02:00"; UTC when absent. */
  timeZone?: string;
}

/** Percentile label → value, e.g. { P0: …, P50: …, P100: … }. */
export type Percentiles = Record<string, number>;

export interface RowError {
  /** 1-based physical line number in the upload (the header is a line too). */
  line: number;
  /** Header name of the offending column, or "" for the whole row. */
  column: string;
  reason: string;
  /** The offending text, cut to 40 characters. */
  value?: string;
}

export interface MonthlyDemand {
  /** Calendar month in the series' time zone, "YYYY-MM". */
  month: string;
  intervals: number;
  peakKW: number;
  peakKWAt: string;
  /** kvar of the interval with the peak kW (its PF is the "PF at the peak" of a PF-adjusted demand clause). */
  peakKWKvar: number;
  peakKVA: number;
  peakKVAAt: string;
  kWh: number;
  /** Sum of the lagging (positive) kvar × hours. */
  kvarhLagging: number;
  /** Sum of the leading (negative) kvar × hours, as a positive number. */
  kvarhLeading: number;
  /** kWh / √(kWh² + kvarh²) with the net kvarh (lagging − leading). */
  billingPF: number;
  /** The same with the lagging kvarh only (tariffs that ignore leading kvarh). */
  billingPFLaggingOnly: number;
}

/** A (kW, kvar) cloud reduced to the means and counts of the non-empty cells of a 2-D histogram. */
export interface LoadPoints {
  kWBins: number;
  kvarBins: number;
  kW: number[];
  kvar: number[];
  count: number[];
}

export interface DurationCurve {
  /** Share of intervals in which the kvar is at least the value, percent, from 0 (the peak) to 100 (the minimum). */
  exceedancePct: number[];
  kvar: number[];
}

export interface CapacitorBank {
  /** Capacitors always connected, kvar. */
  fixedKvar: number;
  /** Switched steps in controller order, kvar each. */
  stepsKvar: number[];
}
