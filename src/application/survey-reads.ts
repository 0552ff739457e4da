/** Reads of stored surveys and what their reports and bank-health series need: always as stored, never recomputed. */
import { bankHealthSeries, type HealthSeries } from "./bank-health.js";
import { findBuilding } from "./buildings.js";
import { NotFound } from "./errors.js";
import type { Repositories } from "../store/ports.js";
import type { RevisionListEntry, RevisionRecord } from "../store/types.js";
import { surveyReportInput } from "../report/survey-input.js";
import type { ReportInput } from "../report/types.js";

/** Revision n of a survey, or its latest when n is absent. */
export async function revisionOf(repos: Repositories, orgId: string, id: string, n?: number): Promise<RevisionRecord> {
  if (n !== undefined) {
    const r = await repos.surveys.revision(orgId, id, n);
    if (r) return r;
    throw new NotFound((await repos.surveys.head(orgId, id)) ? `revision ${n} of survey ${id}` : `survey ${id}`);
  }
  const head = await repos.surveys.head(orgId, id);
  const latest = head && (await repos.surveys.revision(orgId, id, head.revision));
  if (!latest) throw new NotFound(`survey ${id}`);
  return latest;
}

export async function surveyWithRevisions(
  repos: Repositories,
  orgId: string,
  id: string,
): Promise<{ latest: RevisionRecord; revisions: RevisionListEntry[] }> {
  const latest = await revisionOf(repos, orgId, id);
  return { latest, revisions: await repos.surveys.revisions(orgId, id) };
}

/** Surveys read per bank-health answer; more are left off and the answer says so. */
export const BANK_HEALTH_MAX_SURVEYS = 1000;

export async function bankHealthOf(repos: Repositories, orgId: string, buildingId: string): Promise<{ truncated: boolean; series: HealthSeries[] }> {
  await findBuilding(repos, orgId, buildingId);
  const rows = await repos.surveys.withInstalledBanks(orgId, buildingId, BANK_HEALTH_MAX_SURVEYS + 1);
  const series = bankHealthSeries(
    rows.slice(0, BANK_HEALTH_MAX_SURVEYS).map((r) => ({
      surveyId: r.surveyId,
      surveyedAt: r.surveyedAt,
      definitions: r.building.installedBanks ?? [],
      results: r.result.installedBanks ?? [],
    })),
  );
  return { truncated: rows.length > BANK_HEALTH_MAX_SURVEYS, series };
}

/** The building's installed-bank series up to this survey (this revision in place of its latest), for the capacitance chart. */
async function bankHistoryOf(repos: Repositories, orgId: string, r: RevisionRecord): Promise<Pick<ReportInput, "bankHistory">> {
  if (!r.result.installedBanks) return {};
  const rows = await repos.surveys.withInstalledBanks(orgId, r.buildingId, BANK_HEALTH_MAX_SURVEYS);
  const upTo = rows.findIndex((x) => x.surveyId === r.surveyId);
  const used = (upTo >= 0 ? rows.slice(0, upTo + 1) : rows).map((x) =>
    x.surveyId === r.surveyId ? { ...x, result: r.result, building: r.building } : x,
  );
  const bankHistory = bankHealthSeries(
    used.map((x) => ({
      surveyId: x.surveyId,
      surveyedAt: x.surveyedAt,
      definitions: x.building.installedBanks ?? [],
      results: x.result.installedBanks ?? [],
    })),
  );
  return { bankHistory };
}

/** A stored survey's report input: the revision, its building's data at the snapshot, the interval analysis it names, the bank history. */
export async function surveyReportData(
  repos: Repositories,
  orgId: string,
  id: string,
  n?: number,
): Promise<{ revision: RevisionRecord; input: ReportInput }> {
  const r = await revisionOf(repos, orgId, id, n);
  const current = await repos.buildings.get(orgId, r.buildingId);
  const atSnapshot = current && (await repos.buildings.history(orgId, r.buildingId)).find((v) => v.version === r.building.buildingVersion)?.data;
  const analysisId = r.building.intervalAnalysisId;
  const interval = analysisId ? (await repos.intervalAnalyses.get(orgId, analysisId))?.summary : undefined;
  const input = { ...surveyReportInput(r, atSnapshot ?? current), ...(interval ? { interval } : {}), ...(await bankHistoryOf(repos, orgId, r)) };
  return { revision: r, input };
}
