/**
 * The PF controller's switching rule, written once. The step search ranks step programs with it, the interval
 * simulation runs it over a series, and the economics prices what it leaves. It decides among the switchable
 * levels of a bank (the distinct kvar its step combinations give), so one function serves both the arithmetic
 * levels of the multiples programs (k × base) and the sorted sums of arbitrary steps.
 */
import { tanPhi } from "../conventions.js";

/** Leading PF a controller may cause when switching in, by default (common practice, no source). */
export const DEFAULT_LEADING_LIMIT_PF = 0.98;

/** Response threshold as a share of the smallest step, by default (controller makers' ≈ 2/3 of C/k; common practice, no source). */
export const DEFAULT_RESPONSE_THRESHOLD = 0.65;

export const CONTROLLER_RULE =
  "each interval the controller keeps the steps in service while the kvar left lies in its dead band: from the " +
  "target PF (lagging) to unity, widened on both sides by the response threshold (a share of the smallest step), and " +
  "never leading beyond the leading limit. Outside it the controller picks, among all combinations of steps (best " +
  "combination, not in order), the least switched kvar that reaches the target without leading beyond the limit, or " +
  "when none does, the most kvar within the limit. Among combinations of equal kvar it takes the one needing the " +
  "fewest step changes. Switching and discharge delays are ignored at the interval resolution; the fixed kvar is " +
  "always connected and the steps deliver their rated kvar.";

/** Tolerance on kvar comparisons, kvar. */
export const RULE_EPS_KVAR = 1e-9;

export interface ControllerOptions {
  /** Leading PF the controller accepts (0.80–1; default 0.98): it never switches the site more leading than this. */
  leadingLimitPF?: number;
  /** Response threshold, a share 0–1 of the smallest step (default 0.65; 0 switches at the band edges exactly). */
  responseThreshold?: number;
}

/** The switchable kvar levels of a bank, ascending, level 0 = nothing switched. */
export interface LevelSet {
  readonly count: number;
  kvarAt(level: number): number;
  /** The first level whose kvar is ≥ kvarFloor (count when none is). */
  firstAtLeast(kvarFloor: number): number;
}

/** The rule's settings in the form the decision uses. */
export interface RuleSettings {
  tanTarget: number;
  tanLead: number;
  thresholdKvar: number;
  leadingLimitPF: number;
}

export function ruleSettings(targetPF: number, smallestStepKvar: number, opts: ControllerOptions = {}): RuleSettings {
  const leadingLimitPF = opts.leadingLimitPF ?? DEFAULT_LEADING_LIMIT_PF;
  const share = opts.responseThreshold ?? DEFAULT_RESPONSE_THRESHOLD;
  if (!(share >= 0 && share <= 1)) throw new RangeError("responseThreshold must be within 0 to 1");
  return {
    tanTarget: tanPhi(targetPF),
    tanLead: tanPhi(leadingLimitPF),
    thresholdKvar: smallestStepKvar > 0 ? share * smallestStepKvar : 0,
    leadingLimitPF,
  };
}

/**
 * The level switched for one interval (see CONTROLLER_RULE). `residualKvar` is the kvar before the switched steps
 * (the load's kvar less the fixed part); `current` the level now in service, or −1 for a fresh decision (no dead
 * band to hold in: the controller just woke, or the time order is unknown).
 */
export function decideLevel(levels: LevelSet, residualKvar: number, kW: number, current: number, s: RuleSettings): number {
  const ceiling = residualKvar + kW * s.tanLead + RULE_EPS_KVAR; // most switched kvar without leading beyond the limit
  const targetLeft = kW * s.tanTarget; // kvar left at the target PF
  if (current >= 0) {
    const now = levels.kvarAt(current);
    const left = residualKvar - now;
    // inside the dead band (target to unity, ± the response threshold) and within the leading limit: hold
    if (now <= ceiling && left <= targetLeft + s.thresholdKvar + RULE_EPS_KVAR && left >= -s.thresholdKvar - RULE_EPS_KVAR) return current;
  }
  let k = levels.firstAtLeast(residualKvar - targetLeft - RULE_EPS_KVAR); // least switched kvar reaching the target
  if (k >= levels.count || levels.kvarAt(k) > ceiling) k = levels.firstAtLeast(ceiling + RULE_EPS_KVAR) - 1; // most within the limit
  if (k > levels.count - 1) k = levels.count - 1;
  while (k > 0 && levels.kvarAt(k) > ceiling) k--;
  return k < 0 ? 0 : k;
}

/** True when the kvar left meets the target without leading beyond the limit. */
export function meetsRule(leftKvar: number, kW: number, s: RuleSettings): boolean {
  return leftKvar <= kW * s.tanTarget + RULE_EPS_KVAR && leftKvar >= -kW * s.tanLead - RULE_EPS_KVAR;
}

/** The levels 0, b, 2b … K·b of the multiples programs (every multiple is reachable: see step-ranking.ts). */
export class MultipleLevels implements LevelSet {
  readonly count: number;
  constructor(
    readonly baseKvar: number,
    maxMultiple: number,
  ) {
    this.count = maxMultiple + 1;
  }
  kvarAt(level: number): number {
    return level * this.baseKvar;
  }
  firstAtLeast(kvarFloor: number): number {
    if (kvarFloor <= 0) return 0;
    const k = Math.ceil(kvarFloor / this.baseKvar);
    return k < this.count ? k : this.count;
  }
}

/** The distinct sums of arbitrary steps, ascending. */
export class SortedLevels implements LevelSet {
  readonly count: number;
  constructor(private readonly sums: Float64Array) {
    this.count = sums.length;
  }
  kvarAt(level: number): number {
    return this.sums[level] as number;
  }
  firstAtLeast(kvarFloor: number): number {
    let lo = 0,
      hi = this.sums.length;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if ((this.sums[mid] as number) < kvarFloor) lo = mid + 1;
      else hi = mid;
    }
    return lo;
  }
}
