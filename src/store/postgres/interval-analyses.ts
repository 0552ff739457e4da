import type { IntervalAnalysesRepository } from "../ports.js";
import type { IntervalAnalysisListEntry, IntervalAnalysisRecord } from "../types.js";
import { all, jsonb, one, type Sql } from "./sql.js";

const ENTRY = `id, building_id AS "buildingId", created_at AS "createdAt", target_pf AS "targetPF",
  interval_count AS "intervalCount", interval_minutes AS "intervalMinutes", first_timestamp AS "firstTimestamp",
  last_timestamp AS "lastTimestamp", hold99_kvar AS "hold99PctKvar", min_kvar AS "minKvar"`;
const RECORD = `${ENTRY}, actor, request_id AS "requestId", summary_json AS summary`;

/** Interval analyses stored with a building: written once, never changed. Every statement filters by organisation. */
export function postgresIntervalAnalyses(sql: Sql): IntervalAnalysesRepository {
  const get = (orgId: string, id: string) =>
    one<IntervalAnalysisRecord>(sql, `SELECT ${RECORD} FROM interval_analyses WHERE org_id = $1 AND id = $2`, [orgId, id]);
  return {
    get,
    async create(orgId, a) {
      const s = a.summary;
      const row = await one<IntervalAnalysisRecord>(
        sql,
        `INSERT INTO interval_analyses (id, org_id, building_id, created_at, actor, request_id, target_pf, interval_count,
           interval_minutes, first_timestamp, last_timestamp, hold99_kvar, min_kvar, summary_json)
         VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11, $12, $13, $14)
         RETURNING ${RECORD}`,
        [
          a.id,
          orgId,
          a.buildingId,
          a.createdAt,
          a.actor,
          a.requestId,
          s.targetPF,
          s.intervalCount,
          s.intervalMinutes,
          s.firstTimestamp,
          s.lastTimestamp,
          s.neededKvar.hold99PctKvar,
          s.minimumReactiveDemand.minKvar,
          jsonb(s),
        ],
      );
      if (!row) throw new Error(`interval analysis ${a.id} was not stored`);
      return row;
    },
    newestOf: (orgId, buildingId) =>
      one<IntervalAnalysisRecord>(sql, `SELECT ${RECORD} FROM interval_analyses WHERE org_id = $1 AND building_id = $2 ORDER BY seq DESC LIMIT 1`, [
        orgId,
        buildingId,
      ]),
    listByBuilding: (orgId, buildingId, q) =>
      all<IntervalAnalysisListEntry>(
        sql,
        `SELECT seq, ${ENTRY} FROM interval_analyses
         WHERE org_id = $1 AND building_id = $2 AND ($3::bigint IS NULL OR seq < $3::bigint)
         ORDER BY seq DESC LIMIT $4`,
        [orgId, buildingId, q.beforeSeq ?? null, q.limit],
      ),
  };
}
