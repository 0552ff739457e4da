import type { SurveysRepository } from "../ports.js";
import type { NewRevision, RevisionRecord, SurveyHead, SurveyRange, SurveyResultRow } from "../types.js";
import { all, jsonb, one, type Sql } from "./sql.js";

/** The head's columns under the record's own names. */
const HEAD = `id, building_id AS "buildingId", created_at AS "createdAt", latest_revision AS revision,
  surveyed_at AS "surveyedAt", surveyed_at_utc AS "surveyedAtUtc", surveyor, kw AS "kW", kvar, kva AS "kVA",
  displacement_pf AS "displacementPF", kvar_required AS "kvarRequired", warning_count AS "warningCount",
  installed_kvar_in_service AS "installedKvarInService", installed_kvar_delivered AS "installedKvarDelivered"`;

const SUMMARY = `r.kw AS "kW", r.kvar, r.kva AS "kVA", r.displacement_pf AS "displacementPF", r.kvar_required AS "kvarRequired",
  r.warning_count AS "warningCount", r.installed_kvar_in_service AS "installedKvarInService",
  r.installed_kvar_delivered AS "installedKvarDelivered"`;

type RevisionRow = Omit<RevisionRecord, "summary"> & RevisionRecord["summary"];

function revisionOf(r: RevisionRow): RevisionRecord {
  const { kW, kvar, kVA, displacementPF, kvarRequired, warningCount, installedKvarInService, installedKvarDelivered, ...rest } = r;
  return { ...rest, summary: { kW, kvar, kVA, displacementPF, kvarRequired, warningCount, installedKvarInService, installedKvarDelivered } };
}

/** $1 org, $2 survey id, $3 n, then the summary and when/who: shared by the head's insert and move. */
function headValues(orgId: string, r: NewRevision): unknown[] {
  const s = r.summary;
  return [
    orgId,
    r.surveyId,
    r.n,
    r.inputs.surveyedAt,
    r.surveyedAtUtc,
    r.inputs.surveyor,
    s.kW,
    s.kvar,
    s.kVA,
    s.displacementPF,
    s.kvarRequired,
    s.warningCount,
    s.installedKvarInService,
    s.installedKvarDelivered,
  ];
}

/** Surveys (a head row with the latest revision's summary) and their immutable revisions. */
export function postgresSurveys(sql: Sql): SurveysRepository {
  const insertRevision = (orgId: string, r: NewRevision) => {
    const s = r.summary;
    return sql.query(
      `INSERT INTO survey_revisions (org_id, survey_id, n, reason, created_at, actor, inputs_json, result_json,
         engine_version, building_snapshot_json, kw, kvar, kva, displacement_pf, kvar_required, warning_count,
         installed_kvar_in_service, installed_kvar_delivered)
       VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11, $12, $13, $14, $15, $16, $17, $18)`,
      [
        orgId,
        r.surveyId,
        r.n,
        r.reason,
        r.createdAt,
        r.actor,
        jsonb(r.inputs),
        r.resultUtf8 ? Buffer.from(r.resultUtf8.buffer, r.resultUtf8.byteOffset, r.resultUtf8.byteLength).toString("utf8") : jsonb(r.result),
        r.engineVersion,
        jsonb(r.building),
        s.kW,
        s.kvar,
        s.kVA,
        s.displacementPF,
        s.kvarRequired,
        s.warningCount,
        s.installedKvarInService,
        s.installedKvarDelivered,
      ],
    );
  };
  const range = (q: SurveyRange) => [q.fromUtc ?? null, q.toUtc ?? null];
  const RANGE = `org_id = $1 AND building_id = $2
    AND ($3::timestamptz IS NULL OR surveyed_at_utc >= $3::timestamptz) AND ($4::timestamptz IS NULL OR surveyed_at_utc <= $4::timestamptz)`;

  return {
    async create(orgId, buildingId, first) {
      await sql.query(
        `INSERT INTO surveys (org_id, id, latest_revision, surveyed_at, surveyed_at_utc, surveyor, kw, kvar, kva,
           displacement_pf, kvar_required, warning_count, installed_kvar_in_service, installed_kvar_delivered,
           building_id, created_at)
         VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11, $12, $13, $14, $15, $16)`,
        [...headValues(orgId, first), buildingId, first.createdAt],
      );
      await insertRevision(orgId, first);
    },
    async revise(orgId, next) {
      const moved = await sql.query(
        `UPDATE surveys SET latest_revision = $3, surveyed_at = $4, surveyed_at_utc = $5, surveyor = $6, kw = $7,
           kvar = $8, kva = $9, displacement_pf = $10, kvar_required = $11, warning_count = $12,
           installed_kvar_in_service = $13, installed_kvar_delivered = $14
         WHERE org_id = $1 AND id = $2 AND latest_revision = $3 - 1`,
        headValues(orgId, next),
      );
      if (moved.rowCount !== 1) return false;
      await insertRevision(orgId, next);
      return true;
    },
    head: (orgId, id) => one<SurveyHead>(sql, `SELECT ${HEAD} FROM surveys WHERE org_id = $1 AND id = $2`, [orgId, id]),
    async revision(orgId, id, n) {
      const row = await one<RevisionRow>(
        sql,
        `SELECT r.survey_id AS "surveyId", s.building_id AS "buildingId", r.n, r.reason, r.created_at AS "createdAt",
           r.actor, r.inputs_json AS inputs, r.result_json AS result, r.engine_version AS "engineVersion",
           r.building_snapshot_json AS building, ${SUMMARY}
         FROM survey_revisions r JOIN surveys s ON s.org_id = r.org_id AND s.id = r.survey_id
         WHERE r.org_id = $1 AND r.survey_id = $2 AND r.n = $3`,
        [orgId, id, n],
      );
      return row && revisionOf(row);
    },
    revisions: (orgId, id) =>
      all(sql, `SELECT n, created_at AS "createdAt", reason FROM survey_revisions WHERE org_id = $1 AND survey_id = $2 ORDER BY n`, [orgId, id]),
    listByBuilding: (orgId, buildingId, q) =>
      all<SurveyHead>(
        sql,
        `SELECT ${HEAD} FROM surveys WHERE ${RANGE}
           AND ($5::timestamptz IS NULL OR surveyed_at_utc < $5::timestamptz OR (surveyed_at_utc = $5::timestamptz AND id < $6::text))
         ORDER BY surveyed_at_utc DESC, id DESC LIMIT $7`,
        [orgId, buildingId, ...range(q), q.before?.t ?? null, q.before?.id ?? null, q.limit],
      ),
    trend: (orgId, buildingId, q) =>
      all<SurveyHead>(sql, `SELECT ${HEAD} FROM surveys WHERE ${RANGE} ORDER BY surveyed_at_utc, id LIMIT $5`, [
        orgId,
        buildingId,
        ...range(q),
        q.limit,
      ]),
    withInstalledBanks: (orgId, buildingId, limit) =>
      all<SurveyResultRow>(
        sql,
        `SELECT s.id AS "surveyId", s.surveyed_at AS "surveyedAt", r.result_json AS result, r.building_snapshot_json AS building
           FROM surveys s JOIN survey_revisions r ON r.org_id = s.org_id AND r.survey_id = s.id AND r.n = s.latest_revision
          WHERE s.org_id = $1 AND s.building_id = $2 AND s.installed_kvar_in_service IS NOT NULL
          ORDER BY s.surveyed_at_utc, s.id LIMIT $3`,
        [orgId, buildingId, limit],
      ),
  };
}
