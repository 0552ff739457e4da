import type { SizingResult } from "../../core/pipeline/size.js";
import type { Db } from "./database.js";
import type {
  BuildingSnapshot,
  NewRevision,
  RevisionListEntry,
  RevisionRecord,
  SurveyHead,
  SurveyInputs,
  SurveyPageQuery,
  SurveyRange,
} from "../types.js";

interface HeadRow {
  id: string;
  building_id: string;
  created_at: string;
  latest_revision: number;
  surveyed_at: string;
  surveyed_at_utc: string;
  surveyor: string;
  kw: number;
  kvar: number;
  kva: number;
  displacement_pf: number;
  kvar_required: number;
  warning_count: number;
  installed_kvar_in_service: number | null;
  installed_kvar_delivered: number | null;
}

interface RevisionRow {
  survey_id: string;
  building_id: string;
  n: number;
  reason: string | null;
  created_at: string;
  actor: string;
  inputs_json: string;
  result_json: string;
  engine_version: string;
  building_snapshot_json: string;
  kw: number;
  kvar: number;
  kva: number;
  displacement_pf: number;
  kvar_required: number;
  warning_count: number;
  installed_kvar_in_service: number | null;
  installed_kvar_delivered: number | null;
}

const HEAD =
  "id, building_id, created_at, latest_revision, surveyed_at, surveyed_at_utc, surveyor, kw, kvar, kva, displacement_pf, kvar_required, warning_count, installed_kvar_in_service, installed_kvar_delivered";

function headFromRow(r: HeadRow): SurveyHead {
  return {
    id: r.id,
    buildingId: r.building_id,
    createdAt: r.created_at,
    revision: r.latest_revision,
    surveyedAt: r.surveyed_at,
    surveyedAtUtc: r.surveyed_at_utc,
    surveyor: r.surveyor,
    kW: r.kw,
    kvar: r.kvar,
    kVA: r.kva,
    displacementPF: r.displacement_pf,
    kvarRequired: r.kvar_required,
    warningCount: r.warning_count,
    installedKvarInService: r.installed_kvar_in_service ?? null,
    installedKvarDelivered: r.installed_kvar_delivered ?? null,
  };
}

function revisionFromRow(r: RevisionRow): RevisionRecord {
  return {
    surveyId: r.survey_id,
    buildingId: r.building_id,
    n: r.n,
    reason: r.reason,
    createdAt: r.created_at,
    actor: r.actor,
    inputs: JSON.parse(r.inputs_json) as SurveyInputs,
    result: JSON.parse(r.result_json) as SizingResult,
    engineVersion: r.engine_version,
    building: JSON.parse(r.building_snapshot_json) as BuildingSnapshot,
    summary: {
      kW: r.kw,
      kvar: r.kvar,
      kVA: r.kva,
      displacementPF: r.displacement_pf,
      kvarRequired: r.kvar_required,
      warningCount: r.warning_count,
      installedKvarInService: r.installed_kvar_in_service ?? null,
      installedKvarDelivered: r.installed_kvar_delivered ?? null,
    },
  };
}

export type SurveysRepo = ReturnType<typeof surveysRepo>;

/** Bytes as a Buffer without copying (better-sqlite3 binds Buffers; a TextEncoder gives a plain Uint8Array). */
const bufferOf = (b: Uint8Array): Buffer => (Buffer.isBuffer(b) ? b : Buffer.from(b.buffer, b.byteOffset, b.byteLength));

/** Surveys (a head row with the latest revision's summary) and their immutable revisions. */
export function surveysRepo(db: Db) {
  const insertHead = db.prepare(
    `INSERT INTO surveys (org_id, ${HEAD})
     VALUES (@org_id, @id, @building_id, @created_at, @n, @surveyed_at, @surveyed_at_utc, @surveyor,
             @kw, @kvar, @kva, @displacement_pf, @kvar_required, @warning_count,
             @installed_kvar_in_service, @installed_kvar_delivered)`,
  );
  const moveHead = db.prepare(
    `UPDATE surveys SET latest_revision = @n, surveyed_at = @surveyed_at, surveyed_at_utc = @surveyed_at_utc,
       surveyor = @surveyor, kw = @kw, kvar = @kvar, kva = @kva, displacement_pf = @displacement_pf,
       kvar_required = @kvar_required, warning_count = @warning_count,
       installed_kvar_in_service = @installed_kvar_in_service, installed_kvar_delivered = @installed_kvar_delivered
     WHERE org_id = @org_id AND id = @id AND latest_revision = @n - 1`,
  );
  const insertRevision = db.prepare(
    `INSERT INTO survey_revisions (org_id, survey_id, n, reason, created_at, actor, inputs_json, result_json,
       engine_version, building_snapshot_json, kw, kvar, kva, displacement_pf, kvar_required, warning_count,
       installed_kvar_in_service, installed_kvar_delivered)
     VALUES (@org_id, @id, @n, @reason, @created_at, @actor, @inputs_json, CAST(@result_json AS TEXT), @engine_version,
       @building_snapshot_json, @kw, @kvar, @kva, @displacement_pf, @kvar_required, @warning_count,
       @installed_kvar_in_service, @installed_kvar_delivered)`,
  );
  const headById = db.prepare(`SELECT ${HEAD} FROM surveys WHERE org_id = ? AND id = ?`);
  const revision = db.prepare(
    `SELECT r.*, s.building_id FROM survey_revisions r JOIN surveys s ON s.org_id = r.org_id AND s.id = r.survey_id
     WHERE r.org_id = ? AND r.survey_id = ? AND r.n = ?`,
  );
  const revisionList = db.prepare("SELECT n, created_at AS createdAt, reason FROM survey_revisions WHERE org_id = ? AND survey_id = ? ORDER BY n");
  const RANGE = `org_id = @org_id AND building_id = @building_id
       AND (@from IS NULL OR surveyed_at_utc >= @from) AND (@to IS NULL OR surveyed_at_utc <= @to)`;
  const newestFirst = db.prepare(
    `SELECT ${HEAD} FROM surveys WHERE ${RANGE}
       AND (@before_t IS NULL OR surveyed_at_utc < @before_t OR (surveyed_at_utc = @before_t AND id < @before_id))
     ORDER BY surveyed_at_utc DESC, id DESC LIMIT @limit`,
  );
  const oldestFirst = db.prepare(`SELECT ${HEAD} FROM surveys WHERE ${RANGE} ORDER BY surveyed_at_utc, id LIMIT @limit`);

  function params(orgId: string, r: NewRevision) {
    return {
      org_id: orgId,
      id: r.surveyId,
      n: r.n,
      reason: r.reason,
      created_at: r.createdAt,
      actor: r.actor,
      surveyed_at: r.inputs.surveyedAt,
      surveyed_at_utc: r.surveyedAtUtc,
      surveyor: r.inputs.surveyor,
      inputs_json: JSON.stringify(r.inputs),
      // bytes bind as a BLOB; the insert's CAST stores them as the TEXT they are (UTF-8, the file's encoding)
      result_json: r.resultUtf8 ? bufferOf(r.resultUtf8) : JSON.stringify(r.result),
      engine_version: r.engineVersion,
      building_snapshot_json: JSON.stringify(r.building),
      kw: r.summary.kW,
      kvar: r.summary.kvar,
      kva: r.summary.kVA,
      displacement_pf: r.summary.displacementPF,
      kvar_required: r.summary.kvarRequired,
      warning_count: r.summary.warningCount,
      installed_kvar_in_service: r.summary.installedKvarInService,
      installed_kvar_delivered: r.summary.installedKvarDelivered,
    };
  }
  const range = (orgId: string, buildingId: string, q: SurveyRange) => ({
    org_id: orgId,
    building_id: buildingId,
    from: q.fromUtc ?? null,
    to: q.toUtc ?? null,
  });

  return {
    /** A new survey with its first revision. */
    create(orgId: string, buildingId: string, first: NewRevision): void {
      const p = params(orgId, first);
      insertHead.run({ ...p, building_id: buildingId });
      insertRevision.run(p);
    },
    /** Append revision n (= latest + 1) and move the head's summary to it; false if n is not next. */
    revise(orgId: string, next: NewRevision): boolean {
      const p = params(orgId, next);
      if (moveHead.run(p).changes !== 1) return false;
      insertRevision.run(p);
      return true;
    },
    head(orgId: string, id: string): SurveyHead | undefined {
      const row = headById.get(orgId, id) as HeadRow | undefined;
      return row && headFromRow(row);
    },
    revision(orgId: string, id: string, n: number): RevisionRecord | undefined {
      const row = revision.get(orgId, id, n) as RevisionRow | undefined;
      return row && revisionFromRow(row);
    },
    revisions(orgId: string, id: string): RevisionListEntry[] {
      return revisionList.all(orgId, id) as RevisionListEntry[];
    },
    /** Newest first by surveyed time, then id. */
    listByBuilding(orgId: string, buildingId: string, q: SurveyPageQuery): SurveyHead[] {
      const rows = newestFirst.all({
        ...range(orgId, buildingId, q),
        before_t: q.before?.t ?? null,
        before_id: q.before?.id ?? null,
        limit: q.limit,
      }) as HeadRow[];
      return rows.map(headFromRow);
    },
    /** Oldest first, for trends. */
    trend(orgId: string, buildingId: string, q: SurveyRange & { limit: number }): SurveyHead[] {
      return (oldestFirst.all({ ...range(orgId, buildingId, q), limit: q.limit }) as HeadRow[]).map(headFromRow);
    },
  };
}
