import type { Percentiles } from "./series-types.js";

/** The percentiles every distribution reports. */
export const STANDARD_PERCENTILES = [0, 1, 5, 10, 25, 50, 75, 90, 95, 99, 100] as const;

/** Percentiles of the plotted duration curve: every whole percent plus finer tails (107 points, ≤ 200). */
export const CURVE_PERCENTILES: readonly number[] = [
  ...new Set([0, 0.1, 0.2, 0.5, ...Array.from({ length: 101 }, (_, i) => i), 99.5, 99.8, 99.9]),
].sort((a, b) => a - b);

/**
 * 0-based rank of the nearest-rank percentile: the smallest value with at least p % of the n values at or below
 * it, i.e. sorted[⌈p·n/100⌉ − 1]; P0 is the minimum (nearest-rank definition, e.g. NIST/Wikipedia "Percentile").
 */
export function nearestRank(p: number, n: number): number {
  if (p <= 0) return 0;
  return Math.min(n - 1, Math.max(0, Math.ceil((p * n) / 100 - 1e-9) - 1));
}

/** The nearest-rank p-th percentile (p in percent) of unsorted values; NaN when there are none. */
export function percentileOf(values: Float64Array, p: number): number {
  if (values.length === 0) return Number.NaN;
  return Float64Array.from(values).sort()[nearestRank(p, values.length)] as number;
}

/** The exact minimum and maximum of the values, when the caller already has them (saves a pass). */
export interface ValueRange {
  min: number;
  max: number;
}

/**
 * Exact order statistics (values at 0-based ranks in sorted order) without sorting everything: a histogram over
 * [min, max] finds the bucket of each rank; only those buckets' values are gathered and sorted.
 */
export function valuesAtRanks(values: Float64Array, n: number, ranks: readonly number[], range?: ValueRange): Float64Array {
  const out = new Float64Array(ranks.length);
  if (n === 0) return out.fill(Number.NaN);
  let min = range?.min ?? Infinity;
  let max = range?.max ?? -Infinity;
  if (!range) {
    for (let i = 0; i < n; i++) {
      const v = values[i] as number;
      if (v < min) min = v;
      if (v > max) max = v;
    }
  }
  if (min === max) return out.fill(min);
  const buckets = Math.max(64, Math.min(16384, n >> 3));
  const scale = buckets / (max - min);
  if (!(scale > 0 && scale < Infinity)) {
    // range too small (subnormal) or too large (overflow) for bucketing: sort everything
    const all = values.slice(0, n).sort();
    ranks.forEach((r, k) => (out[k] = all[Math.min(n - 1, Math.max(0, r))] as number));
    return out;
  }
  const last = buckets - 1;
  const counts = new Uint32Array(buckets);
  for (let i = 0; i < n; i++) {
    const b = Math.floor(((values[i] as number) - min) * scale);
    counts[b > last ? last : b]!++;
  }
  // bucket of each rank, and the first rank of that bucket
  const order = ranks.map((r, k) => ({ r: Math.min(n - 1, Math.max(0, r)), k })).sort((a, b) => a.r - b.r);
  const slot = new Int32Array(buckets).fill(-1);
  const slotBase: number[] = [];
  const slotFirstRank: number[] = [];
  const rankSlot = new Int32Array(ranks.length);
  let b = 0;
  let below = 0; // values in buckets before b
  let size = 0;
  for (const { r, k } of order) {
    while (below + (counts[b] as number) <= r) below += counts[b++] as number;
    if (slot[b] === -1) {
      slot[b] = slotBase.length;
      slotBase.push(size);
      slotFirstRank.push(below);
      size += counts[b] as number;
    }
    rankSlot[k] = slot[b] as number;
  }
  const gathered = new Float64Array(size);
  const fill = slotBase.slice();
  for (let i = 0; i < n; i++) {
    const v = values[i] as number;
    const bi = Math.floor((v - min) * scale);
    const s = slot[bi > last ? last : bi] as number;
    if (s >= 0) gathered[fill[s]!++] = v;
  }
  const sorted = new Uint8Array(slotBase.length);
  for (let k = 0; k < ranks.length; k++) {
    const s = rankSlot[k] as number;
    const base = slotBase[s] as number;
    const end = s + 1 < slotBase.length ? (slotBase[s + 1] as number) : size;
    if (!sorted[s]) {
      gathered.subarray(base, end).sort();
      sorted[s] = 1;
    }
    const r = Math.min(n - 1, Math.max(0, ranks[k] as number));
    out[k] = gathered[base + r - (slotFirstRank[s] as number)] as number;
  }
  return out;
}

export function percentileLabel(p: number): string {
  return `P${p}`;
}

/** Nearest-rank percentiles of the first n values, keyed "P0" … "P100". */
export function percentiles(values: Float64Array, n: number, ps: readonly number[] = STANDARD_PERCENTILES, range?: ValueRange): Percentiles {
  const at = valuesAtRanks(values, n, ps.map((p) => nearestRank(p, n)), range);
  const out: Percentiles = {};
  ps.forEach((p, i) => (out[percentileLabel(p)] = at[i] as number));
  return out;
}

/**
 * The duration curve (the value reached or exceeded in e % of intervals is the (100 − e)th percentile), from
 * e = 0 (the peak) to 100 (the minimum), together with the standard percentiles, in one pass.
 */
export function durationCurve(values: Float64Array, n: number, range?: ValueRange): { curve: { exceedancePct: number[]; kvar: number[] }; percentiles: Percentiles } {
  const ps = [...CURVE_PERCENTILES].reverse();
  const at = valuesAtRanks(values, n, ps.map((p) => nearestRank(p, n)), range);
  const byP = new Map(ps.map((p, i) => [p, at[i] as number]));
  const out: Percentiles = {};
  for (const p of STANDARD_PERCENTILES) out[percentileLabel(p)] = byP.get(p) as number;
  return { curve: { exceedancePct: ps.map((p) => Math.round((100 - p) * 10) / 10), kvar: Array.from(at) }, percentiles: out };
}
