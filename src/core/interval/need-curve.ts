/** The kvar needed to reach a target PF, as a duration curve, from load points weighted by their interval counts. */
import { tanPhi } from "../conventions.js";
import { CURVE_PERCENTILES } from "./percentiles.js";

export interface WeightedLoadPoints {
  kW: readonly number[];
  kvar: readonly number[];
  count: readonly number[];
}

export interface NeedCurve {
  /** Share of intervals needing at least this kvar, percent, 0 (the worst interval) to 100. */
  exceedancePct: number[];
  neededKvar: number[];
}

/** Needed kvar of one interval: max(0, Q − P·tan φ_target) (power-triangle method); tan φ_target = tanPhi(targetPF). */
export function neededKvarAt(kW: number, kvar: number, tanTarget: number): number {
  return Math.max(0, kvar - kW * tanTarget);
}

/**
 * The needed-kvar duration curve at the standard curve percentiles: the value at exceedance e is the smallest need
 * reached or exceeded in at least e % of the intervals (the weighted nearest-rank rule, as the demand curve uses).
 */
export function neededKvarCurve(points: WeightedLoadPoints, targetPF: number): NeedCurve {
  const t = tanPhi(targetPF);
  const needs = points.kW.map((kW, i) => ({ need: neededKvarAt(kW, points.kvar[i] as number, t), n: Math.max(0, points.count[i] as number) }));
  needs.sort((a, b) => b.need - a.need);
  const total = needs.reduce((s, x) => s + x.n, 0);
  const exceedancePct: number[] = [];
  const neededKvar: number[] = [];
  if (total === 0) return { exceedancePct, neededKvar };
  for (const e of CURVE_PERCENTILES) {
    // the first point (in falling need) at which the cumulative count reaches e % of the intervals
    const rank = Math.max(1, Math.ceil((e / 100) * total - 1e-9));
    let cum = 0;
    let value = needs[needs.length - 1]?.need ?? 0;
    for (const x of needs) {
      cum += x.n;
      if (cum >= rank) {
        value = x.need;
        break;
      }
    }
    exceedancePct.push(e);
    neededKvar.push(value);
  }
  return { exceedancePct, neededKvar };
}

/** Share of intervals, percent, whose need the kvar covers (need ≤ kvar). */
export function coveredSharePct(points: WeightedLoadPoints, targetPF: number, kvar: number): number {
  const t = tanPhi(targetPF);
  let covered = 0;
  let total = 0;
  points.kW.forEach((kW, i) => {
    const n = Math.max(0, points.count[i] as number);
    total += n;
    if (neededKvarAt(kW, points.kvar[i] as number, t) <= kvar + 1e-9) covered += n;
  });
  return total > 0 ? (covered / total) * 100 : 100;
}
