import type { Phases, Sense } from "./conventions.js";

/** Typed inputs of the engine. The API's zod schemas produce values of these types. */

export type LoadKind = "motor" | "drive" | "lighting" | "hvac" | "welder" | "other";
export type PfType = "displacement" | "true";
export type HarmonicSourceKind = "six_pulse" | "twelve_pulse" | "single_phase_electronic";

interface MeasurementCommon {
  /** "displacement" (default): the meter's PF is the fundamental cos φ; "true": it includes harmonics. */
  pfType?: PfType;
  /** Current THD in percent, with a true-PF reading, to recover the displacement PF. */
  currentTHDPct?: number;
}

export interface KwKvaMeasurement extends MeasurementCommon { method: "kw_kva"; kW: number; kVA: number; sense?: Sense }
export interface KwKvarMeasurement extends MeasurementCommon { method: "kw_kvar"; kW: number; kvar: number }
export interface KwPfMeasurement extends MeasurementCommon { method: "kw_pf"; kW: number; pf: number; sense: Sense }
export interface VIKwMeasurement extends MeasurementCommon { method: "v_i_kw"; volts: number; amps: number; kW: number; sense?: Sense }
export interface VIPfMeasurement extends MeasurementCommon { method: "v_i_pf"; volts: number; amps: number; pf: number; sense: Sense }

export type Measurement =
  | KwKvaMeasurement
  | KwKvarMeasurement
  | KwPfMeasurement
  | VIKwMeasurement
  | VIPfMeasurement;

export type MeasurementMethod = Measurement["method"];

export interface HarmonicComponent {
  order: number;
  pct: number;
}

export interface LoadInput {
  label: string;
  kind?: LoadKind;
  phases?: Phases;
  quantity?: number;
  measurement: Measurement;
  /** Measured current spectrum, percent of this load's fundamental current. */
  harmonics?: HarmonicComponent[];
}

export interface SystemInput {
  voltageV: number;
  frequencyHz: 50 | 60;
  phases: Phases;
}

export interface TransformerInput {
  kVA: number;
  impedancePct: number;
  xOverR?: number;
}

export interface UtilityInput {
  faultMVA: number;
}

export interface BankStepInput {
  kvar: number;
}

export interface ProposedBankInput {
  ratedVoltageV: number;
  ratedFrequencyHz?: 50 | 60;
  steps: BankStepInput[];
  reactorPct?: number;
}

export interface ServiceEntranceInput {
  label?: string;
  measurement: Measurement;
}

export interface SizingInput {
  system: SystemInput;
  targetPF?: number;
  loads: LoadInput[];
  serviceEntrance?: ServiceEntranceInput;
  transformer?: TransformerInput;
  utility?: UtilityInput;
  proposedBank?: ProposedBankInput;
  harmonicSources?: HarmonicSourceKind[];
  /** Background voltage distortion at the bus from the utility, percent of the fundamental per order. */
  backgroundVoltageDistortion?: HarmonicComponent[];
}

export const DEFAULT_TARGET_PF = 0.95;
export const TARGET_PF_MIN = 0.8;
export const TARGET_PF_MAX = 1.0;
export const VOLTS_MIN = 50;
export const VOLTS_MAX = 35_000;
export const MAX_LOADS = 2000;
