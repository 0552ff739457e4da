import type { FastifyInstance } from "fastify";
import * as contracts from "../contracts/admin.js";
import { z } from "zod";
import type { Store } from "../../store/ports.js";
import { decodeCursor, encodeCursor, pageOf, parseLimit } from "../paging.js";
import { parseOr400 } from "../validate.js";

const query = z.strictObject({ limit: z.string().optional(), cursor: z.string().optional() });
const auditCursor = z.object({ k: z.literal("a"), i: z.number().int() });

/** The organisation's audit log, newest first. Access control will restrict who may read it. */
export async function auditRoutes(app: FastifyInstance, opts: { store: Store }): Promise<void> {
  app.get("/v1/audit-log", { schema: contracts.auditLog }, async (request) => {
    const q = parseOr400(query, request.query);
    const limit = parseLimit(q.limit);
    const before = decodeCursor("a", auditCursor, q.cursor);
    const rows = await opts.store.audit.list(request.actor.orgId, { ...(before ? { beforeId: before.i } : {}), limit: limit + 1 });
    return pageOf(rows, limit, (last) => encodeCursor("a", { i: last.id }));
  });
}
