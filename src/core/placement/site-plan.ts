import { analyseBank, type BankAnalysis, type SourceContext } from "../bank/stages.js";
import type { CorrectionResult } from "../correction/to-target.js";
import { designBank, type BankDesign, type DesignedStep } from "../bank/bank-design.js";
import { demandArrays, type ReactiveDemand } from "../bank/demand.js";
import { combinedProgram, type CombinedProgram } from "../bank/combined-program.js";
import { planPlacement } from "./placement.js";
import type { PlacementPlan } from "./placement-types.js";
import type { SizingInput } from "../inputs.js";
import { triangleOf } from "../readings/triangle.js";
import { readingVolts, type LoadResult, type SiteResult } from "../readings/site-totals.js";
import { checkReadingVolts } from "../readings/plausibility.js";
import type { InputIssue, Warning } from "../warnings.js";

export type BankArrangement = "fixed" | "automatic" | "fixed_and_automatic";

/** The recommended (central) bank: the design's figures, and every switchable total analysed stage by stage. */
export interface RecommendedBank extends BankAnalysis {
  arrangement: BankArrangement;
  reason: string;
  /** True when the bank cannot hold the target in every reading or interval. */
  belowTarget: boolean;
  /** Delivered kvar at the system voltage and frequency. */
  fixedKvar: number;
  switchedKvar: number;
  /** The same at nameplate: standard sizes at the capacitors' rated voltage. */
  fixedNameplateKvar: number;
  switchedNameplateKvar: number;
  /** The physical steps, fixed first: what to buy (stages[] are the switchable totals). */
  physicalSteps: DesignedStep[];
  stepPlan: Omit<BankDesign["stepPlan"], "warnings" | "notes">;
  controller: BankDesign["controller"];
  protection: BankDesign["protection"];
  discharge: BankDesign["discharge"];
  notes: string[];
  /** With an installed automatic bank: both banks' steps under one controller, and how often they hold the target. */
  combinedProgram?: CombinedProgram;
}

export interface SiteDesignOutcome {
  placement?: PlacementPlan;
  recommendedBank: RecommendedBank | null;
  /** The stage-by-stage steps the harmonic study must see (one stage per switchable total). */
  screenSteps: { kvar: number }[];
  issues: InputIssue[];
  warnings: Warning[];
}

/** Installed banks the new bank's design stands beside: kvar to add back to the survey reading, and their rated kvar. */
export interface InstalledForDesign {
  addBackKvar: number;
  installedKvar: number;
  /** Delivered kvar at the system voltage of each step of the installed automatic service banks. */
  automaticStepsKvar?: number[];
}

function demandOf(
  input: SizingInput,
  site: SiteResult,
  installed?: InstalledForDesign,
): { demand?: ReactiveDemand; issues: InputIssue[]; warnings: Warning[] } {
  if (input.intervalDemand) {
    const { kW, kvar, intervalMinutes } = input.intervalDemand;
    return { demand: { kind: "intervals", samples: { kW, kvar }, ...(intervalMinutes ? { intervalMinutes } : {}) }, issues: [], warnings: [] };
  }
  // Readings taken with installed steps energised include their kvar: the design starts from the uncorrected site.
  const survey = { kW: site.kW, kvar: site.kvar + (installed?.addBackKvar ?? 0) };
  if (!input.lightLoad) return { demand: { kind: "readings", survey }, issues: [], warnings: [] };
  const at = ["lightLoad", "measurement"];
  const volts = readingVolts(input.lightLoad.measurement);
  const check = volts === undefined ? { issues: [], warnings: [] } : checkReadingVolts(volts, input.system.phases, input.system, at);
  if (check.issues.length > 0) return { issues: check.issues, warnings: check.warnings };
  const light = triangleOf(input.lightLoad.measurement, input.system.phases, at);
  if (!light.triangle) return { issues: light.issues, warnings: [...check.warnings, ...light.warnings] };
  return {
    demand: { kind: "readings", survey, lightLoad: { kW: light.triangle.kW, kvar: light.triangle.kvar } },
    issues: [],
    warnings: [...check.warnings, ...light.warnings],
  };
}

/**
 * Where the correction goes (motor terminals, group banks, the central bank) and the design of the central bank:
 * fixed part under the minimum reactive demand, switched steps, C/k, protection and discharge.
 */
export function designSiteCorrection(
  input: SizingInput,
  loads: LoadResult[],
  site: SiteResult,
  correction: CorrectionResult,
  source: SourceContext,
  installed?: InstalledForDesign,
): SiteDesignOutcome {
  const warnings: Warning[] = [];
  const o = input.bankDesign ?? {};
  const placement = planPlacement({
    loads: input.loads.map((load, i) => {
      const r = loads[i]!;
      return {
        label: load.label,
        kind: load.kind ?? "other",
        kW: r.kW,
        kvar: r.kvar,
        quantity: r.quantity,
        voltageV: r.currentVoltageV,
        phases: r.phases,
        ...(load.starting ? { starting: load.starting } : {}),
        ...(load.separateCapacitorContactor !== undefined ? { separateCapacitorContactor: load.separateCapacitorContactor } : {}),
        ...(load.group ? { group: load.group } : {}),
        ...(load.noLoadAmps !== undefined ? { noLoadAmps: load.noLoadAmps } : {}),
        ...(load.continuousDuty !== undefined ? { continuousDuty: load.continuousDuty } : {}),
        ...(load.motorConductorAmpacityA !== undefined ? { motorConductorAmpacityA: load.motorConductorAmpacityA } : {}),
      };
    }),
    targetPF: correction.targetPF,
    siteRequiredKvar: correction.kvarRequired,
    pathPrefix: "loads",
    // Terminal units are plain capacitors: the bank's rating when it has no reactor, else the system voltage.
    unitRatedVoltageV: o.ratedVoltageV !== undefined && !(o.reactorPct ?? 0) ? o.ratedVoltageV : input.system.voltageV,
    systemPhases: input.system.phases,
  });
  warnings.push(...placement.warnings);
  const localKvar = placement.locations.filter((l) => l.location !== "central" && l.location !== "none").reduce((s, l) => s + l.kvar, 0);

  const d = demandOf(input, site, installed);
  warnings.push(...d.warnings);
  const autoSteps = installed?.automaticStepsKvar ?? [];
  const preferredBaseKvar = mostCommon(autoSteps);
  if (!d.demand) return { placement, recommendedBank: null, screenSteps: [], issues: d.issues, warnings };
  const outcome = designBank({
    system: input.system,
    targetPF: correction.targetPF,
    demand: d.demand,
    // The installed banks, restored and fully used, come off every sample like local correction does.
    localCorrectionKvar: localKvar + (installed?.installedKvar ?? 0),
    ...(input.transformer ? { transformerKVA: input.transformer.kVA } : {}),
    ...(o.ctRatio !== undefined ? { ctRatio: o.ctRatio } : {}),
    ...(o.ratedVoltageV !== undefined ? { ratedVoltageV: o.ratedVoltageV } : {}),
    ...(o.reactorPct !== undefined ? { reactorPct: o.reactorPct } : {}),
    ...(o.coverage !== undefined || preferredBaseKvar !== undefined
      ? {
          steps: { ...(o.coverage !== undefined ? { coverage: o.coverage } : {}), ...(preferredBaseKvar !== undefined ? { preferredBaseKvar } : {}) },
        }
      : {}),
    protection: { ...(o.protectionDevice ? { device: o.protectionDevice } : {}), ...(o.ocpdFactor ? { ocpdFactor: o.ocpdFactor } : {}) },
    discharge: {
      ...(o.capacitorConnection ? { capacitorConnection: o.capacitorConnection } : {}),
      ...(o.dischargeResistorConnection ? { resistorConnection: o.dischargeResistorConnection } : {}),
    },
  });
  if (!outcome.ok)
    return { placement, recommendedBank: null, screenSteps: [], issues: outcome.issues.map((i) => ({ ...i, path: prefixed(i.path) })), warnings };
  const design = outcome.design;
  warnings.push(...design.warnings);
  if (!design.bank || !design.screenBank) return { placement, recommendedBank: null, screenSteps: [], issues: [], warnings };

  const { analysis, warnings: w } = analyseBank(design.screenBank, input.system, source, "recommendedBank");
  warnings.push(...w);
  const { warnings: _w, notes: _n, ...stepPlan } = design.stepPlan;
  const recommendedBank: RecommendedBank = {
    ...analysis,
    steps: design.bank.steps.map((s) => ({ kvar: s.kvar })),
    arrangement: design.switchedKvar === 0 ? "fixed" : design.fixedKvar === 0 ? "automatic" : "fixed_and_automatic",
    reason: design.reason,
    belowTarget: design.stepPlan.metShare < 1,
    fixedKvar: design.fixedKvar,
    switchedKvar: design.switchedKvar,
    fixedNameplateKvar: design.fixedNameplateKvar,
    switchedNameplateKvar: design.switchedNameplateKvar,
    physicalSteps: design.steps,
    stepPlan,
    controller: design.controller,
    protection: design.protection,
    discharge: design.discharge,
    notes: [...design.notes, ...design.stepPlan.notes],
  };
  if (autoSteps.length > 0 && installed) {
    // the installed automatic steps come back out of the design's "always on" credit: they switch with the new ones
    const arrays = demandArrays(d.demand, localKvar).arrays;
    const autoTotal = autoSteps.reduce((s, k) => s + k, 0);
    const combined = arrays
      ? combinedProgram(
          arrays,
          correction.targetPF,
          autoSteps,
          Math.max(0, installed.installedKvar - autoTotal),
          design.fixedKvar,
          design.steps.filter((s) => s.role !== "fixed").map((s) => s.effectiveKvar),
          design.stepPlan.metShare,
        )
      : null;
    if (combined) recommendedBank.combinedProgram = combined;
  }
  return { placement, recommendedBank, screenSteps: design.screenBank.steps, issues: [], warnings };
}

/** Design issues name design options; map them onto the request's fields. */
function prefixed(path: (string | number)[]): (string | number)[] {
  const head = path[0];
  if (head === "ctRatio" || head === "ratedVoltageV" || head === "reactorPct") return ["bankDesign", ...path];
  return path;
}

/** The step size most installed automatic steps have (the first when tied); undefined without any. */
function mostCommon(kvar: readonly number[]): number | undefined {
  const counts = new Map<number, number>();
  for (const k of kvar) counts.set(Math.round(k * 1e6) / 1e6, (counts.get(Math.round(k * 1e6) / 1e6) ?? 0) + 1);
  let best: number | undefined;
  let n = 0;
  for (const [k, c] of counts) if (c > n) ((best = k), (n = c));
  return best;
}
