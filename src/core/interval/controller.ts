import { controllerResponseA } from "../bank/capacitor.js";
import { decideLevel, ruleSettings, SortedLevels, type ControllerOptions } from "../bank/controller-rule.js";
import type { CapacitorBank } from "./series-types.js";

export { CONTROLLER_RULE, DEFAULT_LEADING_LIMIT_PF, DEFAULT_RESPONSE_THRESHOLD, type ControllerOptions } from "../bank/controller-rule.js";
export const MAX_STEPS = 16;
const EPS = 1e-9;

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
  /** Switched kvar of a fresh decision (no dead band to hold in) for one interval of kW and kvar (before correction). */
  freshKvar(kW: number, kvar: number): number;
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

/** The PF controller over a bank's step combinations: the shared rule (bank/controller-rule.ts) picks the level, this picks the mask. */
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
  const levelOfMask = new Int32Array(count);
  for (const m of byValue) {
    const v = sumOfMask[m] as number;
    const lastSum = sums[sums.length - 1];
    if (lastSum !== undefined && Math.abs(v - lastSum) <= EPS * Math.max(1, v)) masksOfSum[masksOfSum.length - 1]!.push(m);
    else (sums.push(v), masksOfSum.push([m]));
    levelOfMask[m] = sums.length - 1;
  }
  const levels = new SortedLevels(Float64Array.from(sums));
  const rule = ruleSettings(targetPF, steps.length > 0 ? Math.min(...steps) : 0, opts);
  const memo = new Map<number, number>();
  const maskFor = (k: number, current: number): number => {
    const key = current * levels.count + k;
    let best = memo.get(key);
    if (best === undefined) {
      let fewest = Infinity;
      for (const m of masksOfSum[k] as number[]) {
        const changes = popcount(m ^ current);
        if (changes < fewest) ((fewest = changes), (best = m));
      }
      memo.set(key, best as number);
    }
    return best as number;
  };
  const kvarOfFloor = (x: number) => levels.kvarAt(Math.max(0, levels.firstAtLeast(x + EPS) - 1));
  return {
    fixedKvar: bank.fixedKvar,
    switchedKvar: (mask) => sumOfMask[mask] as number,
    largestAtMost: kvarOfFloor,
    leastAtLeast: (kvar) => levels.kvarAt(Math.min(levels.count - 1, levels.firstAtLeast(kvar - EPS))),
    thresholdKvar: rule.thresholdKvar,
    decide(kW, kvar, current) {
      const residual = kvar - bank.fixedKvar;
      const now = levelOfMask[current] as number;
      const k = decideLevel(levels, residual, kW, now, rule);
      return k === now ? current : maskFor(k, current);
    },
    freshKvar: (kW, kvar) => levels.kvarAt(decideLevel(levels, kvar - bank.fixedKvar, kW, -1, rule)),
  };
}

/** Controller C/k setting of a three-phase bank's smallest step, A (the formula lives in capacitor.ts). */
export function ckSettingA(smallestStepKvar: number, voltageV: number, ctRatio: number): number {
  return controllerResponseA(smallestStepKvar, voltageV, ctRatio);
}
