/** Fixed part and switched steps of a bank, chosen by simulating a controller over the reactive-demand samples. */
import { controllerResponseA } from "./capacitor.js";
import { STANDARD_UNIT_KVAR } from "./standard-sizes.js";
import { baseLadder } from "./step-bases.js";
import { warning, type Warning } from "../warnings.js";
import { chooseFixedPart, neededKvar, type DemandArrays, type FixedPart } from "./demand.js";
import { percentileOf } from "../interval/percentiles.js";
import { DEFAULT_RESPONSE_THRESHOLD, ruleSettings, type ControllerOptions, type RuleSettings } from "./controller-rule.js";
import { simulateStepProgram, STEP_RATIOS, stepMultipliers, type SimulationResult, type StepRatio } from "./step-ranking.js";

export interface StepSearchOptions {
  /** Share of samples whose need the bank is sized for (default 0.99: the 99th-percentile need). */
  coverage?: number;
  minSteps?: number;
  maxSteps?: number;
  ratios?: readonly StepRatio[];
  /** Candidates whose met count is within this share of the samples of the best count rank as tied (default 0). */
  metTieShare?: number;
  /** Fixed-part share of the transformer kVA when there is no light-load information (default 0.05). */
  fixedShareWithoutLightLoad?: number;
  /** Leading limit and response threshold of the controller the programs are ranked under (defaults: controller-rule.ts). */
  controller?: ControllerOptions;
  /**
   * Delivered kvar of an installed automatic bank's step: a program on that base wins a tie on met samples, so the
   * new steps match the old (one spare size, even switching under one controller). Own rule, no source.
   */
  preferredBaseKvar?: number;
}

export interface StepsInput {
  demand: DemandArrays;
  targetPF: number;
  /** Nameplate sizes at the capacitor's rated voltage. */
  unitSizesKvar?: readonly number[];
  /**
   * kvar one nameplate kvar delivers at the bus: (V/V_r)²·(f/f_r)/(1 − p) (default 1). The plan's kvar are all
   * delivered kvar, each step a standard nameplate (or several of the largest in parallel) times this factor.
   */
  deliveredPerNameplate?: number;
  transformerKVA?: number;
  options?: StepSearchOptions;
}

export interface StepCandidate {
  ratio: StepRatio;
  stepCount: number;
  baseKvar: number;
  stepsKvar: number[];
  totalKvar: number;
  rounding: "up" | "down" | "none";
  simulation: SimulationResult;
}

export interface StepPlan {
  source: DemandArrays["source"];
  samples: number;
  coverage: number;
  /** Need at the coverage percentile, before the fixed part. */
  needAtCoverageKvar: number;
  maxNeedKvar: number;
  minReactiveKvar: number;
  fixed: FixedPart;
  /** Need at coverage less the fixed part. */
  switchedNeededKvar: number;
  /** null: the fixed part alone (or nothing) is the plan. */
  switched: StepCandidate | null;
  candidatesEvaluated: number;
  metShare: number;
  metCoveredShare: number;
  switchingOperations: number;
  switchingOperationsPerDay: number | null;
  notes: string[];
  warnings: Warning[];
}

export const DEFAULT_COVERAGE = 0.99;
export const DEFAULT_MIN_STEPS = 3;
export const DEFAULT_MAX_STEPS = 12;

type Ranked = Pick<StepCandidate, "stepCount" | "baseKvar" | "totalKvar" | "simulation">;

function better(a: Ranked, b: Ranked, tie: number, preferredBaseKvar?: number): boolean {
  const dm = a.simulation.metCoveredCount - b.simulation.metCoveredCount;
  if (Math.abs(dm) > tie) return dm > 0;
  if (preferredBaseKvar !== undefined && a.stepCount > 0 && b.stepCount > 0) {
    const aPref = Math.abs(a.baseKvar - preferredBaseKvar) <= 1e-6 * preferredBaseKvar;
    const bPref = Math.abs(b.baseKvar - preferredBaseKvar) <= 1e-6 * preferredBaseKvar;
    if (aPref !== bPref) return aPref;
  }
  if (a.stepCount !== b.stepCount) return a.stepCount < b.stepCount;
  if (a.simulation.switchingOperations !== b.simulation.switchingOperations)
    return a.simulation.switchingOperations < b.simulation.switchingOperations;
  if (Math.abs(a.totalKvar - b.totalKvar) > 1e-9) return a.totalKvar < b.totalKvar;
  if (a.simulation.metCount !== b.simulation.metCount) return a.simulation.metCount > b.simulation.metCount;
  return a.baseKvar < b.baseKvar - 1e-9;
}

/**
 * Search space: for each ratio and each step count n in [minSteps, maxSteps], the smallest base whose program total
 * reaches the switched need (round up) and the largest below it (round down); every step a size from baseLadder (step-bases.ts);
 * plus the fixed-only plan. Rank: most covered samples meeting the target, then fewest steps, then fewest
 * switching operations, then least installed kvar, then most samples met overall, then the finer smallest step.
 */
export function planSteps(input: StepsInput): StepPlan {
  const o = input.options ?? {};
  const coverage = o.coverage ?? DEFAULT_COVERAGE;
  const minSteps = o.minSteps ?? DEFAULT_MIN_STEPS;
  const maxSteps = o.maxSteps ?? DEFAULT_MAX_STEPS;
  const perNameplate = input.deliveredPerNameplate ?? 1;
  const nameplateUnits = input.unitSizesKvar ?? STANDARD_UNIT_KVAR;
  // Every figure below is delivered kvar; a product by a power of two (the 1:2:4 multiples) stays exact in floating point.
  const units = perNameplate === 1 ? nameplateUnits : nameplateUnits.map((u) => u * perNameplate);
  const d = input.demand;
  const n = d.kW.length;
  const warnings: Warning[] = [];
  const notes: string[] = [];

  const need = neededKvar(d, input.targetPF);
  const needAtCoverage = percentileOf(need, coverage * 100);
  let maxNeed = 0;
  let minQ = Number.POSITIVE_INFINITY;
  for (let i = 0; i < n; i++) {
    maxNeed = Math.max(maxNeed, need[i] as number);
    minQ = Math.min(minQ, d.kvar[i] as number);
  }
  const fixed = chooseFixedPart(d, needAtCoverage, units, input.transformerKVA, o.fixedShareWithoutLightLoad);
  // Only when there is a bank to design: no warning about a fixed part that is not designed.
  if (!fixed.lightLoadKnown && needAtCoverage > 0) {
    warnings.push(
      warning(
        "light_load_unknown",
        `without a light-load reading or interval data the fixed part is limited by a rule of thumb (${fixed.basis}); take a reading at the lightest load (nights, weekends) or log interval data so the fixed part can be sized to the minimum reactive demand`,
        "demand",
      ),
    );
  }
  const switchedNeeded = Math.max(0, needAtCoverage - fixed.fixedKvar);

  const kWs = Float64Array.from(d.kW);
  const residual = new Float64Array(n);
  const covered = new Uint8Array(n);
  for (let i = 0; i < n; i++) {
    residual[i] = (d.kvar[i] as number) - fixed.fixedKvar;
    covered[i] = (need[i] as number) <= needAtCoverage + 1e-9 ? 1 : 0;
  }
  const samples = { kW: kWs, residualKvar: residual, covered };
  // The rule's threshold is a share of the smallest step, the program's base; the rest of the rule is the same for
  // every candidate, so it is worked out once.
  const rule0 = ruleSettings(input.targetPF, 0, o.controller);
  const share = o.controller?.responseThreshold ?? DEFAULT_RESPONSE_THRESHOLD;
  const ruleFor = (baseKvar: number): RuleSettings => (baseKvar > 0 ? { ...rule0, thresholdKvar: share * baseKvar } : rule0);

  const tie = (o.metTieShare ?? 0) * n;
  // The fixed-only plan first; each candidate then replaces the best so far when better (the ranking's order).
  let best: Omit<StepCandidate, "stepsKvar"> = {
    ratio: "1:1:1",
    stepCount: 0,
    baseKvar: 0,
    totalKvar: 0,
    rounding: "none",
    simulation: simulateStepProgram("1:1:1", 0, 1, samples, rule0),
  };
  let bestMults: readonly number[] = [];
  let evaluated = 1;
  const consider = (ratio: StepRatio, stepCount: number, baseKvar: number, k: number, rounding: "up" | "down", mults: readonly number[]): void => {
    evaluated++;
    const c = {
      ratio,
      stepCount,
      baseKvar,
      totalKvar: k * baseKvar,
      rounding,
      simulation: simulateStepProgram(ratio, stepCount, baseKvar, samples, ruleFor(baseKvar)),
    };
    if (better(c, best, tie, o.preferredBaseKvar)) {
      best = c;
      bestMults = mults;
    }
  };
  if (switchedNeeded > 1e-9) {
    // Each (ratio, step count) pair is visited once and its bases are distinct ladder entries, so no candidate repeats.
    for (const ratio of new Set(o.ratios ?? STEP_RATIOS)) {
      const mults = stepMultipliers(ratio, maxSteps);
      const distinct = [...new Set(mults.slice(0, Math.max(3, minSteps)))];
      const bases = baseLadder(units, switchedNeeded, minSteps, distinct);
      const iPref = o.preferredBaseKvar === undefined ? -1 : bases.indexNear(o.preferredBaseKvar);
      let k = 0;
      for (let steps = 1; steps <= maxSteps; steps++) {
        k += mults[steps - 1] as number; // maxMultiple(ratio, steps) as a running sum
        if (steps < Math.max(ratio === "1:2:4" ? 3 : 1, minSteps)) continue;
        // bases ascend: the first reaching the need (round up) and the one before it (round down)
        const iUp = bases.firstReaching(k, switchedNeeded);
        if (iUp < bases.length) consider(ratio, steps, bases.at(iUp), k, "up", mults);
        if (iUp - 1 >= 0 && iUp - 1 < bases.length) consider(ratio, steps, bases.at(iUp - 1), k, "down", mults);
        if (iPref >= 0 && iPref !== iUp && iPref !== iUp - 1 && iPref < bases.length)
          consider(ratio, steps, bases.at(iPref), k, iPref > iUp ? "up" : "down", mults);
      }
    }
  }
  const b = best;
  const switched: StepCandidate | null =
    b.stepCount === 0
      ? null
      : {
          ratio: b.ratio,
          stepCount: b.stepCount,
          baseKvar: b.baseKvar,
          stepsKvar: bestMults.slice(0, b.stepCount).map((m) => m * b.baseKvar),
          totalKvar: b.totalKvar,
          rounding: b.rounding,
          simulation: b.simulation,
        };

  const largest = Math.max(...units);
  if (switched && switched.stepsKvar.some((s) => s > largest + 1e-9)) {
    const np = Math.max(...nameplateUnits);
    const shown = perNameplate === 1 ? `${np} kvar` : `${np} kvar nameplate (${largest.toFixed(1)} kvar delivered)`;
    notes.push(`steps above ${shown} are built of several ${np} kvar units in parallel on one contactor`);
  }
  if (switchedNeeded > 1e-9 && switched === null) {
    notes.push("no switched program meets the target at more samples than the fixed part alone");
  }
  const sim = best.simulation;
  const perDay = d.intervalMinutes !== undefined && n > 1 ? (sim.switchingOperations / (n * d.intervalMinutes)) * 1440 : null;
  return {
    source: d.source,
    samples: n,
    coverage,
    needAtCoverageKvar: needAtCoverage,
    maxNeedKvar: maxNeed,
    minReactiveKvar: minQ,
    fixed,
    switchedNeededKvar: switchedNeeded,
    switched,
    candidatesEvaluated: evaluated,
    metShare: n > 0 ? sim.metCount / n : 0,
    metCoveredShare: sim.coveredCount > 0 ? sim.metCoveredCount / sim.coveredCount : 0,
    switchingOperations: sim.switchingOperations,
    switchingOperationsPerDay: perDay,
    notes,
    warnings,
  };
}

/** Controller response threshold C/k (trade formula, in capacitor.ts). */
export { controllerResponseA };
