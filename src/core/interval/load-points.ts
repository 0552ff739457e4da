import type { IntervalSeries, LoadPoints } from "./series-types.js";

export const LOAD_POINT_KW_BINS = 16;
export const LOAD_POINT_KVAR_BINS = 24;
/** A month's own kW × kvar grid is coarser: twelve of them are stored with a summary (see summary.ts). */
export const MONTH_POINT_KW_BINS = 10;
export const MONTH_POINT_KVAR_BINS = 12;

/**
 * A kW × kvar histogram over [0, pMax] × [qMin, qMax], fed interval by interval: each non-empty cell keeps its
 * count and the sums that give its mean kW and kvar.
 */
export class LoadPointGrid {
  private readonly count: Float64Array;
  private readonly sumP: Float64Array;
  private readonly sumQ: Float64Array;
  private readonly pScale: number;
  private readonly qScale: number;

  /** pMax, qMin, qMax: the exact largest kW (0 if none is positive) and the least and largest kvar fed. */
  constructor(
    private readonly kWBins: number,
    private readonly kvarBins: number,
    pMax: number,
    private readonly qMin: number,
    qMax: number,
  ) {
    const cells = kWBins * kvarBins;
    this.count = new Float64Array(cells);
    this.sumP = new Float64Array(cells);
    this.sumQ = new Float64Array(cells);
    const finite = (x: number) => (Number.isFinite(x) ? x : 0); // a subnormal range would give ∞ · 0 = NaN
    this.pScale = pMax > 0 ? finite(kWBins / pMax) : 0;
    this.qScale = qMax > qMin ? finite(kvarBins / (qMax - qMin)) : 0;
  }

  add(p: number, q: number): void {
    const a = Math.min(this.kWBins - 1, Math.floor(p * this.pScale));
    const b = Math.min(this.kvarBins - 1, Math.floor((q - this.qMin) * this.qScale));
    const c = a * this.kvarBins + b;
    this.count[c]!++;
    this.sumP[c]! += p;
    this.sumQ[c]! += q;
  }

  /** The means and counts of the non-empty cells, kW-major. */
  points(): LoadPoints {
    const out: LoadPoints = { kWBins: this.kWBins, kvarBins: this.kvarBins, kW: [], kvar: [], count: [] };
    for (let c = 0; c < this.count.length; c++) {
      const k = this.count[c] as number;
      if (k === 0) continue;
      out.kW.push((this.sumP[c] as number) / k);
      out.kvar.push((this.sumQ[c] as number) / k);
      out.count.push(k);
    }
    return out;
  }
}

/**
 * Mean kW and kvar of the non-empty cells of a kW × kvar histogram (enough to re-estimate a controller), over the
 * intervals start…end − 1 (the whole series by default).
 */
export function loadPointsOf(
  series: IntervalSeries,
  kWBins = LOAD_POINT_KW_BINS,
  kvarBins = LOAD_POINT_KVAR_BINS,
  start = 0,
  end = series.length,
): LoadPoints {
  let pMax = 0,
    qMin = Infinity,
    qMax = -Infinity;
  for (let i = start; i < end; i++) {
    const p = series.kW[i] as number,
      q = series.kvar[i] as number;
    if (p > pMax) pMax = p;
    if (q < qMin) qMin = q;
    if (q > qMax) qMax = q;
  }
  const grid = new LoadPointGrid(kWBins, kvarBins, pMax, qMin, qMax);
  for (let i = start; i < end; i++) grid.add(series.kW[i] as number, series.kvar[i] as number);
  return grid.points();
}
