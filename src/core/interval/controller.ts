import { tanPhi } from "../conventions.js";
import { controllerResponseA } from "../bank/capacitor.js";
import type { CapacitorBank } from "./series-types.js";

/** Leading PF a controller may cause when switching in, by default (common practice, no source). */
export const DEFAULT_LEADING_LIMIT_PF = 0.98;
export const MAX_STEPS = 16;
const EPS = 1e-9;

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

export interface ControllerOptions {
  /** Leading PF the controller accepts (0.80–1; default 0.98): it never switches the site more leading than this. */
  leadingLimitPF?: number;
  /** Response threshold, a share 0–1 of the smallest step (default 0.65; 0 switches at the band edges exactly). */
  responseThreshold?: number;
}

export interface Controller {
  readonly fixedKvar: number;
  /** Switched kvar of a combination (bit i = step i on). */
  switchedKvar(mask: number): number;
  /** The combination for one interval of kW and kvar (before correction), given the one now switched in. */
  decide(kW: number, kvar: number, currentMask: number): number;
  /** The largest switched kvar any combination gives without exceeding `kvar` (0 when none does). */
  largestAtMost(kvar: number): number;
  /** The least switched kvar any combination gives of at least `kvar` (the largest when none does). */
  leastAtLeast(kvar: number): number;
  /** The response threshold in kvar (share × smallest step). */
  readonly thresholdKvar: number;
}

export function validateBank(bank: CapacitorBank): void {
  if (!(bank.fixedKvar >= 0 && Number.isFinite(bank.fixedKvar))) throw new RangeError("fixedKvar must be a finite number ≥ 0");
  if (bank.stepsKvar.length > MAX_STEPS) throw new RangeError(`at most ${MAX_STEPS} switched steps`);
  for (const s of bank.stepsKvar) if (!(s > 0 && Number.isFinite(s))) throw new RangeError("each step must be a finite kvar > 0");
}

function popcount(x: number): number {
  let c = 0;
  for (; x; c++) x &= x - 1;
  return c;
}

/** The PF controller as a pure decision function over precomputed step combinations. */
export function createController(bank: CapacitorBank, targetPF: number, opts: ControllerOptions = {}): Controller {
  validateBank(bank);
  const steps = bank.stepsKvar;
  const count = 1 << steps.length;
  const sumOfMask = new Float64Array(count);
  for (let m = 1; m < count; m++) {
    const low = 31 - Math.clz32(m & -m);
    sumOfMask[m] = (sumOfMask[m & (m - 1)] as number) + (steps[low] as number);
  }
  const byValue = Array.from({ length: count }, (_, m) => m).sort((a, b) => (sumOfMask[a] as number) - (sumOfMask[b] as number) || a - b);
  const sums: number[] = [];
  const masksOfSum: number[][] = [];
  for (const m of byValue) {
    const v = sumOfMask[m] as number;
    const lastSum = sums[sums.length - 1];
    if (lastSum !== undefined && Math.abs(v - lastSum) <= EPS * Math.max(1, v)) masksOfSum[masksOfSum.length - 1]!.push(m);
    else sums.push(v), masksOfSum.push([m]);
  }
  const distinct = Float64Array.from(sums);
  const tanTarget = tanPhi(targetPF);
  const tanLead = tanPhi(opts.leadingLimitPF ?? DEFAULT_LEADING_LIMIT_PF);
  const share = opts.responseThreshold ?? DEFAULT_RESPONSE_THRESHOLD;
  if (!(share >= 0 && share <= 1)) throw new RangeError("responseThreshold must be within 0–1");
  const threshold = steps.length > 0 ? share * Math.min(...steps) : 0;
  const memo = new Map<number, number>();
  const lowerBound = (x: number): number => {
    let lo = 0, hi = distinct.length;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if ((distinct[mid] as number) < x) lo = mid + 1;
      else hi = mid;
    }
    return lo;
  };
  const maskFor = (k: number, current: number): number => {
    const key = current * distinct.length + k;
    let best = memo.get(key);
    if (best === undefined) {
      let fewest = Infinity;
      for (const m of masksOfSum[k] as number[]) {
        const changes = popcount(m ^ current);
        if (changes < fewest) (fewest = changes), (best = m);
      }
      memo.set(key, best as number);
    }
    return best as number;
  };
  return {
    fixedKvar: bank.fixedKvar,
    switchedKvar: (mask) => sumOfMask[mask] as number,
    largestAtMost: (kvar) => distinct[Math.max(0, lowerBound(kvar + EPS) - 1)] as number,
    leastAtLeast: (kvar) => distinct[Math.min(distinct.length - 1, lowerBound(kvar - EPS))] as number,
    thresholdKvar: threshold,
    decide(kW, kvar, current) {
      const residual = kvar - bank.fixedKvar;
      const ceiling = residual + kW * tanLead + EPS; // most switched kvar without leading beyond the limit
      const now = sumOfMask[current] as number;
      const left = residual - now; // kvar left with the present steps
      // inside the dead band (target to unity, ± the response threshold) and within the leading limit: hold
      if (now <= ceiling && left <= kW * tanTarget + threshold + EPS && left >= -threshold - EPS) return current;
      let k = lowerBound(residual - kW * tanTarget - EPS); // least switched kvar reaching the target
      if (k >= distinct.length || (distinct[k] as number) > ceiling) k = Math.max(0, lowerBound(ceiling + EPS) - 1);
      while (k > 0 && (distinct[k] as number) > ceiling) k--;
      return maskFor(k, current);
    },
  };
}

/** Controller C/k setting of a three-phase bank's smallest step, A (the formula lives in capacitor.ts). */
export function ckSettingA(smallestStepKvar: number, voltageV: number, ctRatio: number): number {
  return controllerResponseA(smallestStepKvar, voltageV, ctRatio);
}
