import { jsonBytes } from "./json-bytes.js";
import type { IntervalDemandInput, SizingInput } from "../core/inputs.js";
import { intervalDemandOf } from "../core/interval/stored-demand.js";
import { size, type SizingResult } from "../core/pipeline/size.js";
import type { BuildingRecord, BuildingSnapshot, IntervalAnalysisRecord, NewRevision, SurveyInputs, SurveySummary } from "../store/types.js";
import { InputRejected } from "./errors.js";
import { utcInstantOf } from "./instants.js";

/** The translation between a stored building + submitted survey and the pure engine. */

/** The building's data a revision is computed with, and the id of the interval analysis used (null: none). */
export function snapshotOf(b: BuildingRecord, intervalAnalysisId: string | null = null): BuildingSnapshot {
  return {
    buildingVersion: b.version,
    system: b.system,
    transformer: b.transformer,
    utility: b.utility,
    economics: b.economics,
    intervalAnalysisId,
    ...(b.installedBanks && b.installedBanks.length > 0 ? { installedBanks: b.installedBanks } : {}),
  };
}

/** `intervalDemand` comes from the analysis the snapshot names (the snapshot keeps only its id). */
export function engineInputOf(snapshot: BuildingSnapshot, s: SurveyInputs, intervalDemand?: IntervalDemandInput): SizingInput {
  const { surveyedAt: _at, surveyor: _by, notes: _notes, intervalAnalysisId: _ia, ...sizing } = s;
  return {
    ...sizing,
    system: snapshot.system,
    ...(snapshot.transformer ? { transformer: snapshot.transformer } : {}),
    ...(snapshot.utility ? { utility: snapshot.utility } : {}),
    ...(snapshot.economics ? { economics: snapshot.economics } : {}),
    ...(snapshot.installedBanks && snapshot.installedBanks.length > 0 ? { installedBanks: snapshot.installedBanks } : {}),
    ...(intervalDemand ? { intervalDemand } : {}),
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
    installedKvarInService: result.installedBanks ? result.installedBanks.reduce((s, b) => s + b.inServiceKvar, 0) : null,
    installedKvarDelivered: result.correction.kvarInstalledInService ?? null,
  };
}

export interface RevisionMeta {
  surveyId: string;
  n: number;
  reason: string | null;
  actor: string;
  at: string;
}

function sized(building: BuildingRecord, inputs: SurveyInputs, analysis: IntervalAnalysisRecord | undefined) {
  const snapshot = snapshotOf(building, analysis?.id ?? null);
  return { snapshot, outcome: size(engineInputOf(snapshot, inputs, analysis ? intervalDemandOf(analysis.summary) : undefined)) };
}

function revisionOf(meta: RevisionMeta, inputs: SurveyInputs, snapshot: BuildingSnapshot, result: SizingResult): NewRevision {
  return {
    surveyId: meta.surveyId,
    n: meta.n,
    reason: meta.reason,
    createdAt: meta.at,
    actor: meta.actor,
    inputs,
    result,
    engineVersion: result.engineVersion,
    building: snapshot,
    summary: summaryOf(result),
    surveyedAtUtc: utcInstantOf(inputs.surveyedAt) ?? inputs.surveyedAt,
  };
}

/**
 * Size the survey with the building's current data (and `analysis`, an interval analysis of the building, when
 * given); implausible readings throw InputRejected.
 */
export function computeRevision(building: BuildingRecord, inputs: SurveyInputs, meta: RevisionMeta, analysis?: IntervalAnalysisRecord): NewRevision {
  const { snapshot, outcome } = sized(building, inputs, analysis);
  if (!outcome.ok) throw new InputRejected(outcome.issues);
  return revisionOf(meta, inputs, snapshot, outcome.result);
}

/**
 * A revision whose result is also held as UTF-8 JSON. A sized result is some 80 KB of JSON whose serialisation
 * costs more than the engine: it is serialised once, here, and those bytes are what the store writes and what the
 * answer carries (bytes, not a string: they go to SQLite and to the socket without being encoded again).
 */
export type SerializedRevision = NewRevision & { resultUtf8: Uint8Array };

/** computeRevision, with the result serialised once. */
export function computeSerializedRevision(
  building: BuildingRecord,
  inputs: SurveyInputs,
  meta: RevisionMeta,
  analysis?: IntervalAnalysisRecord,
): SerializedRevision {
  const revision = computeRevision(building, inputs, meta, analysis);
  return { ...revision, resultUtf8: jsonBytes(revision.result) };
}
