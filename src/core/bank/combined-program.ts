/**
 * The switching program of an installed automatic bank and a new one under one controller: the steps in switching
 * order and how often the pair holds the target over the same samples the design used.
 */
import { tanPhi } from "../conventions.js";
import { DEFAULT_LEADING_LIMIT_PF } from "./controller-rule.js";
import { createController, MAX_STEPS } from "../interval/controller.js";
import type { DemandArrays } from "./demand.js";

export interface CombinedProgram {
  /** Steps as the controller is wired: the installed ones first, then the new ones; kvar delivered at the bus. */
  steps: { source: "installed" | "new"; kvar: number }[];
  fixedKvar: number;
  /** Share of the samples the pair holds between the target (plus the response threshold) and the leading limit. */
  metShare: number;
  /** Share of the samples the new bank alone would hold (the design's own figure, for comparison). */
  newAloneMetShare: number;
  note: string;
}

/**
 * One controller rule (bank/controller-rule.ts) over the time-ordered samples, the installed automatic steps and the
 * new switched steps together; the installed fixed kvar and the new fixed part always in. Null when the pair has more
 * steps than a controller drives (MAX_STEPS) or no installed automatic step.
 */
export function combinedProgram(
  samples: Pick<DemandArrays, "kW" | "kvar">,
  targetPF: number,
  installedStepsKvar: readonly number[],
  installedFixedKvar: number,
  newFixedKvar: number,
  newStepsKvar: readonly number[],
  newAloneMetShare: number,
): CombinedProgram | null {
  const steps = [...installedStepsKvar.filter((k) => k > 0), ...newStepsKvar];
  if (installedStepsKvar.length === 0 || steps.length === 0 || steps.length > MAX_STEPS) return null;
  const fixedKvar = installedFixedKvar + newFixedKvar;
  const controller = createController({ fixedKvar, stepsKvar: steps }, targetPF);
  const tanTarget = tanPhi(targetPF);
  const tanLead = tanPhi(DEFAULT_LEADING_LIMIT_PF);
  let mask = 0;
  let met = 0;
  const n = samples.kW.length;
  for (let i = 0; i < n; i++) {
    const p = samples.kW[i] as number;
    const q = samples.kvar[i] as number;
    mask = controller.decide(p, q, mask);
    const left = q - fixedKvar - controller.switchedKvar(mask);
    if (left <= p * tanTarget + controller.thresholdKvar + 1e-9 && left >= -p * tanLead - 1e-9) met++;
  }
  const metShare = n > 0 ? met / n : 0;
  return {
    steps: [
      ...installedStepsKvar.filter((k) => k > 0).map((kvar) => ({ source: "installed" as const, kvar })),
      ...newStepsKvar.map((kvar) => ({ source: "new" as const, kvar })),
    ],
    fixedKvar,
    metShare,
    newAloneMetShare,
    note: `wire the new steps to the installed bank's controller (or one controller for both): together they hold the target in ${(metShare * 100).toFixed(1)} % of the samples`,
  };
}
