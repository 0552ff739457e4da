import { MS_PER_MINUTE } from "./datetime.js";
import { nearestRank, valuesAtRanks } from "./percentiles.js";

/** Parsed rows in upload order (arrays may be longer than n). */
export interface RawRows {
  timestampsMs: Float64Array;
  kW: Float64Array;
  kvar: Float64Array;
  lines: Float64Array;
  n: number;
}

export interface DuplicateExample {
  line: number;
  firstLine: number;
  timestamp: string;
  sameValues: boolean;
}

export interface GapExample {
  /** Line of the row after the gap. */
  line: number;
  from: string;
  to: string;
  missingIntervals: number;
}

export interface StepReport {
  gaps: { count: number; missingIntervals: number; first: GapExample[] };
  /** Steps that are not a whole number of intervals (within 1 %). */
  irregularSteps: { count: number; first: { line: number; from: string; to: string; minutes: number }[] };
}

/**
 * Sort by time (stable: upload order among equal times) when out of order, then keep the first row of each
 * timestamp. Works in place on the given arrays when already sorted; returns the kept count.
 */
export function sortAndDedupe(
  rows: RawRows,
  alreadySorted: boolean,
  fmt: (utcMs: number) => string,
  maxExamples: number,
): { rows: RawRows; duplicates: { count: number; first: DuplicateExample[] } } {
  let { timestampsMs: t, kW, kvar, lines } = rows;
  const n = rows.n;
  if (!alreadySorted) {
    const idx = new Uint32Array(n);
    for (let i = 0; i < n; i++) idx[i] = i;
    const src = t;
    idx.sort((a, b) => (src[a] as number) - (src[b] as number) || a - b);
    const gather = (a: Float64Array) => {
      const out = new Float64Array(n);
      for (let i = 0; i < n; i++) out[i] = a[idx[i] as number] as number;
      return out;
    };
    t = gather(t);
    kW = gather(kW);
    kvar = gather(kvar);
    lines = gather(lines);
  }
  const first: DuplicateExample[] = [];
  let count = 0;
  let w = 0;
  for (let r = 0; r < n; r++) {
    if (w > 0 && t[r] === t[w - 1]) {
      count++;
      if (first.length < maxExamples) {
        first.push({
          line: lines[r] as number,
          firstLine: lines[w - 1] as number,
          timestamp: fmt(t[r] as number),
          sameValues: kW[r] === kW[w - 1] && kvar[r] === kvar[w - 1],
        });
      }
      continue;
    }
    if (w !== r) {
      t[w] = t[r] as number;
      kW[w] = kW[r] as number;
      kvar[w] = kvar[r] as number;
      lines[w] = lines[r] as number;
    }
    w++;
  }
  return { rows: { timestampsMs: t, kW, kvar, lines, n: w }, duplicates: { count, first } };
}

/** The interval length: the median of the steps between consecutive timestamps, minutes (n ≥ 2). */
export function medianStepMinutes(t: Float64Array, n: number): number {
  // fast path: a value held by more than half the steps is their median
  const first = (t[1] as number) - (t[0] as number);
  let same = 0;
  for (let i = 1; i < n; i++) if ((t[i] as number) - (t[i - 1] as number) === first) same++;
  if (same * 2 > n - 1) return first / MS_PER_MINUTE;
  const steps = new Float64Array(n - 1);
  for (let i = 1; i < n; i++) steps[i - 1] = (t[i] as number) - (t[i - 1] as number);
  const [median] = valuesAtRanks(steps, n - 1, [nearestRank(50, n - 1)]);
  return (median as number) / MS_PER_MINUTE;
}

/** Gaps (a step of k ≥ 2 intervals: k − 1 missing) and steps that are not a whole number of intervals. */
export function checkSteps(rows: RawRows, intervalMinutes: number, fmt: (utcMs: number) => string, maxExamples: number): StepReport {
  const step = intervalMinutes * MS_PER_MINUTE;
  const t = rows.timestampsMs;
  const report: StepReport = {
    gaps: { count: 0, missingIntervals: 0, first: [] },
    irregularSteps: { count: 0, first: [] },
  };
  for (let i = 1; i < rows.n; i++) {
    const d = (t[i] as number) - (t[i - 1] as number);
    const k = Math.round(d / step);
    if (k >= 1 && Math.abs(d - k * step) <= 0.01 * step) {
      if (k === 1) continue;
      report.gaps.count++;
      report.gaps.missingIntervals += k - 1;
      if (report.gaps.first.length < maxExamples) {
        report.gaps.first.push({ line: rows.lines[i] as number, from: fmt(t[i - 1] as number), to: fmt(t[i] as number), missingIntervals: k - 1 });
      }
    } else {
      report.irregularSteps.count++;
      if (report.irregularSteps.first.length < maxExamples) {
        report.irregularSteps.first.push({
          line: rows.lines[i] as number,
          from: fmt(t[i - 1] as number),
          to: fmt(t[i] as number),
          minutes: d / MS_PER_MINUTE,
        });
      }
    }
  }
  return report;
}
