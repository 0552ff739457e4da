import type { FastifyInstance } from "fastify";
import * as contracts from "../contracts/buildings.js";
import { z } from "zod";
import { createBuilding, findBuilding, updateBuilding } from "../../application/buildings.js";
import { finishWith } from "../../application/write-outcome.js";
import type { Store } from "../../store/ports.js";
import { idempotentWrite } from "../idempotency.js";
import { whoOf } from "../actor.js";
import { decodeCursor, encodeCursor, pageOf, parseLimit } from "../paging.js";
import { buildingCreateSchema, buildingListQuerySchema, buildingPatchSchema } from "../schemas/buildings.js";
import { parseOr400 } from "../validate.js";
import { buildingVersionView, buildingView } from "../views.js";

const idParams = z.object({ id: z.string() });
const buildingCursor = z.object({ k: z.literal("b"), n: z.string(), i: z.string() });

export async function buildingsRoutes(app: FastifyInstance, opts: { store: Store }): Promise<void> {
  const { store } = opts;

  app.post("/v1/buildings", { schema: contracts.createBuilding }, async (request, reply) => {
    const body = parseOr400(buildingCreateSchema, request.body);
    const data = {
      name: body.name,
      address: body.address ?? null,
      notes: body.notes ?? null,
      system: body.system,
      transformer: body.transformer ?? null,
      utility: body.utility ?? null,
      economics: body.economics ?? null,
      installedBanks: body.installedBanks ?? [],
    };
    return idempotentWrite(store, request, reply, (seal) =>
      createBuilding(
        store,
        whoOf(request),
        data,
        finishWith(seal, (b) => ({ status: 201, body: buildingView(b), location: `/v1/buildings/${b.id}` })),
      ),
    );
  });

  app.get("/v1/buildings", { schema: contracts.listBuildings }, async (request) => {
    const query = parseOr400(buildingListQuerySchema, request.query);
    const limit = parseLimit(query.limit);
    const after = decodeCursor("b", buildingCursor, query.cursor);
    const rows = await store.buildings.list(request.actor.orgId, {
      ...(query.q ? { q: query.q } : {}),
      ...(after ? { after: { name: after.n, id: after.i } } : {}),
      limit: limit + 1,
    });
    const page = pageOf(rows, limit, (last) => encodeCursor("b", { n: last.name, i: last.id }));
    return { items: page.items.map(buildingView), nextCursor: page.nextCursor };
  });

  app.get("/v1/buildings/:id", { schema: contracts.getBuilding }, async (request) => {
    const { id } = parseOr400(idParams, request.params);
    return buildingView(await findBuilding(store, request.actor.orgId, id));
  });

  app.patch("/v1/buildings/:id", { schema: contracts.updateBuilding }, async (request, reply) => {
    const { id } = parseOr400(idParams, request.params);
    const patch = parseOr400(buildingPatchSchema, request.body);
    return idempotentWrite(store, request, reply, (seal) =>
      updateBuilding(
        store,
        whoOf(request),
        id,
        patch,
        finishWith(seal, (b) => ({ status: 200, body: buildingView(b) })),
      ),
    );
  });

  app.get("/v1/buildings/:id/history", { schema: contracts.buildingHistory }, async (request) => {
    const { id } = parseOr400(idParams, request.params);
    const { orgId } = request.actor;
    await findBuilding(store, orgId, id);
    const items = (await store.buildings.history(orgId, id)).map(buildingVersionView);
    return { buildingId: id, order: "oldest_first", items };
  });
}
