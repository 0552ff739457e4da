import type { SizingInput } from "../core/inputs.js";
import { size, type SizingResult } from "../core/sizing.js";
import type { BuildingRecord, BuildingSnapshot, NewRevision, SurveyInputs, SurveySummary } from "../store/types.js";
import { utcInstant } from "./paging.js";
import { engineIssuesTo400 } from "./validate.js";

/** The translation between a stored building + submitted survey and the pure engine. */

export function snapshotOf(b: BuildingRecord): BuildingSnapshot {
  return { buildingVersion: b.version, system: b.system, transformer: b.transformer, utility: b.utility };
}

export function engineInputOf(snapshot: BuildingSnapshot, s: SurveyInputs): SizingInput {
  const { surveyedAt: _at, surveyor: _by, notes: _notes, ...sizing } = s;
  return {
    ...sizing,
    system: snapshot.system,
    ...(snapshot.transformer ? { transformer: snapshot.transformer } : {}),
    ...(snapshot.utility ? { utility: snapshot.utility } : {}),
  };
}

export function summaryOf(result: SizingResult): SurveySummary {
  return {
    kW: result.site.kW,
    kvar: result.site.kvar,
    kVA: result.site.kVA,
    displacementPF: result.site.displacementPF,
    kvarRequired: result.correction.kvarRequired,
    warningCount: result.warnings.length,
  };
}

export interface RevisionMeta {
  surveyId: string;
  n: number;
  reason: string | null;
  actor: string;
  at: string;
}

/** Size the survey with the building's current data; the engine's plausibility issues are a 400. */
export function computeRevision(building: BuildingRecord, inputs: SurveyInputs, meta: RevisionMeta): NewRevision {
  const snapshot = snapshotOf(building);
  const outcome = size(engineInputOf(snapshot, inputs));
  if (!outcome.ok) throw engineIssuesTo400(outcome.issues);
  return {
    surveyId: meta.surveyId,
    n: meta.n,
    reason: meta.reason,
    createdAt: meta.at,
    actor: meta.actor,
    inputs,
    result: outcome.result,
    engineVersion: outcome.result.engineVersion,
    building: snapshot,
    summary: summaryOf(outcome.result),
    surveyedAtUtc: utcInstant(inputs.surveyedAt),
  };
}
