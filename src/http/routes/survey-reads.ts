import type { FastifyInstance } from "fastify";
import * as contracts from "../contracts/surveys.js";
import { z } from "zod";
import { findBuilding } from "../../application/buildings.js";
import { revisionOf, surveyWithRevisions } from "../../application/survey-reads.js";
import type { Store } from "../../store/ports.js";
import { loadsCsv } from "../loads-csv.js";
import { decodeCursor, encodeCursor, pageOf, parseLimit, rangeOf } from "../paging.js";
import { surveyListQuerySchema, trendQuerySchema } from "../schemas/surveys.js";
import { parseOr400 } from "../validate.js";
import { revisionView, surveySummaryView, surveyView, trendPointView } from "../views.js";

const idParams = z.object({ id: z.string() });
const revisionParams = z.object({
  id: z.string(),
  n: z.string().regex(/^[1-9]\d{0,8}$/, "n must be a revision number: a whole number from 1"),
});
const surveyCursor = z.object({ k: z.literal("s"), t: z.string(), i: z.string() });
export const TREND_MAX_POINTS = 5000;

/** Reads of stored surveys: always what was stored, never a recomputation. */
export async function surveyReadRoutes(app: FastifyInstance, opts: { store: Store }): Promise<void> {
  const { store } = opts;

  app.get("/v1/surveys/:id", { schema: contracts.getSurvey }, async (request) => {
    const { id } = parseOr400(idParams, request.params);
    const { orgId } = request.actor;
    const { latest, revisions } = await surveyWithRevisions(store, orgId, id);
    return surveyView(latest, revisions);
  });

  app.get("/v1/surveys/:id/revisions/:n", { schema: contracts.getSurveyRevision }, async (request) => {
    const { id, n } = parseOr400(revisionParams, request.params);
    const { orgId } = request.actor;
    return revisionView(await revisionOf(store, orgId, id, Number(n)));
  });

  app.get("/v1/surveys/:id/loads.csv", { schema: contracts.surveyLoadsCsv }, async (request, reply) => {
    const { id } = parseOr400(idParams, request.params);
    const latest = await revisionOf(store, request.actor.orgId, id);
    return reply
      .type("text/csv; charset=utf-8; header=present")
      .header("content-disposition", `attachment; filename="${id}-r${latest.n}-loads.csv"`)
      .send(loadsCsv(latest));
  });

  app.get("/v1/buildings/:id/surveys", { schema: contracts.listSurveys }, async (request) => {
    const { id } = parseOr400(idParams, request.params);
    const query = parseOr400(surveyListQuerySchema, request.query);
    const limit = parseLimit(query.limit);
    const before = decodeCursor("s", surveyCursor, query.cursor);
    const range = rangeOf(query);
    const { orgId } = request.actor;
    await findBuilding(store, orgId, id);
    const rows = await store.surveys.listByBuilding(orgId, id, {
      ...range,
      ...(before ? { before: { t: before.t, id: before.i } } : {}),
      limit: limit + 1,
    });
    const page = pageOf(rows, limit, (last) => encodeCursor("s", { t: last.surveyedAtUtc, i: last.id }));
    return { items: page.items.map(surveySummaryView), nextCursor: page.nextCursor };
  });

  app.get("/v1/buildings/:id/trend", { schema: contracts.buildingTrend }, async (request) => {
    const { id } = parseOr400(idParams, request.params);
    const range = rangeOf(parseOr400(trendQuerySchema, request.query));
    const { orgId } = request.actor;
    await findBuilding(store, orgId, id);
    const rows = await store.surveys.trend(orgId, id, { ...range, limit: TREND_MAX_POINTS + 1 });
    return {
      buildingId: id,
      order: "oldest_first",
      truncated: rows.length > TREND_MAX_POINTS,
      items: rows.slice(0, TREND_MAX_POINTS).map(trendPointView),
    };
  });
}
