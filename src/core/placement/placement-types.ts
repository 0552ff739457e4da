/** Input and output shapes of the placement plan. */
import type { Phases } from "../conventions.js";
import type { LoadKind } from "../inputs.js";
import type { Warning } from "../warnings.js";
import type { StartingMethod } from "./rules.js";

export interface PlacementLoad {
  label: string;
  kind: LoadKind;
  /** kW and signed kvar of the whole entry (all `quantity` units) at the measured load. */
  kW: number;
  kvar: number;
  quantity?: number;
  voltageV: number;
  phases: Phases;
  starting?: StartingMethod;
  separateCapacitorContactor?: boolean;
  /** MCC or feeder the load is fed from. */
  group?: string;
  /** No-load (uncoupled) line current of one motor, A. */
  noLoadAmps?: number;
  /** false: the motor runs intermittently (a terminal capacitor would idle). Unstated is taken as continuous. */
  continuousDuty?: boolean;
}

export interface PlacementOptions {
  /** Share of the self-excitation limit a terminal capacitor may reach (common practice: 90 %). */
  selfExcitationShare?: number;
  /** Smallest motor (kW per unit) worth a terminal capacitor (common practice, no source: 20 kW). */
  terminalMinKW?: number;
  /** Smallest net kvar worth a group bank (common practice, no source: 50 kvar). */
  groupMinKvar?: number;
  unitSizesKvar?: readonly number[];
}

export interface PlacementInput {
  loads: PlacementLoad[];
  targetPF: number;
  /** The site's kvar to the target (CorrectionResult.kvarRequired). */
  siteRequiredKvar: number;
  options?: PlacementOptions;
  /** Path prefix of the loads in the request, for warnings. */
  pathPrefix?: string;
}

export type PlacementLocation = "terminal" | `group:${string}` | "central" | "none";

export interface TerminalCorrection {
  perMotorKvar: number;
  totalKvar: number;
  selfExcitationLimitKvar: number;
  lineCurrentBeforeA: number;
  lineCurrentAfterA: number;
  overloadNote: string;
}

export interface LoadPlacement {
  index: number;
  label: string;
  location: PlacementLocation;
  reason: string;
  /** Signed kvar this entry needs to reach the target: Q − P·tan(acos PF_target). */
  needKvar: number;
  terminal?: TerminalCorrection;
}

export interface LocationKvar {
  location: PlacementLocation;
  kvar: number;
  loads: string[];
}

export interface PlacementPlan {
  loads: LoadPlacement[];
  locations: LocationKvar[];
  totalKvar: number;
  siteRequiredKvar: number;
  /** siteRequired − total: nonzero only when the central remainder is below the smallest unit. */
  differenceKvar: number;
  balanceNote: string;
  notes: string[];
  warnings: Warning[];
}
