import type { Phases, Sense } from "./conventions.js";
import type { EconomicsSettings, MonthlyDemand } from "./economics/of-sizing.js";

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

export interface KwKvaMeasurement extends MeasurementCommon {
  method: "kw_kva";
  kW: number;
  kVA: number;
  sense?: Sense;
}
export interface KwKvarMeasurement extends MeasurementCommon {
  method: "kw_kvar";
  kW: number;
  kvar: number;
}
export interface KwPfMeasurement extends MeasurementCommon {
  method: "kw_pf";
  kW: number;
  pf: number;
  sense: Sense;
}
export interface VIKwMeasurement extends MeasurementCommon {
  method: "v_i_kw";
  volts: number;
  amps: number;
  kW: number;
  sense?: Sense;
}
export interface VIPfMeasurement extends MeasurementCommon {
  method: "v_i_pf";
  volts: number;
  amps: number;
  pf: number;
  sense: Sense;
}

export type Measurement = KwKvaMeasurement | KwKvarMeasurement | KwPfMeasurement | VIKwMeasurement | VIPfMeasurement;

export type MeasurementMethod = Measurement["method"];

export interface HarmonicComponent {
  order: number;
  pct: number;
}

export type StartingMethod =
  "across_the_line" | "star_delta" | "soft_starter" | "reduced_voltage" | "jogging" | "plugging" | "reversing" | "multi_speed";

export interface LoadInput {
  label: string;
  kind?: LoadKind;
  phases?: Phases;
  quantity?: number;
  measurement: Measurement;
  /** Measured current spectrum, percent of this load's fundamental current. */
  harmonics?: HarmonicComponent[];
  /** How a motor is started: decides whether capacitors may go at its terminals. */
  starting?: StartingMethod;
  /** The terminal capacitor would have its own contactor, switched off while the motor starts or stops. */
  separateCapacitorContactor?: boolean;
  /** MCC or feeder the load is fed from, for group banks. */
  group?: string;
  /** No-load (uncoupled) line current of one motor, A: sets the self-excitation limit. */
  noLoadAmps?: number;
  /** false when the motor runs intermittently. */
  continuousDuty?: boolean;
  /** Ampacity of the motor-circuit conductors, A: a terminal capacitor's conductors need ⅓ of it (NFPA 70 460.8(A)). */
  motorConductorAmpacityA?: number;
}

/** How to build the recommended bank; every field optional. */
export interface BankDesignOptions {
  /** Controller CT ratio, primary/secondary (1000/5 → 200), for C/k. */
  ctRatio?: number;
  /** Capacitor nameplate voltage; default the system voltage. */
  ratedVoltageV?: number;
  /** Series reactor of the bank, percent; default 0 (a harmonic study may propose one). */
  reactorPct?: number;
  /** Share of intervals the switched part covers (default 0.99). */
  coverage?: number;
  protectionDevice?: "fuse" | "breaker";
  /** Overcurrent device as a multiple of rated current (≥ 1.35). */
  ocpdFactor?: number;
  capacitorConnection?: "delta" | "wye";
  dischargeResistorConnection?: "across_each_capacitor" | "star_across_delta" | "two_across_delta" | "delta_across_wye";
}

/** Interval demand behind a design: kW and signed kvar per interval. */
export interface IntervalDemandInput {
  kW: ArrayLike<number>;
  kvar: ArrayLike<number>;
  intervalMinutes?: number;
  /** Monthly peaks and energies, for savings. */
  months?: MonthlyDemand[];
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

/** A capacitor bank already on the wall: nameplate kvar per step at its rated voltage and frequency. */
export interface InstalledBankInput {
  /** Unique within the building: how bank readings refer to it. */
  label: string;
  /** At the service (main switchboard), on a group (MCC/feeder) or at a motor's terminals. */
  location: "service" | "group" | "motor";
  /** The MCC or feeder of a group bank. */
  group?: string;
  /** The motor (load label) of a terminal unit. */
  loadLabel?: string;
  control: "fixed" | "automatic";
  ratedVoltageV: number;
  ratedFrequencyHz?: 50 | 60;
  connection?: "delta" | "wye";
  /** Series (detuning) reactor, percent of the capacitor reactance; 0 or absent: a plain bank. */
  reactorPct?: number;
  /** Nameplate kvar per step; a fixed bank is one step. */
  steps: BankStepInput[];
  /** ISO date it was put in service. */
  installedOn?: string;
}

/** The state of an installed bank while the site readings were taken, and what was measured at it. */
export interface BankReadingInput {
  /** The installed bank's label. */
  bank: string;
  /** 1-based numbers of the steps energised while the site readings were taken. */
  inServiceSteps: number[];
  /** Voltage measured at the bank (line-to-line on three phases); default the system voltage. */
  voltageV?: number;
  /** Current measured in a step (1-based): one figure per phase on three phases, or one figure. */
  stepCurrents?: { step: number; amps: number[] | number }[];
}

export interface ServiceEntranceInput {
  label?: string;
  measurement: Measurement;
}

/**
 * What the readings cover: the whole site (the service entrance, or every load) or a part of it (some loads only).
 * Interval demand drives the central bank only for a whole-site survey.
 */
export type SurveyScope = "whole_site" | "partial";

export interface SizingInput {
  system: SystemInput;
  targetPF?: number;
  /** Default: whole_site when a service-entrance reading is given, else partial. */
  scope?: SurveyScope;
  loads: LoadInput[];
  serviceEntrance?: ServiceEntranceInput;
  transformer?: TransformerInput;
  utility?: UtilityInput;
  proposedBank?: ProposedBankInput;
  harmonicSources?: HarmonicSourceKind[];
  /** Background voltage distortion at the bus from the utility, percent of the fundamental per order. */
  backgroundVoltageDistortion?: HarmonicComponent[];
  /** A reading at the main at light load (night shift, weekend): caps the fixed part of the bank. */
  lightLoad?: ServiceEntranceInput;
  bankDesign?: BankDesignOptions;
  /** Interval demand (from an interval analysis) the bank design rests on instead of the readings. */
  intervalDemand?: IntervalDemandInput;
  /** Tariff and costs, for savings and payback. */
  economics?: EconomicsSettings;
  /** Capacitor banks already installed (a building's, or given inline). */
  installedBanks?: InstalledBankInput[];
  /** Which installed steps were energised during the readings, and their measured currents. */
  bankReadings?: BankReadingInput[];
}

export const DEFAULT_TARGET_PF = 0.95;
export const TARGET_PF_MIN = 0.8;
export const TARGET_PF_MAX = 1.0;
export const VOLTS_MIN = 50;
export const VOLTS_MAX = 35_000;
export const MAX_LOADS = 2000;
