import type { FastifyInstance } from "fastify";
import * as contracts from "../contracts/intervals.js";
import { z } from "zod";
import { findBuilding } from "../../application/buildings.js";
import { attachIntervalAnalysis } from "../../application/interval-analyses.js";
import { finishWith } from "../../application/write-outcome.js";
import type { Store } from "../../store/ports.js";
import { whoOf } from "../actor.js";
import { idempotencyKeyOf, idempotentWrite } from "../idempotency.js";
import { INTERVAL_MAX_BYTES } from "../interval/ingest.js";
import { analyseUpload } from "../interval/upload.js";
import { decodeCursor, encodeCursor, pageOf, parseLimit } from "../paging.js";
import { NotFound } from "../../application/errors.js";
import { parseOr400 } from "../validate.js";
import { intervalAnalysisListView, intervalAnalysisView } from "../views.js";

const idParams = z.object({ id: z.string() });
const listQuery = z.strictObject({ limit: z.string().optional(), cursor: z.string().optional() });
const analysisCursor = z.object({ k: z.literal("ia"), s: z.number().int().positive() });

/** Interval analyses stored with a building: upload (analysed as POST /v1/interval-analyses does), read, list. */
export function storedIntervalRoutes(app: FastifyInstance, store: Store): void {
  app.post(
    "/v1/buildings/:id/interval-analyses",
    { bodyLimit: INTERVAL_MAX_BYTES, schema: contracts.storeIntervalAnalysis },
    async (request, reply) => {
      const { id: buildingId } = parseOr400(idParams, request.params);
      // Header and building first: neither needs the upload, which may be 64 MiB.
      const key = idempotencyKeyOf(request);
      await findBuilding(store, request.actor.orgId, buildingId);
      const { answer, digest } = await analyseUpload(request, { digest: key !== undefined });
      // The body was a stream: a replay is recognised by the upload's digest (media type, form fields, SHA-256 of the bytes).
      return idempotentWrite(
        store,
        request,
        reply,
        (seal) =>
          attachIntervalAnalysis(
            store,
            whoOf(request),
            buildingId,
            answer.summary,
            finishWith(seal, (a) => ({
              status: 201,
              body: { id: a.id, buildingId, createdAt: a.createdAt, ...answer },
              location: `/v1/interval-analyses/${a.id}`,
            })),
          ),
        digest ?? null,
      );
    },
  );

  app.get("/v1/interval-analyses/:id", { schema: contracts.getIntervalAnalysis }, async (request) => {
    const { id } = parseOr400(idParams, request.params);
    const a = await store.intervalAnalyses.get(request.actor.orgId, id);
    if (!a) throw new NotFound(`interval analysis ${id}`);
    return intervalAnalysisView(a);
  });

  app.get("/v1/buildings/:id/interval-analyses", { schema: contracts.listIntervalAnalyses }, async (request) => {
    const { id } = parseOr400(idParams, request.params);
    const query = parseOr400(listQuery, request.query);
    const limit = parseLimit(query.limit);
    const before = decodeCursor("ia", analysisCursor, query.cursor);
    const { orgId } = request.actor;
    await findBuilding(store, orgId, id);
    const rows = await store.intervalAnalyses.listByBuilding(orgId, id, { ...(before ? { beforeSeq: before.s } : {}), limit: limit + 1 });
    const page = pageOf(rows, limit, (last) => encodeCursor("ia", { s: last.seq }));
    return { buildingId: id, items: page.items.map(intervalAnalysisListView), nextCursor: page.nextCursor };
  });
}
