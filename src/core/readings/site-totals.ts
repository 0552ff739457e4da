import { apparentKVA, lineCurrentA, senseOfKvar, type Phases, type Sense } from "../conventions.js";
import type { LoadInput, ServiceEntranceInput, SystemInput } from "../inputs.js";
import { scaleTriangle, triangleOf, type MeasuredTriangle, type PowerTriangle } from "./triangle.js";
import { warning, type InputIssue, type Warning } from "../warnings.js";
import { checkAgainstTransformer, checkReadingVolts } from "./plausibility.js";

export interface LoadResult extends MeasuredTriangle {
  label: string;
  kind: LoadInput["kind"] | "other";
  method: LoadInput["measurement"]["method"];
  quantity: number;
  phases: Phases;
  /** Line current of the whole entry (all `quantity` units) at `currentVoltageV`. */
  lineCurrentA: number;
  /** The voltage the current is worked at: the reading's volts when it has them, else the system voltage. */
  currentVoltageV: number;
  /** "reading": volts and amps read at the load; "system_voltage": the reading has no volts, the bus voltage is used. */
  currentBasis: "reading" | "system_voltage";
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

/** The reading's volts, when its method carries them. */
export function readingVolts(m: LoadInput["measurement"]): number | undefined {
  return m.method === "v_i_kw" || m.method === "v_i_pf" ? m.volts : undefined;
}

export function evaluateSite(system: SystemInput, loads: LoadInput[], serviceEntrance?: ServiceEntranceInput, transformerKVA?: number): SiteOutcome {
  const issues: InputIssue[] = [];
  const warnings: Warning[] = [];
  const results: LoadResult[] = [];
  let sumKW = 0;
  let sumKvar = 0;

  loads.forEach((load, i) => {
    const phases = load.phases ?? system.phases;
    const at = ["loads", i, "measurement"];
    const volts = readingVolts(load.measurement);
    if (volts !== undefined) {
      const check = checkReadingVolts(volts, phases, system, at);
      issues.push(...check.issues);
      warnings.push(...check.warnings);
      if (check.issues.length > 0) return;
    }
    const outcome = triangleOf(load.measurement, phases, at);
    issues.push(...outcome.issues);
    warnings.push(...outcome.warnings);
    if (!outcome.triangle) return;
    const quantity = load.quantity ?? 1;
    const t = scaleTriangle(outcome.triangle, quantity);
    sumKW += t.kW;
    sumKvar += t.kvar;
    // The triangle's fields written out (not spread): the same keys in the same order, without a generic copy per load.
    const result: LoadResult = {
      label: load.label,
      kind: load.kind ?? "other",
      method: load.measurement.method,
      quantity,
      phases,
      kW: t.kW,
      kvar: t.kvar,
      kVA: t.kVA,
      displacementPF: t.displacementPF,
      sense: t.sense,
    } as LoadResult;
    if (t.measuredKVA !== undefined) result.measuredKVA = t.measuredKVA;
    if (t.truePF !== undefined) result.truePF = t.truePF;
    // I = S/(√3·V) at the volts read: a 460 V / 125 A reading is 125 A, not its kVA over the 480 V bus (119.8 A).
    result.lineCurrentA = lineCurrentA(t.measuredKVA ?? t.kVA, volts ?? system.voltageV, phases);
    result.currentVoltageV = volts ?? system.voltageV;
    result.currentBasis = volts === undefined ? "system_voltage" : "reading";
    results.push(result);
  });

  let main: MeasuredTriangle | undefined;
  if (serviceEntrance) {
    const mainVolts = readingVolts(serviceEntrance.measurement);
    const check = mainVolts === undefined ? undefined : checkReadingVolts(mainVolts, system.phases, system, ["serviceEntrance", "measurement"]);
    issues.push(...(check?.issues ?? []));
    warnings.push(...(check?.warnings ?? []));
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
  if (transformerKVA !== undefined) {
    const siteItem = { label: main ? "the service entrance's" : "the loads' total", kVA: main ? (main.measuredKVA ?? main.kVA) : site.kVA };
    warnings.push(
      ...checkAgainstTransformer(
        siteItem,
        results.map((l) => ({ label: l.label, kVA: l.measuredKVA ?? l.kVA })),
        transformerKVA,
      ),
    );
  }
  return { loads: results, site, issues, warnings };
}

export type { Sense };
