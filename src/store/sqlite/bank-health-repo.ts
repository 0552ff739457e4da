import type { SizingResult } from "../../core/pipeline/size.js";
import type { Db } from "./database.js";
import type { BuildingSnapshot, SurveyResultRow } from "../types.js";

/** The latest revision's result and snapshot of each survey of a building, oldest first: for series read from results. */
export function surveyResultsRepo(db: Db) {
  const rows = db.prepare(
    `SELECT s.id, s.surveyed_at, r.result_json, r.building_snapshot_json
       FROM surveys s JOIN survey_revisions r ON r.org_id = s.org_id AND r.survey_id = s.id AND r.n = s.latest_revision
      WHERE s.org_id = ? AND s.building_id = ? AND s.installed_kvar_in_service IS NOT NULL
      ORDER BY s.surveyed_at_utc, s.id LIMIT ?`,
  );
  return {
    /** Only surveys that had installed banks (the column is null otherwise, so no JSON is parsed for the rest). */
    withInstalledBanks(orgId: string, buildingId: string, limit: number): SurveyResultRow[] {
      return (rows.all(orgId, buildingId, limit) as { id: string; surveyed_at: string; result_json: string; building_snapshot_json: string }[]).map(
        (r) => ({
          surveyId: r.id,
          surveyedAt: r.surveyed_at,
          result: JSON.parse(r.result_json) as SizingResult,
          building: JSON.parse(r.building_snapshot_json) as BuildingSnapshot,
        }),
      );
    },
  };
}
