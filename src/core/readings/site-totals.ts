import { apparentKVA, lineCurrentA, senseOfKvar, type Phases, type Sense } from "../conventions.js";
import type { LoadInput, ServiceEntranceInput, SystemInput } from "../inputs.js";
import { scaleTriangle, triangleOf, type MeasuredTriangle, type PowerTriangle } from "./triangle.js";
import { warning, type InputIssue, type Warning } from "../warnings.js";

export interface LoadResult extends MeasuredTriangle {
  label: string;
  kind: LoadInput["kind"] | "other";
  method: LoadInput["measurement"]["method"];
  quantity: number;
  phases: Phases;
  /** Line current of the whole entry (all `quantity` units) at the system voltage. */
  lineCurrentA: number;
}

export interface SiteResult extends PowerTriangle {
  /** Which reading is the site basis. */
  basis: "sum_of_loads" | "service_entrance";
  lineCurrentA: number;
  sumOfLoads: PowerTriangle;
  /** Main minus Σloads, when a service-entrance reading was given. */
  unmetered?: { kW: number; kvar: number };
}

export interface SiteOutcome {
  loads: LoadResult[];
  site?: SiteResult;
  issues: InputIssue[];
  warnings: Warning[];
}

/** Σloads above the main by more than this share points at readings taken at different times (common practice, no source). */
export const LOADS_OVER_MAIN_TOLERANCE = 0.1;

export function triangleFromSums(kW: number, kvar: number): PowerTriangle {
  const kVA = apparentKVA(kW, kvar);
  return { kW, kvar, kVA, displacementPF: kVA > 0 ? kW / kVA : 1, sense: senseOfKvar(kvar, kVA) };
}

export function evaluateSite(
  system: SystemInput,
  loads: LoadInput[],
  serviceEntrance?: ServiceEntranceInput,
): SiteOutcome {
  const issues: InputIssue[] = [];
  const warnings: Warning[] = [];
  const results: LoadResult[] = [];
  let sumKW = 0;
  let sumKvar = 0;

  loads.forEach((load, i) => {
    const phases = load.phases ?? system.phases;
    const outcome = triangleOf(load.measurement, phases, ["loads", i, "measurement"]);
    issues.push(...outcome.issues);
    warnings.push(...outcome.warnings);
    if (!outcome.triangle) return;
    const quantity = load.quantity ?? 1;
    const t = scaleTriangle(outcome.triangle, quantity);
    sumKW += t.kW;
    sumKvar += t.kvar;
    results.push({
      label: load.label,
      kind: load.kind ?? "other",
      method: load.measurement.method,
      quantity,
      phases,
      ...t,
      lineCurrentA: lineCurrentA(t.measuredKVA ?? t.kVA, system.voltageV, phases),
    });
  });

  let main: MeasuredTriangle | undefined;
  if (serviceEntrance) {
    const outcome = triangleOf(serviceEntrance.measurement, system.phases, ["serviceEntrance", "measurement"]);
    issues.push(...outcome.issues);
    warnings.push(...outcome.warnings);
    main = outcome.triangle;
  }
  if (issues.length > 0) return { loads: results, issues, warnings };

  const sumOfLoads = triangleFromSums(sumKW, sumKvar);
  const basisTriangle = main ? triangleFromSums(main.kW, main.kvar) : sumOfLoads;
  const site: SiteResult = {
    ...basisTriangle,
    basis: main ? "service_entrance" : "sum_of_loads",
    lineCurrentA: lineCurrentA(basisTriangle.kVA, system.voltageV, system.phases),
    sumOfLoads,
  };
  if (main) {
    site.unmetered = { kW: main.kW - sumKW, kvar: main.kvar - sumKvar };
    if (sumKW > main.kW * (1 + LOADS_OVER_MAIN_TOLERANCE)) {
      warnings.push(
        warning(
          "loads_exceed_main",
          `the loads add up to ${sumKW.toFixed(1)} kW, more than 10 % above the ${main.kW.toFixed(1)} kW read at the main: readings were probably taken at different times`,
          "serviceEntrance",
        ),
      );
    }
  }
  return { loads: results, site, issues, warnings };
}

export type { Sense };
