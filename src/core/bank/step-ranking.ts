/**
 * A small PF-controller simulation used to rank step plans: per sample the controller switches the step combination
 * whose kvar brings the PF closest to the target without leading. Deliberately simple (no time delays, no hysteresis,
 * no wear rotation); the interval-analysis module has the fuller controller simulation.
 */

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
  /** kvar still needed to reach the target after the fixed part (may be ≤ 0). */
  toTargetKvar: Float64Array;
  /** kvar that can be added before the site leads (Q − fixed). */
  toUnityKvar: Float64Array;
  /** 1 for the samples within the design coverage. */
  covered: Uint8Array;
}

export interface SimulationResult {
  samples: number;
  metCount: number;
  coveredCount: number;
  metCoveredCount: number;
  /** Sum over consecutive samples of the steps whose state changes. */
  switchingOperations: number;
}

/** Tolerance on kvar comparisons, kvar. */
const EPS = 1e-6;

/**
 * Number of base multiples k the controller switches in: the least k·b reaching the target if that does not lead,
 * otherwise the most k·b that does not lead (the PF nearest the target from below).
 */
export function controllerMultiple(toTargetKvar: number, toUnityKvar: number, baseKvar: number, kMax: number): number {
  if (toTargetKvar <= EPS) return 0;
  let k = Math.min(kMax, Math.ceil((toTargetKvar - EPS) / baseKvar));
  if (k * baseKvar > toUnityKvar + EPS) k = Math.max(0, Math.min(kMax, Math.floor((toUnityKvar + EPS) / baseKvar)));
  return k;
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

/** Simulate one step program (n steps, base kvar) over all samples. `trace`, when given, receives k per sample. */
export function simulateStepProgram(
  ratio: StepRatio,
  n: number,
  baseKvar: number,
  s: ControllerSamples,
  trace?: Int32Array,
): SimulationResult {
  const kMax = n === 0 ? 0 : maxMultiple(ratio, n);
  const code = RATIO_CODE[ratio];
  const { toTargetKvar, toUnityKvar, covered: cov } = s;
  const len = toTargetKvar.length;
  let met = 0;
  let covered = 0;
  let metCovered = 0;
  let ops = 0;
  let prev = 0;
  for (let i = 0; i < len; i++) {
    const need = toTargetKvar[i] as number;
    const room = toUnityKvar[i] as number;
    let k = 0;
    if (kMax > 0 && need > EPS) {
      // inline controllerMultiple: least k·b reaching the target, else the most that does not lead
      k = Math.ceil((need - EPS) / baseKvar);
      if (k > kMax) k = kMax;
      if (k * baseKvar > room + EPS) {
        k = Math.floor((room + EPS) / baseKvar);
        if (k > kMax) k = kMax;
        if (k < 0) k = 0;
      }
    }
    const c = k * baseKvar;
    const ok = need - c <= EPS && c <= room + EPS ? 1 : 0;
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
