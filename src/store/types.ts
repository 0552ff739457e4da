import type { InstalledBankInput, SizingInput, SystemInput, TransformerInput, UtilityInput } from "../core/inputs.js";
import type { IntervalSummary } from "../core/interval/summary.js";
import type { EconomicsSettings } from "../core/economics/of-sizing.js";
import type { SizingResult } from "../core/pipeline/size.js";
import type { Role } from "../auth/keys.js";

/** Records as the store hands them out. Inputs and results are kept apart, as they are stored. */

export interface BuildingData {
  name: string;
  address: string | null;
  notes: string | null;
  system: SystemInput;
  transformer: TransformerInput | null;
  utility: UtilityInput | null;
  /** Tariff and costs for savings; null when none. Absent in versions recorded before it existed (= null). */
  economics?: EconomicsSettings | null;
  /** Capacitor banks already installed. Absent in versions recorded before it existed (= none). */
  installedBanks?: InstalledBankInput[];
}

export interface BuildingRecord extends BuildingData {
  economics: EconomicsSettings | null;
  id: string;
  version: number;
  createdAt: string;
  updatedAt: string;
}

export interface BuildingVersion {
  version: number;
  data: BuildingData;
  recordedAt: string;
  actor: string;
}

/**
 * What a survey submits (the revision's reason is kept beside, not inside): the sizing body less the building's
 * data (system, transformer, utility, economics, interval demand), plus who and when.
 */
export interface SurveyInputs extends Omit<
  SizingInput,
  "system" | "transformer" | "utility" | "targetPF" | "economics" | "intervalDemand" | "installedBanks"
> {
  surveyedAt: string;
  surveyor: string;
  notes?: string;
  targetPF: number;
  /** A stored interval analysis of the same building to size with; the building's newest when absent; null: none. */
  intervalAnalysisId?: string | null;
}

/** The building's data a revision was computed with. */
export interface BuildingSnapshot {
  buildingVersion: number;
  system: SystemInput;
  transformer: TransformerInput | null;
  utility: UtilityInput | null;
  /** The tariff the result's economics rest on. Absent in snapshots stored before it existed (= null). */
  economics?: EconomicsSettings | null;
  /** The interval analysis the bank design rests on, null when none. Absent in older snapshots (= null). */
  intervalAnalysisId?: string | null;
  /** The building's installed banks. Absent in older snapshots (= none). */
  installedBanks?: InstalledBankInput[];
}

/** An interval analysis stored with a building: its summary and the figures lists show. */
export interface IntervalAnalysisRecord {
  id: string;
  buildingId: string;
  createdAt: string;
  actor: string;
  requestId: string | null;
  targetPF: number;
  intervalCount: number;
  intervalMinutes: number;
  firstTimestamp: string;
  lastTimestamp: string;
  hold99PctKvar: number;
  minKvar: number;
  summary: IntervalSummary;
}

/** A list entry: the record without its summary (read from columns, no JSON parsed); seq is the list position. */
export interface IntervalAnalysisListEntry extends Omit<IntervalAnalysisRecord, "summary" | "actor" | "requestId"> {
  seq: number;
}

/** Figures from a result, kept in columns so lists and trends do not parse JSON. */
export interface SurveySummary {
  kW: number;
  kvar: number;
  kVA: number;
  displacementPF: number;
  kvarRequired: number;
  warningCount: number;
  /** Rated kvar of the installed steps energised during the readings; null without installed banks. */
  installedKvarInService: number | null;
  /** kvar those steps delivered (measured where given); null without installed banks. */
  installedKvarDelivered: number | null;
}

export interface NewRevision {
  surveyId: string;
  n: number;
  reason: string | null;
  createdAt: string;
  actor: string;
  inputs: SurveyInputs;
  result: SizingResult;
  /** `result` as UTF-8 JSON, when it was serialised already (where it was computed): stored as it is. */
  resultUtf8?: Uint8Array;
  engineVersion: string;
  building: BuildingSnapshot;
  summary: SurveySummary;
  /** Normalised UTC instant of inputs.surveyedAt, for ordering and date filters. */
  surveyedAtUtc: string;
}

export interface RevisionRecord extends Omit<NewRevision, "surveyedAtUtc" | "resultUtf8"> {
  buildingId: string;
}

export interface RevisionListEntry {
  n: number;
  createdAt: string;
  reason: string | null;
}

export interface SurveyHead extends SurveySummary {
  id: string;
  buildingId: string;
  createdAt: string;
  revision: number;
  surveyedAt: string;
  surveyedAtUtc: string;
  surveyor: string;
}

export interface AuditEntry {
  id: number;
  actor: string;
  action: string;
  resourceType: string;
  resourceId: string;
  requestId: string | null;
  at: string;
}

/** What a write records in the audit log; the stored entry adds its row id. */
export interface AuditEvent extends Omit<AuditEntry, "id"> {
  orgId: string;
}

export interface BuildingListQuery {
  /** Substring of the name, case-insensitive (ASCII). */
  q?: string;
  /** Keyset position: the (name, id) of the last item of the previous page. */
  after?: { name: string; id: string };
  limit: number;
}

/** The first response to an Idempotency-Key, per organisation. */
export interface IdempotencyRecord {
  requestHash: string;
  status: number;
  location: string | null;
  responseJson: string;
  createdAt: string;
}

export interface NewIntervalAnalysis {
  id: string;
  buildingId: string;
  createdAt: string;
  actor: string;
  requestId: string | null;
  summary: IntervalSummary;
}

export interface ApiKeyRecord {
  id: string;
  orgId: string;
  prefix: string;
  secretSha256: string;
  role: Role;
  label: string | null;
  createdAt: string;
  createdBy: string;
  revokedAt: string | null;
  lastUsedAt: string | null;
}

export interface Organisation {
  id: string;
  name: string;
  createdAt: string;
}

/** A survey's latest revision's result and building snapshot: for series read from results (bank health). */
export interface SurveyResultRow {
  surveyId: string;
  surveyedAt: string;
  result: SizingResult;
  building: BuildingSnapshot;
}

export interface SurveyRange {
  /** Inclusive UTC bounds (ISO strings), either may be absent. */
  fromUtc?: string;
  toUtc?: string;
}

export interface SurveyPageQuery extends SurveyRange {
  /** Keyset position, newest-first order: the last item of the previous page. */
  before?: { t: string; id: string };
  limit: number;
}
