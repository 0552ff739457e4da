/** A stored survey revision (and its building) as the report's input: pure, the store is read by the caller. */
import { engineInputOf } from "../application/survey-sizing.js";
import type { BuildingData, RevisionRecord } from "../store/types.js";
import type { ReportInput } from "./types.js";

/** `building` is the building's data at the revision's snapshot version (or its current data when that is gone). */
export function surveyReportInput(r: RevisionRecord, building: Pick<BuildingData, "name" | "address" | "notes"> | undefined): ReportInput {
  const snap = r.building;
  return {
    ...(building
      ? {
          building: {
            name: building.name,
            address: building.address,
            notes: building.notes,
            system: snap.system,
            transformer: snap.transformer,
            utility: snap.utility,
            buildingVersion: snap.buildingVersion,
          },
        }
      : {}),
    survey: {
      id: r.surveyId,
      revision: r.n,
      surveyedAt: r.inputs.surveyedAt,
      surveyor: r.inputs.surveyor,
      ...(r.inputs.notes ? { notes: r.inputs.notes } : {}),
      engineVersion: r.engineVersion,
      createdAt: r.createdAt,
      reason: r.reason,
    },
    inputs: engineInputOf(snap, r.inputs),
    result: r.result,
  };
}
