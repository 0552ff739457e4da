import type { IntervalSummary } from "../../core/interval/summary.js";
import type { Db } from "./database.js";
import type { IntervalAnalysisListEntry, IntervalAnalysisRecord, NewIntervalAnalysis } from "../types.js";

interface ListRow {
  seq: number;
  id: string;
  building_id: string;
  created_at: string;
  target_pf: number;
  interval_count: number;
  interval_minutes: number;
  first_timestamp: string;
  last_timestamp: string;
  hold99_kvar: number;
  min_kvar: number;
}

interface FullRow extends ListRow {
  actor: string;
  request_id: string | null;
  summary_json: string;
}

const LIST_COLUMNS =
  "seq, id, building_id, created_at, target_pf, interval_count, interval_minutes, first_timestamp, last_timestamp, hold99_kvar, min_kvar";

function entryOf(r: ListRow): IntervalAnalysisListEntry {
  return {
    seq: r.seq,
    id: r.id,
    buildingId: r.building_id,
    createdAt: r.created_at,
    targetPF: r.target_pf,
    intervalCount: r.interval_count,
    intervalMinutes: r.interval_minutes,
    firstTimestamp: r.first_timestamp,
    lastTimestamp: r.last_timestamp,
    hold99PctKvar: r.hold99_kvar,
    minKvar: r.min_kvar,
  };
}

function recordOf(r: FullRow): IntervalAnalysisRecord {
  const { seq: _seq, ...entry } = entryOf(r);
  return { ...entry, actor: r.actor, requestId: r.request_id, summary: JSON.parse(r.summary_json) as IntervalSummary };
}

export type IntervalAnalysesRepo = ReturnType<typeof intervalAnalysesRepo>;

/** Interval analyses stored with a building: written once, never changed. Every statement filters by organisation. */
export function intervalAnalysesRepo(db: Db) {
  const insert = db.prepare(
    `INSERT INTO interval_analyses (id, org_id, building_id, created_at, actor, request_id, target_pf, interval_count,
       interval_minutes, first_timestamp, last_timestamp, hold99_kvar, min_kvar, summary_json)
     VALUES (@id, @org_id, @building_id, @created_at, @actor, @request_id, @target_pf, @interval_count,
       @interval_minutes, @first_timestamp, @last_timestamp, @hold99_kvar, @min_kvar, @summary_json)`,
  );
  const byId = db.prepare(`SELECT ${LIST_COLUMNS}, actor, request_id, summary_json FROM interval_analyses WHERE org_id = ? AND id = ?`);
  const newest = db.prepare(
    `SELECT ${LIST_COLUMNS}, actor, request_id, summary_json FROM interval_analyses
     WHERE org_id = ? AND building_id = ? ORDER BY seq DESC LIMIT 1`,
  );
  const page = db.prepare(
    `SELECT ${LIST_COLUMNS} FROM interval_analyses
     WHERE org_id = @org_id AND building_id = @building_id AND (@before IS NULL OR seq < @before)
     ORDER BY seq DESC LIMIT @limit`,
  );

  const get = (orgId: string, id: string): IntervalAnalysisRecord | undefined => {
    const row = byId.get(orgId, id) as FullRow | undefined;
    return row && recordOf(row);
  };

  return {
    get,
    create(orgId: string, a: NewIntervalAnalysis): IntervalAnalysisRecord {
      const s = a.summary;
      insert.run({
        id: a.id,
        org_id: orgId,
        building_id: a.buildingId,
        created_at: a.createdAt,
        actor: a.actor,
        request_id: a.requestId,
        target_pf: s.targetPF,
        interval_count: s.intervalCount,
        interval_minutes: s.intervalMinutes,
        first_timestamp: s.firstTimestamp,
        last_timestamp: s.lastTimestamp,
        hold99_kvar: s.neededKvar.hold99PctKvar,
        min_kvar: s.minimumReactiveDemand.minKvar,
        summary_json: JSON.stringify(s),
      });
      const stored = get(orgId, a.id);
      if (!stored) throw new Error(`interval analysis ${a.id} vanished inside its own transaction`);
      return stored;
    },
    /** The most recently stored analysis of a building. */
    newestOf(orgId: string, buildingId: string): IntervalAnalysisRecord | undefined {
      const row = newest.get(orgId, buildingId) as FullRow | undefined;
      return row && recordOf(row);
    },
    /** Newest first; `beforeSeq` continues after the last entry of the previous page. */
    listByBuilding(orgId: string, buildingId: string, q: { beforeSeq?: number; limit: number }): IntervalAnalysisListEntry[] {
      const rows = page.all({ org_id: orgId, building_id: buildingId, before: q.beforeSeq ?? null, limit: q.limit }) as ListRow[];
      return rows.map(entryOf);
    },
  };
}
