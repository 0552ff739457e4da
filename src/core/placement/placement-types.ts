/** Input and output shapes of the placement plan. */
import type { Phases } from "../conventions.js";
import type { LoadInput, LoadKind } from "../inputs.js";
import type { Warning } from "../warnings.js";

/** The placement fields of a load are the load input's own (starting, contactor, group, no-load amps, duty, conductors). */
export interface PlacementLoad extends Pick<
  LoadInput,
  "starting" | "separateCapacitorContactor" | "group" | "noLoadAmps" | "continuousDuty" | "motorConductorAmpacityA"
> {
  label: string;
  kind: LoadKind;
  /** kW and signed kvar of the whole entry (all `quantity` units) at the measured load. */
  kW: number;
  kvar: number;
  quantity?: number;
  /** The voltage the motor runs at: the reading's volts when it has them, else the system voltage. */
  voltageV: number;
  phases: Phases;
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
  /** Nameplate voltage of terminal units (standard sizes are chosen at it); default each load's voltageV. */
  unitRatedVoltageV?: number;
  /** Phases of the system: a single-phase load on a three-phase system corrected upstream warns of unbalance. */
  systemPhases?: Phases;
}

export type PlacementLocation = "terminal" | `group:${string}` | "central" | "none";

export interface TerminalCorrection {
  /** kvar one unit delivers at the motor's voltage (what the balance counts). */
  perMotorKvar: number;
  /** The unit's nameplate: a standard size at `ratedVoltageV`. */
  perMotorNameplateKvar: number;
  ratedVoltageV: number;
  /** The voltage the unit and the motor's currents are worked at (the reading's volts, else the system voltage). */
  voltageV: number;
  totalKvar: number;
  selfExcitationLimitKvar: number;
  lineCurrentBeforeA: number;
  lineCurrentAfterA: number;
  overloadNote: string;
  /** Rated current of one unit at its nameplate: Q_r·1000/(√3·V_r). */
  capacitorRatedCurrentA: number;
  /** Least ampacity of the conductors to the unit (NFPA 70 460.8(A)). */
  conductorMinAmpacityA: number;
  conductorNote: string;
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
