import { tanPhi } from "../conventions.js";
import { isoWithOffset } from "./datetime.js";
import { LoadPointGrid, MONTH_POINT_KVAR_BINS, MONTH_POINT_KW_BINS, LOAD_POINT_KVAR_BINS, LOAD_POINT_KW_BINS } from "./load-points.js";
import { billingPF, MonthTally, monthlyDemandOf, monthRuns, zoneOfSeries } from "./months.js";
import { durationCurveAt, durationCurveRanks, labelled, percentileRanks, RankHistogram, STANDARD_PERCENTILES } from "./percentiles.js";
import type { DurationCurve, IntervalSeries, LoadPoints, MonthlyDemand, Percentiles } from "./series-types.js";

export { loadPointsOf, LOAD_POINT_KVAR_BINS, LOAD_POINT_KW_BINS, MONTH_POINT_KVAR_BINS, MONTH_POINT_KW_BINS } from "./load-points.js";

/** The figures of a demand series (percentiles are nearest-rank over the intervals present). */
export interface IntervalAnalysis {
  targetPF: number;
  intervalMinutes: number;
  intervalCount: number;
  firstTimestamp: string;
  lastTimestamp: string;
  /** Intervals present × interval length, days. */
  coveredDays: number;
  timeZone: string;
  kW: { percentiles: Percentiles; max: number; mean: number };
  /** Reactive demand, signed kvar. */
  kvar: { percentiles: Percentiles; mean: number; durationCurve: DurationCurve };
  /** Fixed-part limit: capacitors above the low reactive demand make the site lead at light load. */
  minimumReactiveDemand: { minKvar: number; p1Kvar: number; p5Kvar: number };
  /** needed_i = max(0, Q_i − P_i·tan(acos target)) and its percentiles. */
  neededKvar: { percentiles: Percentiles; hold95PctKvar: number; hold99PctKvar: number; hold100PctKvar: number };
  /** Displacement PF of each interval, P / √(P² + Q²), without correction. */
  pf: { percentiles: Percentiles; intervalsBelowTarget: number; intervalsLeading: number };
  monthly: MonthlyDemand[];
  total: { kWh: number; kvarhLagging: number; kvarhLeading: number; billingPF: number };
  loadPoints: LoadPoints;
  /** Each month's own load points (same order as `monthly`): what the economics needs to price any bank month by month. */
  monthlyLoadPoints: LoadPoints[];
}

/** PF of one interval: P / S, 1 when S = 0. */
export function intervalPF(kW: number, kvar: number): number {
  const s = Math.sqrt(kW * kW + kvar * kvar);
  return s > 0 ? kW / s : 1;
}

/** kvar to hold the target at constant kW: max(0, Q − P·tan(acos PF₂)) (power-triangle method, as in correction.ts). */
function neededKvarAt(p: number, q: number, tanTarget: number): number {
  const need = q - p * tanTarget;
  return need > 0 ? need : 0;
}

export function assertSeries(series: IntervalSeries): void {
  const { length: n, timestampsMs: t } = series;
  if (n < 1 || t.length < n || series.kW.length < n || series.kvar.length < n) throw new RangeError("series arrays shorter than its length");
  if (!(series.intervalMinutes > 0)) throw new RangeError("intervalMinutes must be > 0");
  for (let i = 1; i < n; i++)
    if (!((t[i] as number) > (t[i - 1] as number))) throw new RangeError(`timestamps not strictly increasing at index ${i}`);
}

/** What a histogram pass shows: each interval's needed kvar or PF. */
const NEEDED = 2,
  PF = 3;

/** Values computed a block at a time, then counted or gathered in one tight loop (the block stays in cache). */
export const BLOCK = 4096;

/**
 * One pass of a RankHistogram over the needed kvar or the PF of every interval (count, or gather after
 * startGathering). The hot loops live in small functions called many times an analysis: they are compiled once and
 * reused, where loops written one after another in a long function called once would each be compiled on the fly
 * (on-stack replacement) — and an inner loop compiled so is left, and its code thrown away, at every turn of the
 * outer one: hence the block is filled by a function of its own, not by a loop nested in this one.
 */
function feed(
  h: RankHistogram,
  gather: boolean,
  what: number,
  kW: Float64Array,
  kvar: Float64Array,
  n: number,
  tanTarget: number,
  block: Float64Array,
): void {
  for (let from = 0; from < n; from += BLOCK) {
    const length = Math.min(BLOCK, n - from);
    if (what === NEEDED) neededBlock(block, kW, kvar, from, length, tanTarget);
    else pfBlock(block, kW, kvar, from, length);
    if (gather) h.gatherSome(block, length);
    else h.countSome(block, length);
  }
}

/** block[j] = the needed kvar of interval from + j. */
function neededBlock(block: Float64Array, kW: Float64Array, kvar: Float64Array, from: number, length: number, tanTarget: number): void {
  for (let j = 0; j < length; j++) block[j] = neededKvarAt(kW[from + j] as number, kvar[from + j] as number, tanTarget);
}

/** block[j] = the PF of interval from + j. */
function pfBlock(block: Float64Array, kW: Float64Array, kvar: Float64Array, from: number, length: number): void {
  for (let j = 0; j < length; j++) block[j] = intervalPF(kW[from + j] as number, kvar[from + j] as number);
}

function fillGrid(grid: LoadPointGrid, kW: Float64Array, kvar: Float64Array, start: number, end: number): void {
  for (let i = start; i < end; i++) grid.add(kW[i] as number, kvar[i] as number);
}

/** Running sums, counts and exact ranges of pass 1. */
class Pass1 {
  sumP = 0;
  sumQ = 0;
  below = 0;
  leading = 0;
  pMin = Infinity;
  pMax = -Infinity;
  qMin = Infinity;
  qMax = -Infinity;
  needMin = Infinity;
  needMax = -Infinity;
  pfMin = Infinity;
  pfMax = -Infinity;
}

/** Pass 1 over one month's intervals; returns the month's load-point grid range. */
function pass1Month(
  a: Pass1,
  tally: MonthTally,
  kW: Float64Array,
  kvar: Float64Array,
  start: number,
  end: number,
  tanTarget: number,
): { pMax: number; qMin: number; qMax: number } {
  let { sumP, sumQ, below, leading, pMin, pMax, qMin, qMax, needMin, needMax, pfMin, pfMax } = a;
  let mpMax = 0,
    mqMin = Infinity,
    mqMax = -Infinity;
  for (let i = start; i < end; i++) {
    const p = kW[i] as number,
      q = kvar[i] as number;
    const need = q - p * tanTarget;
    const held = need > 0 ? need : 0; // = neededKvarAt(p, q, tanTarget)
    if (need > 1e-9) below++; // PF below target ⇔ Q > P·tan(acos target)
    const f = intervalPF(p, q);
    if (q < 0) leading++;
    sumP += p;
    sumQ += q;
    if (p < pMin) pMin = p;
    if (p > pMax) pMax = p;
    if (q < qMin) qMin = q;
    if (q > qMax) qMax = q;
    if (held < needMin) needMin = held;
    if (held > needMax) needMax = held;
    if (f < pfMin) pfMin = f;
    if (f > pfMax) pfMax = f;
    if (p > mpMax) mpMax = p;
    if (q < mqMin) mqMin = q;
    if (q > mqMax) mqMax = q;
    tally.add(i, p, q);
  }
  Object.assign(a, { sumP, sumQ, below, leading, pMin, pMax, qMin, qMax, needMin, needMax, pfMin, pfMax });
  return { pMax: mpMax, qMin: mqMin, qMax: mqMax };
}

/**
 * Reactive-demand analysis of a sorted series against a target PF (0 < target ≤ 1). Three passes over the
 * intervals, none of which keeps a value per interval: (1) sums, counts, exact ranges and the months' peaks;
 * (2) histograms of kW, kvar, needed kvar and PF, and the load-point grids; (3) the values in the histogram
 * buckets that hold a wanted percentile (RankHistogram). The needed kvar and the PF are recomputed from kW and kvar
 * in each pass, by the same expressions, so every pass sees the same values.
 */
export function analyseIntervals(series: IntervalSeries, targetPF: number): IntervalAnalysis {
  assertSeries(series);
  if (!(targetPF > 0 && targetPF <= 1)) throw new RangeError("targetPF must be in (0, 1]");
  const n = series.length;
  const { kW, kvar } = series;
  const tanTarget = tanPhi(targetPF);
  const zone = zoneOfSeries(series);
  const runs = monthRuns(series, zone);
  const tallies = runs.map((run) => new MonthTally(run.start));
  const a = new Pass1();
  const monthRanges = runs.map((run, k) => pass1Month(a, tallies[k]!, kW, kvar, run.start, run.end, tanTarget));
  const { sumP, sumQ, below, leading, pMax, qMin, qMax } = a;
  const std = percentileRanks(n);
  const kWAt = new RankHistogram(n, std, { min: a.pMin, max: pMax });
  const kvarAt = new RankHistogram(n, durationCurveRanks(n), { min: qMin, max: qMax });
  const neededAt = new RankHistogram(n, std, { min: a.needMin, max: a.needMax });
  const pfAt = new RankHistogram(n, std, { min: a.pfMin, max: a.pfMax });
  const grid = new LoadPointGrid(LOAD_POINT_KW_BINS, LOAD_POINT_KVAR_BINS, pMax > 0 ? pMax : 0, qMin, qMax);
  const monthGrids = monthRanges.map((r) => new LoadPointGrid(MONTH_POINT_KW_BINS, MONTH_POINT_KVAR_BINS, r.pMax, r.qMin, r.qMax));
  kWAt.countAll(kW);
  kvarAt.countAll(kvar);
  const block = new Float64Array(BLOCK);
  feed(neededAt, false, NEEDED, kW, kvar, n, tanTarget, block);
  feed(pfAt, false, PF, kW, kvar, n, tanTarget, block);
  fillGrid(grid, kW, kvar, 0, n);
  runs.forEach((run, k) => fillGrid(monthGrids[k]!, kW, kvar, run.start, run.end));
  for (const h of [kWAt, kvarAt, neededAt, pfAt]) h.startGathering();
  kWAt.gatherAll(kW);
  kvarAt.gatherAll(kvar);
  feed(neededAt, true, NEEDED, kW, kvar, n, tanTarget, block);
  feed(pfAt, true, PF, kW, kvar, n, tanTarget, block);
  const neededP = labelled(STANDARD_PERCENTILES, neededAt.finish());
  const { curve, percentiles: kvarP } = durationCurveAt(kvarAt.finish()); // CURVE_PERCENTILES include every whole percent
  const monthly = monthlyDemandOf(series, kvar, runs, zone, tallies);
  const hours = series.intervalMinutes / 60;
  const kWh = monthly.reduce((a, m) => a + m.kWh, 0);
  const lag = monthly.reduce((a, m) => a + m.kvarhLagging, 0);
  const lead = monthly.reduce((a, m) => a + m.kvarhLeading, 0);
  const t = series.timestampsMs;
  const iso = (u: number) => isoWithOffset(u, zone.offsetMsAt(u));
  return {
    targetPF,
    intervalMinutes: series.intervalMinutes,
    intervalCount: n,
    firstTimestamp: iso(t[0] as number),
    lastTimestamp: iso(t[n - 1] as number),
    coveredDays: (n * hours) / 24,
    timeZone: zone.name,
    kW: { percentiles: labelled(STANDARD_PERCENTILES, kWAt.finish()), max: pMax, mean: sumP / n },
    kvar: { percentiles: kvarP, mean: sumQ / n, durationCurve: curve },
    minimumReactiveDemand: { minKvar: kvarP.P0 as number, p1Kvar: kvarP.P1 as number, p5Kvar: kvarP.P5 as number },
    neededKvar: {
      percentiles: neededP,
      hold95PctKvar: neededP.P95 as number,
      hold99PctKvar: neededP.P99 as number,
      hold100PctKvar: neededP.P100 as number,
    },
    pf: { percentiles: labelled(STANDARD_PERCENTILES, pfAt.finish()), intervalsBelowTarget: below, intervalsLeading: leading },
    monthly,
    total: { kWh, kvarhLagging: lag, kvarhLeading: lead, billingPF: billingPF(kWh, lag - lead) },
    loadPoints: grid.points(),
    monthlyLoadPoints: monthGrids.map((g) => g.points()),
  };
}
