/** The site's reactive demand as samples: interval data, or the survey reading with an optional light-load reading. */
import { tanPhi } from "../conventions.js";
import { neededKvarAt } from "../interval/need-curve.js";
import type { InputIssue } from "../warnings.js";

export interface DemandPoint {
  kW: number;
  /** Signed: > 0 lagging. */
  kvar: number;
}

/** Column form of interval data (what a parser of 35 040 quarter-hours naturally holds). */
export interface DemandColumns {
  kW: ArrayLike<number>;
  kvar: ArrayLike<number>;
}

export type ReactiveDemand =
  | { kind: "intervals"; samples: readonly DemandPoint[] | DemandColumns; intervalMinutes?: number }
  | { kind: "readings"; survey: DemandPoint; lightLoad?: DemandPoint };

export type DemandSource = "intervals" | "survey_and_light_load" | "survey_only";

export interface DemandArrays {
  kW: Float64Array;
  kvar: Float64Array;
  source: DemandSource;
  intervalMinutes?: number;
}

function isColumns(s: readonly DemandPoint[] | DemandColumns): s is DemandColumns {
  return !Array.isArray(s);
}

/**
 * Copy the demand into typed arrays, less `localCorrectionKvar` (capacitors already placed at terminals or groups,
 * subtracted from every sample: exact while their loads run, and on the safe side — less fixed kvar — when they stop).
 */
export function demandArrays(demand: ReactiveDemand, localCorrectionKvar = 0, path = "demand"): { arrays?: DemandArrays; issues: InputIssue[] } {
  const issues: InputIssue[] = [];
  let kW: Float64Array;
  let kvar: Float64Array;
  let source: DemandSource;
  if (demand.kind === "intervals") {
    const s = demand.samples;
    const n = isColumns(s) ? Math.min(s.kW.length, s.kvar.length) : s.length;
    kW = new Float64Array(n);
    kvar = new Float64Array(n);
    if (isColumns(s)) {
      if (s.kW.length !== s.kvar.length) issues.push({ path: [path, "samples"], message: "kW and kvar columns differ in length" });
      for (let i = 0; i < n; i++) {
        kW[i] = s.kW[i] as number;
        kvar[i] = s.kvar[i] as number;
      }
    } else {
      for (let i = 0; i < n; i++) {
        const p = s[i] as DemandPoint;
        kW[i] = p.kW;
        kvar[i] = p.kvar;
      }
    }
    if (n === 0) issues.push({ path: [path, "samples"], message: "interval data has no samples" });
    source = "intervals";
  } else {
    const pts = demand.lightLoad ? [demand.survey, demand.lightLoad] : [demand.survey];
    kW = Float64Array.from(pts, (p) => p.kW);
    kvar = Float64Array.from(pts, (p) => p.kvar);
    source = demand.lightLoad ? "survey_and_light_load" : "survey_only";
  }
  for (let i = 0; i < kW.length; i++) {
    if (!Number.isFinite(kW[i] as number) || !Number.isFinite(kvar[i] as number)) {
      issues.push({
        path: [path, demand.kind === "intervals" ? "samples" : i === 0 ? "survey" : "lightLoad", ...(demand.kind === "intervals" ? [i] : [])],
        message: "kW and kvar must be finite numbers",
      });
      break;
    }
    kvar[i] = (kvar[i] as number) - localCorrectionKvar;
  }
  if (issues.length > 0) return { issues };
  const arrays: DemandArrays = { kW, kvar, source };
  if (demand.kind === "intervals" && demand.intervalMinutes !== undefined) arrays.intervalMinutes = demand.intervalMinutes;
  return { arrays, issues };
}

/** kvar each sample needs to reach the target: max(0, Q − P·tan(acos PF_target)) (power-triangle method). */
export function neededKvar(d: DemandArrays, targetPF: number): Float64Array {
  const t = tanPhi(targetPF);
  const out = new Float64Array(d.kW.length);
  for (let i = 0; i < out.length; i++) out[i] = neededKvarAt(d.kW[i] as number, d.kvar[i] as number, t);
  return out;
}

export function minOf(values: Float64Array): number {
  let m = Number.POSITIVE_INFINITY;
  for (let i = 0; i < values.length; i++) if ((values[i] as number) < m) m = values[i] as number;
  return m;
}

/** Without light-load information, the fixed part is held to this share of the transformer kVA (rule of thumb, no source). */
export const FIXED_SHARE_WITHOUT_LIGHT_LOAD = 0.05;

export interface FixedPart {
  fixedKvar: number;
  /** The cap the fixed part was held under. */
  capKvar: number;
  basis: string;
  lightLoadKnown: boolean;
}

/**
 * Fixed part: never more than the minimum reactive demand (so the site never leads at light load), nor more than the
 * need at coverage; the largest single standard unit under that cap, or 0.
 */
export function chooseFixedPart(
  d: DemandArrays,
  needAtCoverageKvar: number,
  unitSizesKvar: readonly number[],
  transformerKVA?: number,
  shareWithoutLightLoad = FIXED_SHARE_WITHOUT_LIGHT_LOAD,
): FixedPart {
  let cap: number;
  let basis: string;
  const lightLoadKnown = d.source !== "survey_only";
  const minQ = minOf(d.kvar);
  if (lightLoadKnown) {
    cap = Math.min(minQ, needAtCoverageKvar);
    basis = `the minimum reactive demand ${minQ.toFixed(1)} kvar ${d.source === "intervals" ? "over the interval data" : "of the light-load reading"}`;
  } else if (transformerKVA !== undefined) {
    const byShare = shareWithoutLightLoad * transformerKVA;
    cap = Math.min(byShare, minQ, needAtCoverageKvar);
    basis = `${(shareWithoutLightLoad * 100).toFixed(0)} % of the ${transformerKVA} kVA transformer (${byShare.toFixed(1)} kvar; rule of thumb without light-load data)`;
  } else {
    cap = 0;
    basis = "no light-load information and no transformer rating: no fixed part";
  }
  let fixed = 0;
  for (const s of unitSizesKvar) if (s <= cap + 1e-9 && s > fixed) fixed = s;
  return { fixedKvar: fixed, capKvar: Math.max(0, cap), basis, lightLoadKnown };
}
