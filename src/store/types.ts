import type {
  SizingInput,
  SystemInput,
  TransformerInput,
  UtilityInput,
} from "../core/inputs.js";
import type { SizingResult } from "../core/sizing.js";

/** Records as the store hands them out. Inputs and results are kept apart, as they are stored. */

export interface BuildingData {
  name: string;
  address: string | null;
  notes: string | null;
  system: SystemInput;
  transformer: TransformerInput | null;
  utility: UtilityInput | null;
}

export interface BuildingRecord extends BuildingData {
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

/** A survey's inputs as the electrician submitted them (the revision's reason is kept beside, not inside). */
/** What a survey submits: the sizing body less the building's electrical data, plus who and when. */
export interface SurveyInputs extends Omit<SizingInput, "system" | "transformer" | "utility" | "targetPF"> {
  surveyedAt: string;
  surveyor: string;
  notes?: string;
  targetPF: number;
}

/** The building's electrical data a revision was computed with. */
export interface BuildingSnapshot {
  buildingVersion: number;
  system: SystemInput;
  transformer: TransformerInput | null;
  utility: UtilityInput | null;
}

/** Figures from a result, kept in columns so lists and trends do not parse JSON. */
export interface SurveySummary {
  kW: number;
  kvar: number;
  kVA: number;
  displacementPF: number;
  kvarRequired: number;
  warningCount: number;
}

export interface NewRevision {
  surveyId: string;
  n: number;
  reason: string | null;
  createdAt: string;
  actor: string;
  inputs: SurveyInputs;
  result: SizingResult;
  engineVersion: string;
  building: BuildingSnapshot;
  summary: SurveySummary;
  /** Normalised UTC instant of inputs.surveyedAt, for ordering and date filters. */
  surveyedAtUtc: string;
}

export interface RevisionRecord extends Omit<NewRevision, "surveyedAtUtc"> {
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
