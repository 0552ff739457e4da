import type { BuildingRecord, BuildingVersion, RevisionRecord, RevisionListEntry, SurveyHead } from "../store/types.js";

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
    createdAt: b.createdAt,
    updatedAt: b.updatedAt,
  };
}

export function buildingVersionView(v: BuildingVersion) {
  return { version: v.version, recordedAt: v.recordedAt, actor: v.actor, ...v.data };
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
    building: r.building,
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
  };
}
