import type {
  BuildingRecord,
  BuildingSnapshot,
  BuildingVersion,
  IntervalAnalysisListEntry,
  IntervalAnalysisRecord,
  RevisionListEntry,
  RevisionRecord,
  SurveyHead,
} from "../store/types.js";

/** Store records → response bodies (field order fixed here, nothing computed). */

export function buildingView(b: BuildingRecord) {
  return {
    id: b.id,
    version: b.version,
    name: b.name,
    address: b.address,
    notes: b.notes,
    system: b.system,
    transformer: b.transformer,
    utility: b.utility,
    economics: b.economics,
    installedBanks: b.installedBanks ?? [],
    createdAt: b.createdAt,
    updatedAt: b.updatedAt,
  };
}

export function buildingVersionView(v: BuildingVersion) {
  return {
    version: v.version,
    recordedAt: v.recordedAt,
    actor: v.actor,
    ...v.data,
    economics: v.data.economics ?? null,
    installedBanks: v.data.installedBanks ?? [],
  };
}

/** Snapshots stored before economics and interval analyses existed lack those keys: they had none. */
function snapshotView(s: BuildingSnapshot) {
  return { ...s, economics: s.economics ?? null, intervalAnalysisId: s.intervalAnalysisId ?? null, installedBanks: s.installedBanks ?? [] };
}

function revisionFields(r: RevisionRecord) {
  return {
    buildingId: r.buildingId,
    revision: r.n,
    createdAt: r.createdAt,
    actor: r.actor,
    reason: r.reason,
    engineVersion: r.engineVersion,
    inputs: r.inputs,
    result: r.result,
    building: snapshotView(r.building),
  };
}

export function revisionView(r: RevisionRecord) {
  return { surveyId: r.surveyId, ...revisionFields(r) };
}

export function surveyView(latest: RevisionRecord, revisions: RevisionListEntry[]) {
  return { id: latest.surveyId, ...revisionFields(latest), revisions };
}

export function surveySummaryView(h: SurveyHead) {
  return {
    id: h.id,
    revision: h.revision,
    surveyedAt: h.surveyedAt,
    surveyor: h.surveyor,
    kW: h.kW,
    kvar: h.kvar,
    displacementPF: h.displacementPF,
    kvarRequired: h.kvarRequired,
    warningCount: h.warningCount,
  };
}

export function trendPointView(h: SurveyHead) {
  return {
    surveyId: h.id,
    revision: h.revision,
    surveyedAt: h.surveyedAt,
    kW: h.kW,
    kvar: h.kvar,
    displacementPF: h.displacementPF,
    kvarRequired: h.kvarRequired,
    installedKvarInService: h.installedKvarInService,
    kvarDelivered: h.installedKvarDelivered,
  };
}

export function intervalAnalysisView(a: IntervalAnalysisRecord) {
  return {
    id: a.id,
    buildingId: a.buildingId,
    createdAt: a.createdAt,
    actor: a.actor,
    targetPF: a.targetPF,
    intervalCount: a.intervalCount,
    intervalMinutes: a.intervalMinutes,
    firstTimestamp: a.firstTimestamp,
    lastTimestamp: a.lastTimestamp,
    summary: a.summary,
  };
}

export function intervalAnalysisListView(e: IntervalAnalysisListEntry) {
  return {
    id: e.id,
    createdAt: e.createdAt,
    targetPF: e.targetPF,
    intervalCount: e.intervalCount,
    intervalMinutes: e.intervalMinutes,
    firstTimestamp: e.firstTimestamp,
    lastTimestamp: e.lastTimestamp,
    hold99PctKvar: e.hold99PctKvar,
    minKvar: e.minKvar,
  };
}
