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
  let min = range?.min ?? Infinity;
  let max = range?.max ?? -Infinity;
  if (!range) {
    for (let i = 0; i < n; i++) {
      const v = values[i] as number;
      if (v < min) min = v;
      if (v > max) max = v;
    }
  }
  const h = new RankHistogram(n, ranks, { min, max });
  h.countAll(values);
  h.startGathering();
  h.gatherAll(values);
  return h.finish();
}

/**
 * valuesAtRanks for values the caller computes as it goes rather than keeps (a needed kvar, a PF, a corrected
 * kvar): the caller shows the same n values in the same order twice — to count(), then, after startGathering(),
 * to gather() — and finish() gives the values at the ranks. Memory: a histogram and the few values of the buckets
 * that hold a rank, never the n values (except when the range is too small or too wide to bucket).
 */
export class RankHistogram {
  private readonly out: Float64Array;
  private readonly ranks: readonly number[];
  /** NaN: no values; otherwise every value is min when min = max. */
  private readonly constant: boolean;
  private readonly min: number;
  private readonly scale: number;
  private readonly last: number;
  /** null when the values cannot be bucketed: all are kept and sorted. */
  private readonly counts: Uint32Array | null;
  private slot: Int32Array = new Int32Array(0);
  private slotBase: number[] = [];
  private slotFirstRank: number[] = [];
  private rankSlot: Int32Array = new Int32Array(0);
  private fill: number[] = [];
  private gathered: Float64Array = new Float64Array(0);
  private kept = 0;

  /** `range`: the exact minimum and maximum of the n values. */
  constructor(
    private readonly n: number,
    ranks: readonly number[],
    range: ValueRange,
  ) {
    this.ranks = ranks;
    this.out = new Float64Array(ranks.length);
    this.min = range.min;
    this.constant = n === 0 || range.min === range.max;
    const buckets = Math.max(64, Math.min(16384, n >> 3));
    this.scale = buckets / (range.max - range.min);
    this.last = buckets - 1;
    // a range too small (subnormal) or too large (overflow) for bucketing: keep everything
    const bucketable = this.scale > 0 && this.scale < Infinity;
    this.counts = this.constant || !bucketable ? null : new Uint32Array(buckets);
    if (!this.constant && !bucketable) this.gathered = new Float64Array(n);
  }

  count(v: number): void {
    const counts = this.counts;
    if (counts === null) return;
    const b = Math.floor((v - this.min) * this.scale);
    counts[b > this.last ? this.last : b]!++;
  }

  /** count() of the first n values of an array (the same, in one tight loop). */
  countAll(values: Float64Array): void {
    this.countSome(values, this.n);
  }

  /** gather() of the first n values of an array. */
  gatherAll(values: Float64Array): void {
    this.gatherSome(values, this.n);
  }

  /** count() of values[0, length): a block of the n values, in their order. */
  countSome(values: Float64Array, length: number): void {
    const counts = this.counts;
    if (counts === null) return;
    const { min, scale, last } = this;
    for (let i = 0; i < length; i++) {
      const b = Math.floor(((values[i] as number) - min) * scale);
      counts[b > last ? last : b]!++;
    }
  }

  /** gather() of values[0, length). */
  gatherSome(values: Float64Array, length: number): void {
    if (this.counts === null) {
      for (let i = 0; i < length; i++) this.gather(values[i] as number);
      return;
    }
    const { min, scale, last, slot, gathered, fill } = this;
    for (let i = 0; i < length; i++) {
      const v = values[i] as number;
      const bi = Math.floor((v - min) * scale);
      const s = slot[bi > last ? last : bi] as number;
      if (s >= 0) gathered[fill[s]!++] = v;
    }
  }

  /** After the counting pass: the bucket of each rank, and room for those buckets' values. */
  startGathering(): void {
    const counts = this.counts;
    if (counts === null) return;
    const n = this.n;
    const order = this.ranks.map((r, k) => ({ r: Math.min(n - 1, Math.max(0, r)), k })).sort((a, b) => a.r - b.r);
    const slot = new Int32Array(counts.length).fill(-1);
    const rankSlot = new Int32Array(this.ranks.length);
    let b = 0;
    let below = 0; // values in buckets before b
    let size = 0;
    // one flat loop (a nested one would be compiled on the fly and left at every rank): walk the buckets up to
    // each rank's, in rank order
    for (let i = 0; i < order.length;) {
      const { r, k } = order[i]!;
      if (below + (counts[b] as number) <= r) {
        below += counts[b++] as number;
        continue;
      }
      i++;
      if (slot[b] === -1) {
        slot[b] = this.slotBase.length;
        this.slotBase.push(size);
        this.slotFirstRank.push(below);
        size += counts[b] as number;
      }
      rankSlot[k] = slot[b] as number;
    }
    this.slot = slot;
    this.rankSlot = rankSlot;
    this.gathered = new Float64Array(size);
    this.fill = this.slotBase.slice();
  }

  gather(v: number): void {
    if (this.counts === null) {
      if (!this.constant) this.gathered[this.kept++] = v;
      return;
    }
    const bi = Math.floor((v - this.min) * this.scale);
    const s = this.slot[bi > this.last ? this.last : bi] as number;
    if (s >= 0) this.gathered[this.fill[s]!++] = v;
  }

  /** The values at the ranks (in the order the ranks were given). */
  finish(): Float64Array {
    const { out, ranks, n } = this;
    if (n === 0) return out.fill(Number.NaN);
    if (this.constant) return out.fill(this.min);
    if (this.counts === null) {
      const all = this.gathered.sort();
      ranks.forEach((r, k) => (out[k] = all[Math.min(n - 1, Math.max(0, r))] as number));
      return out;
    }
    const { gathered, slotBase, slotFirstRank, rankSlot } = this;
    const size = gathered.length;
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
}

export function percentileLabel(p: number): string {
  return `P${p}`;
}

/** Nearest-rank percentiles of the first n values, keyed "P0" … "P100". */
export function percentiles(values: Float64Array, n: number, ps: readonly number[] = STANDARD_PERCENTILES, range?: ValueRange): Percentiles {
  return labelled(ps, valuesAtRanks(values, n, percentileRanks(n, ps), range));
}

/** The 0-based ranks of the nearest-rank percentiles ps of n values. */
export function percentileRanks(n: number, ps: readonly number[] = STANDARD_PERCENTILES): number[] {
  return ps.map((p) => nearestRank(p, n));
}

/** Values at the ranks of ps (percentileRanks), keyed "P0" … "P100". */
export function labelled(ps: readonly number[], at: Float64Array): Percentiles {
  const out: Percentiles = {};
  ps.forEach((p, i) => (out[percentileLabel(p)] = at[i] as number));
  return out;
}

/** The percentiles of the duration curve, from the peak (P100) down to the minimum (P0). */
const CURVE_FROM_PEAK = [...CURVE_PERCENTILES].reverse();

/** The ranks whose values durationCurveAt needs, for n values. */
export function durationCurveRanks(n: number): number[] {
  return percentileRanks(n, CURVE_FROM_PEAK);
}

/**
 * The duration curve (the value reached or exceeded in e % of intervals is the (100 − e)th percentile), from
 * e = 0 (the peak) to 100 (the minimum), together with the standard percentiles, in one pass.
 */
export function durationCurve(
  values: Float64Array,
  n: number,
  range?: ValueRange,
): { curve: { exceedancePct: number[]; kvar: number[] }; percentiles: Percentiles } {
  return durationCurveAt(valuesAtRanks(values, n, durationCurveRanks(n), range));
}

/** The duration curve and standard percentiles from the values at durationCurveRanks. */
export function durationCurveAt(at: Float64Array): { curve: { exceedancePct: number[]; kvar: number[] }; percentiles: Percentiles } {
  const ps = CURVE_FROM_PEAK;
  const byP = new Map(ps.map((p, i) => [p, at[i] as number]));
  const out: Percentiles = {};
  for (const p of STANDARD_PERCENTILES) out[percentileLabel(p)] = byP.get(p) as number;
  return { curve: { exceedancePct: ps.map((p) => Math.round((100 - p) * 10) / 10), kvar: Array.from(at) }, percentiles: out };
}
