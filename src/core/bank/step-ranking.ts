/**
 * Step programs (multiples of a base step) and their simulation under the controller rule (controller-rule.ts) to
 * rank them: the same dead band, response threshold and leading limit as the interval simulation, over the
 * arithmetic levels k × base that every multiples program reaches.
 */
import { decideLevel, meetsRule, MultipleLevels, type RuleSettings } from "./controller-rule.js";

/** Step ratio programs: 1:1:1… equal steps; 1:2:2… one single then doubles; 1:2:4… one, one double, then quadruples. */
export type StepRatio = "1:1:1" | "1:2:2" | "1:2:4";
export const STEP_RATIOS: readonly StepRatio[] = ["1:1:1", "1:2:2", "1:2:4"];

/** Multipliers of the base (smallest) step for a program with n steps. */
export function stepMultipliers(ratio: StepRatio, n: number): number[] {
  const out = new Array<number>(n);
  for (let i = 0; i < n; i++) out[i] = multiplierAt(ratio, i);
  return out;
}

/** The i-th step's multiple: 1:1:1 → 1, 1, 1…; 1:2:2 → 1, 2, 2…; 1:2:4 → 1, 2, 4, 4…. */
function multiplierAt(ratio: StepRatio, i: number): number {
  if (ratio === "1:1:1" || i === 0) return 1;
  if (ratio === "1:2:2" || i === 1) return 2;
  return 4;
}

/** Largest multiple of the base the program reaches (all multiples 0…K are reachable with these programs). */
export function maxMultiple(ratio: StepRatio, n: number): number {
  let k = 0;
  for (let i = 0; i < n; i++) k += multiplierAt(ratio, i);
  return k;
}

/** Per-sample quantities after the fixed part, as typed arrays. */
export interface ControllerSamples {
  kW: Float64Array;
  /** kvar before the switched steps: the sample's kvar less the fixed part (may be ≤ 0). */
  residualKvar: Float64Array;
  /** 1 for the samples within the design coverage. */
  covered: Uint8Array;
}

export interface SimulationResult {
  samples: number;
  /** Samples whose kvar left meets the target without leading beyond the limit. */
  metCount: number;
  coveredCount: number;
  metCoveredCount: number;
  /** Sum over consecutive samples of the steps whose state changes. */
  switchingOperations: number;
}

/** Steps changing state between two multiples, each step combination being the program's unique one for k. */
export function switchingOperations(ratio: StepRatio, a: number, b: number): number {
  return operationsByCode(RATIO_CODE[ratio], a, b);
}

const RATIO_CODE: Record<StepRatio, number> = { "1:1:1": 0, "1:2:2": 1, "1:2:4": 2 };

function operationsByCode(code: number, a: number, b: number): number {
  if (a === b) return 0;
  if (code === 0) return Math.abs(a - b);
  // 1:2:2: the single step is bit 0, the rest are doubles; 1:2:4: bits 0 and 1 are the single and double, the rest quadruples.
  if (code === 1) return ((a ^ b) & 1) + Math.abs((a >> 1) - (b >> 1));
  const x = (a ^ b) & 3;
  return (x & 1) + (x >> 1) + Math.abs((a >> 2) - (b >> 2));
}

/**
 * Simulate one step program (n steps, base kvar) over the samples in their order, starting with all steps off,
 * under the controller rule with `rule`'s target, leading limit and threshold. `trace`, when given, receives k per sample.
 */
export function simulateStepProgram(
  ratio: StepRatio,
  n: number,
  baseKvar: number,
  s: ControllerSamples,
  rule: RuleSettings,
  trace?: Int32Array,
): SimulationResult {
  const levels = new MultipleLevels(baseKvar, n === 0 ? 0 : maxMultiple(ratio, n));
  const code = RATIO_CODE[ratio];
  const { kW, residualKvar, covered: cov } = s;
  const len = kW.length;
  let met = 0;
  let covered = 0;
  let metCovered = 0;
  let ops = 0;
  let prev = 0;
  for (let i = 0; i < len; i++) {
    const p = kW[i] as number;
    const q = residualKvar[i] as number;
    const k = decideLevel(levels, q, p, prev, rule);
    const ok = meetsRule(q - k * baseKvar, p, rule) ? 1 : 0;
    met += ok;
    if (cov[i] === 1) {
      covered++;
      metCovered += ok;
    }
    if (i > 0 && k !== prev) ops += operationsByCode(code, prev, k);
    prev = k;
    if (trace) trace[i] = k;
  }
  return { samples: len, metCount: met, coveredCount: covered, metCoveredCount: metCovered, switchingOperations: ops };
}
