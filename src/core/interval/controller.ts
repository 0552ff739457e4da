import { controllerResponseA } from "../bank/capacitor.js";
import { decideLevel, ruleSettings, SortedLevels, type ControllerOptions, type RuleSettings } from "../bank/controller-rule.js";
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
  if (!(bank.fixedKvar >= 0 && Number.isFinite(bank.fixedKvar))) throw new RangeError("fixedKvar must be a finite number >= 0");
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
  return new StepController(bank, targetPF, opts);
}

/**
 * A class rather than an object of closures: every controller then shares its methods, so the simulation's
 * compiled loop, which calls decide() per interval, stays valid from one simulation to the next (a new closure
 * per controller is a new call target, and the compiled loop would be thrown away and compiled again).
 */
class StepController implements Controller {
  readonly fixedKvar: number;
  readonly thresholdKvar: number;
  private readonly sumOfMask: Float64Array;
  private readonly masksOfSum: number[][];
  private readonly levelOfMask: Int32Array;
  private readonly levels: SortedLevels;
  private readonly rule: RuleSettings;
  private readonly memo = new Map<number, number>();

  constructor(bank: CapacitorBank, targetPF: number, opts: ControllerOptions) {
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
    this.fixedKvar = bank.fixedKvar;
    this.sumOfMask = sumOfMask;
    this.masksOfSum = masksOfSum;
    this.levelOfMask = levelOfMask;
    this.levels = new SortedLevels(Float64Array.from(sums));
    this.rule = ruleSettings(targetPF, steps.length > 0 ? Math.min(...steps) : 0, opts);
    this.thresholdKvar = this.rule.thresholdKvar;
  }

  switchedKvar(mask: number): number {
    return this.sumOfMask[mask] as number;
  }

  largestAtMost(kvar: number): number {
    const levels = this.levels;
    return levels.kvarAt(Math.max(0, levels.firstAtLeast(kvar + EPS) - 1));
  }

  leastAtLeast(kvar: number): number {
    const levels = this.levels;
    return levels.kvarAt(Math.min(levels.count - 1, levels.firstAtLeast(kvar - EPS)));
  }

  decide(kW: number, kvar: number, current: number): number {
    const residual = kvar - this.fixedKvar;
    const now = this.levelOfMask[current] as number;
    const k = decideLevel(this.levels, residual, kW, now, this.rule);
    return k === now ? current : this.maskFor(k, current);
  }

  freshKvar(kW: number, kvar: number): number {
    return this.levels.kvarAt(decideLevel(this.levels, kvar - this.fixedKvar, kW, -1, this.rule));
  }

  /** Among the combinations of level k, the one needing the fewest step changes from `current` (memoised). */
  private maskFor(k: number, current: number): number {
    const key = current * this.levels.count + k;
    let best = this.memo.get(key);
    if (best === undefined) {
      let fewest = Infinity;
      for (const m of this.masksOfSum[k] as number[]) {
        const changes = popcount(m ^ current);
        if (changes < fewest) ((fewest = changes), (best = m));
      }
      this.memo.set(key, best as number);
    }
    return best as number;
  }
}

/** Controller C/k setting of a three-phase bank's smallest step, A (the formula lives in capacitor.ts). */
export function ckSettingA(smallestStepKvar: number, voltageV: number, ctRatio: number): number {
  return controllerResponseA(smallestStepKvar, voltageV, ctRatio);
}
