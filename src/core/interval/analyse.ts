import { tanPhi } from "../conventions.js";
import { isoWithOffset } from "./datetime.js";
import { billingPF, monthlyDemand, monthRuns, zoneOfSeries } from "./months.js";
import { durationCurve, percentiles, type ValueRange } from "./percentiles.js";
import type { DurationCurve, IntervalSeries, LoadPoints, MonthlyDemand, Percentiles } from "./series-types.js";

export const LOAD_POINT_KW_BINS = 16;
export const LOAD_POINT_KVAR_BINS = 24;
/** A month's own kW × kvar grid is coarser: twelve of them are stored with a summary (see summary.ts). */
export const MONTH_POINT_KW_BINS = 10;
export const MONTH_POINT_KVAR_BINS = 12;

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

/** Stretch a running range to include v. */
export function widen(range: ValueRange, v: number): void {
  if (v < range.min) range.min = v;
  if (v > range.max) range.max = v;
}

/** PF of one interval: P / S, 1 when S = 0. */
export function intervalPF(kW: number, kvar: number): number {
  const s = Math.sqrt(kW * kW + kvar * kvar);
  return s > 0 ? kW / s : 1;
}

export function assertSeries(series: IntervalSeries): void {
  const { length: n, timestampsMs: t } = series;
  if (n < 1 || t.length < n || series.kW.length < n || series.kvar.length < n) throw new RangeError("series arrays shorter than its length");
  if (!(series.intervalMinutes > 0)) throw new RangeError("intervalMinutes must be > 0");
  for (let i = 1; i < n; i++) if (!((t[i] as number) > (t[i - 1] as number))) throw new RangeError(`timestamps not strictly increasing at index ${i}`);
}

/**
 * Mean kW and kvar of the non-empty cells of a kW × kvar histogram (enough to re-estimate a controller), over the
 * intervals start…end − 1 (the whole series by default).
 */
export function loadPointsOf(series: IntervalSeries, kWBins = LOAD_POINT_KW_BINS, kvarBins = LOAD_POINT_KVAR_BINS, start = 0, end = series.length): LoadPoints {
  let pMax = 0, qMin = Infinity, qMax = -Infinity;
  for (let i = start; i < end; i++) {
    const p = series.kW[i] as number, q = series.kvar[i] as number;
    if (p > pMax) pMax = p;
    if (q < qMin) qMin = q;
    if (q > qMax) qMax = q;
  }
  const cells = kWBins * kvarBins;
  const count = new Float64Array(cells), sumP = new Float64Array(cells), sumQ = new Float64Array(cells);
  const finite = (x: number) => (Number.isFinite(x) ? x : 0); // a subnormal range would give ∞ · 0 = NaN
  const pScale = pMax > 0 ? finite(kWBins / pMax) : 0;
  const qScale = qMax > qMin ? finite(kvarBins / (qMax - qMin)) : 0;
  for (let i = start; i < end; i++) {
    const p = series.kW[i] as number, q = series.kvar[i] as number;
    const a = Math.min(kWBins - 1, Math.floor(p * pScale));
    const b = Math.min(kvarBins - 1, Math.floor((q - qMin) * qScale));
    const c = a * kvarBins + b;
    count[c]!++;
    sumP[c]! += p;
    sumQ[c]! += q;
  }
  const out: LoadPoints = { kWBins, kvarBins, kW: [], kvar: [], count: [] };
  for (let c = 0; c < cells; c++) {
    const k = count[c] as number;
    if (k === 0) continue;
    out.kW.push((sumP[c] as number) / k);
    out.kvar.push((sumQ[c] as number) / k);
    out.count.push(k);
  }
  return out;
}

/** Reactive-demand analysis of a sorted series against a target PF (0 < target ≤ 1). */
export function analyseIntervals(series: IntervalSeries, targetPF: number): IntervalAnalysis {
  assertSeries(series);
  if (!(targetPF > 0 && targetPF <= 1)) throw new RangeError("targetPF must be in (0, 1]");
  const n = series.length;
  const { kW, kvar } = series;
  const tanTarget = tanPhi(targetPF);
  const needed = new Float64Array(n);
  const pf = new Float64Array(n);
  let sumP = 0, sumQ = 0, below = 0, leading = 0;
  const r = { p: { min: Infinity, max: -Infinity }, q: { min: Infinity, max: -Infinity }, need: { min: Infinity, max: -Infinity }, pf: { min: Infinity, max: -Infinity } };
  for (let i = 0; i < n; i++) {
    const p = kW[i] as number, q = kvar[i] as number;
    // kvar to hold the target at constant kW: Q − P·tan(acos PF₂) (power-triangle method, as in correction.ts)
    const need = q - p * tanTarget;
    const held = need > 0 ? need : 0;
    needed[i] = held;
    if (need > 1e-9) below++; // PF below target ⇔ Q > P·tan(acos target)
    const f = intervalPF(p, q);
    pf[i] = f;
    if (q < 0) leading++;
    sumP += p;
    sumQ += q;
    widen(r.p, p);
    widen(r.q, q);
    widen(r.need, held);
    widen(r.pf, f);
  }
  const pMax = r.p.max;
  const neededP = percentiles(needed, n, undefined, r.need);
  const { curve, percentiles: kvarP } = durationCurve(kvar, n, r.q); // CURVE_PERCENTILES include every whole percent
  const zone = zoneOfSeries(series);
  const runs = monthRuns(series, zone);
  const monthly = monthlyDemand(series, kvar, runs, zone);
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
    kW: { percentiles: percentiles(kW, n, undefined, r.p), max: pMax, mean: sumP / n },
    kvar: { percentiles: kvarP, mean: sumQ / n, durationCurve: curve },
    minimumReactiveDemand: { minKvar: kvarP.P0 as number, p1Kvar: kvarP.P1 as number, p5Kvar: kvarP.P5 as number },
    neededKvar: {
      percentiles: neededP,
      hold95PctKvar: neededP.P95 as number,
      hold99PctKvar: neededP.P99 as number,
      hold100PctKvar: neededP.P100 as number,
    },
    pf: { percentiles: percentiles(pf, n, undefined, r.pf), intervalsBelowTarget: below, intervalsLeading: leading },
    monthly,
    total: { kWh, kvarhLagging: lag, kvarhLeading: lead, billingPF: billingPF(kWh, lag - lead) },
    loadPoints: loadPointsOf(series),
    monthlyLoadPoints: runs.map((r) => loadPointsOf(series, MONTH_POINT_KW_BINS, MONTH_POINT_KVAR_BINS, r.start, r.end)),
  };
}
