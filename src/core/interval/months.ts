import { daysFromCivil, isoWithOffset, MS_PER_DAY, monthIndexOfDays, monthLabel } from "./datetime.js";
import type { IntervalSeries, MonthlyDemand } from "./series-types.js";
import { UTC_ZONE, zoneFor, type Zone } from "./zone.js";

/** A run of consecutive intervals in one calendar month of the series' zone. */
export interface MonthRun {
  monthIndex: number;
  start: number;
  end: number;
}

export function zoneOfSeries(series: IntervalSeries): Zone {
  if (series.timeZone === undefined) return UTC_ZONE;
  const zone = zoneFor(series.timeZone);
  if (zone === null) throw new RangeError(`unknown time zone "${series.timeZone}"`);
  return zone;
}

const runsCache = new WeakMap<Float64Array, { zone: string; runs: MonthRun[] }>();

/** Split a sorted series into calendar months of its zone (local month of each interval's timestamp); memoised per series. */
export function monthRuns(series: IntervalSeries, zone: Zone = zoneOfSeries(series)): MonthRun[] {
  const hit = runsCache.get(series.timestampsMs);
  if (hit && hit.zone === zone.name && hit.runs[hit.runs.length - 1]?.end === series.length) return hit.runs;
  const runs = monthRunsOf(series, zone);
  runsCache.set(series.timestampsMs, { zone: zone.name, runs });
  return runs;
}

function monthRunsOf(series: IntervalSeries, zone: Zone): MonthRun[] {
  const runs: MonthRun[] = [];
  const t = series.timestampsMs;
  let from = Infinity;
  let to = -Infinity;
  let current: MonthRun | null = null;
  for (let i = 0; i < series.length; i++) {
    const u = t[i] as number;
    const local = u + zone.offsetMsAt(u);
    if (local >= from && local < to) continue;
    const m = monthIndexOfDays(Math.floor(local / MS_PER_DAY));
    const y = Math.floor(m / 12);
    from = daysFromCivil(y, m - y * 12 + 1, 1) * MS_PER_DAY;
    const next = m + 1;
    to = daysFromCivil(Math.floor(next / 12), next - Math.floor(next / 12) * 12 + 1, 1) * MS_PER_DAY;
    if (current) current.end = i;
    current = { monthIndex: m, start: i, end: series.length };
    runs.push(current);
  }
  return runs;
}

/** Billing PF from energies: kWh / √(kWh² + kvarh²) (utility tariff definition of average PF). */
export function billingPF(kWh: number, kvarh: number): number {
  const s = Math.hypot(kWh, kvarh);
  return s > 0 ? kWh / s : 1;
}

const demandCache = new WeakMap<Float64Array, { runs: MonthRun[]; minutes: number; result: MonthlyDemand[] }>();

/**
 * Peak kW and kVA demand and energies of each month. Energy of an interval = its average power × the interval
 * length (demand-interval convention); `kvar` may be a corrected series. Memoised for the series' own kvar
 * (series are treated as immutable once built); each call gets its own copies.
 */
export function monthlyDemand(series: IntervalSeries, kvar: Float64Array, runs: MonthRun[], zone: Zone): MonthlyDemand[] {
  const hit = demandCache.get(kvar);
  if (hit && hit.runs === runs && hit.minutes === series.intervalMinutes) return hit.result.map((m) => ({ ...m }));
  const tallies = runs.map((run) => {
    const t = new MonthTally(run.start);
    for (let i = run.start, end = run.end; i < end; i++) t.add(i, series.kW[i] as number, kvar[i] as number);
    return t;
  });
  return monthlyDemandOf(series, kvar, runs, zone, tallies);
}

/**
 * The months' figures from their tallies (fed with `kvar`); remembered as monthlyDemand's answer when `kvar` is
 * the series' own.
 */
export function monthlyDemandOf(
  series: IntervalSeries,
  kvar: Float64Array | null,
  runs: MonthRun[],
  zone: Zone,
  tallies: MonthTally[],
): MonthlyDemand[] {
  const hours = series.intervalMinutes / 60;
  const at = (i: number) => {
    const u = series.timestampsMs[i] as number;
    return isoWithOffset(u, zone.offsetMsAt(u));
  };
  const result = runs.map((run, k) => (tallies[k] as MonthTally).figures(run, hours, at));
  if (kvar !== null && kvar === series.kvar) demandCache.set(kvar, { runs, minutes: series.intervalMinutes, result: result.map((m) => ({ ...m })) });
  return result;
}

/** One month's running peaks and sums, fed its intervals in time order (kvar as given: measured or corrected). */
export class MonthTally {
  private peakKW = -Infinity;
  private peakKWi: number;
  private peakKWKvar = 0;
  private peakKVA = -Infinity;
  private peakKVAi: number;
  private kW = 0;
  private lag = 0;
  private lead = 0;

  constructor(start: number) {
    this.peakKWi = start;
    this.peakKVAi = start;
  }

  add(i: number, p: number, q: number): void {
    const s = Math.sqrt(p * p + q * q); // S = √(P² + Q²)
    if (p > this.peakKW) ((this.peakKW = p), (this.peakKWi = i), (this.peakKWKvar = q));
    if (s > this.peakKVA) ((this.peakKVA = s), (this.peakKVAi = i));
    this.kW += p;
    if (q > 0) this.lag += q;
    else this.lead -= q;
  }

  figures(run: MonthRun, hours: number, at: (i: number) => string): MonthlyDemand {
    const kWh = this.kW * hours;
    return {
      month: monthLabel(run.monthIndex),
      intervals: run.end - run.start,
      peakKW: this.peakKW,
      peakKWAt: at(this.peakKWi),
      peakKWKvar: this.peakKWKvar,
      peakKVA: this.peakKVA,
      peakKVAAt: at(this.peakKVAi),
      kWh,
      kvarhLagging: this.lag * hours,
      kvarhLeading: this.lead * hours,
      billingPF: billingPF(kWh, (this.lag - this.lead) * hours),
      billingPFLaggingOnly: billingPF(kWh, this.lag * hours),
    };
  }
}
