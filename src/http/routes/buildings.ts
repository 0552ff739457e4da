import type { FastifyInstance } from "fastify";
import * as contracts from "../contracts/buildings.js";
import { z } from "zod";
import { dataOf } from "../../store/buildings-repo.js";
import { newId } from "../../store/ids.js";
import type { Store } from "../../store/store.js";
import type { BuildingData, BuildingRecord } from "../../store/types.js";
import { canonicalJson, idempotentWrite } from "../idempotency.js";
import { decodeCursor, encodeCursor, pageOf, parseLimit } from "../paging.js";
import { notFound, ProblemError } from "../problem.js";
import { buildingCreateSchema, buildingListQuerySchema, buildingPatchSchema, type BuildingPatch } from "../schemas/buildings.js";
import { parseOr400 } from "../validate.js";
import { buildingVersionView, buildingView } from "../views.js";

const idParams = z.object({ id: z.string() });
const buildingCursor = z.object({ k: z.literal("b"), n: z.string(), i: z.string() });

/** Field order fixed, so an unchanged PATCH compares equal. */
function normalised(d: BuildingData): BuildingData {
  return {
    name: d.name,
    address: d.address,
    notes: d.notes,
    system: { voltageV: d.system.voltageV, frequencyHz: d.system.frequencyHz, phases: d.system.phases },
    transformer: d.transformer,
    utility: d.utility,
    economics: d.economics ?? null,
    installedBanks: d.installedBanks ?? [],
  };
}

function patched(current: BuildingRecord, p: BuildingPatch): BuildingData {
  const d = dataOf(current);
  return normalised({
    name: p.name ?? d.name,
    address: p.address === undefined ? d.address : p.address,
    notes: p.notes === undefined ? d.notes : p.notes,
    system: p.system ?? d.system,
    transformer: p.transformer === undefined ? d.transformer : p.transformer,
    utility: p.utility === undefined ? d.utility : p.utility,
    economics: p.economics === undefined ? d.economics : p.economics,
    installedBanks: p.installedBanks === undefined ? d.installedBanks : p.installedBanks,
  });
}

export function findBuilding(store: Store, orgId: string, id: string): BuildingRecord {
  const b = store.buildings.get(orgId, id);
  if (!b) throw new ProblemError(notFound(`building ${id}`));
  return b;
}

export async function buildingsRoutes(app: FastifyInstance, opts: { store: Store }): Promise<void> {
  const { store } = opts;

  app.post("/v1/buildings", { schema: contracts.createBuilding }, async (request, reply) => {
    const body = parseOr400(buildingCreateSchema, request.body);
    const { orgId, actorId } = request.actor;
    return idempotentWrite(store, request, reply, () => {
      const at = store.now().toISOString();
      const data = normalised({
        name: body.name,
        address: body.address ?? null,
        notes: body.notes ?? null,
        system: body.system,
        transformer: body.transformer ?? null,
        utility: body.utility ?? null,
        economics: body.economics ?? null,
        installedBanks: body.installedBanks ?? [],
      });
      const b = store.buildings.create(orgId, newId("bld"), data, actorId, at);
      store.audit.record({ orgId, actor: actorId, action: "building.create", resourceType: "building", resourceId: b.id, requestId: request.id, at });
      return { status: 201, body: buildingView(b), location: `/v1/buildings/${b.id}` };
    });
  });

  app.get("/v1/buildings", { schema: contracts.listBuildings }, async (request) => {
    const query = parseOr400(buildingListQuerySchema, request.query);
    const limit = parseLimit(query.limit);
    const after = decodeCursor("b", buildingCursor, query.cursor);
    const rows = store.buildings.list(request.actor.orgId, {
      ...(query.q ? { q: query.q } : {}),
      ...(after ? { after: { name: after.n, id: after.i } } : {}),
      limit: limit + 1,
    });
    const page = pageOf(rows, limit, (last) => encodeCursor("b", { n: last.name, i: last.id }));
    return { items: page.items.map(buildingView), nextCursor: page.nextCursor };
  });

  app.get("/v1/buildings/:id", { schema: contracts.getBuilding }, async (request) => {
    const { id } = parseOr400(idParams, request.params);
    return buildingView(findBuilding(store, request.actor.orgId, id));
  });

  app.patch("/v1/buildings/:id", { schema: contracts.updateBuilding }, async (request, reply) => {
    const { id } = parseOr400(idParams, request.params);
    const patch = parseOr400(buildingPatchSchema, request.body);
    const { orgId, actorId } = request.actor;
    return idempotentWrite(store, request, reply, () => {
      const current = findBuilding(store, orgId, id);
      const next = patched(current, patch);
      if (canonicalJson(next) === canonicalJson(normalised(dataOf(current)))) {
        return { status: 200, body: buildingView(current) }; // nothing changed: no new version
      }
      const at = store.now().toISOString();
      const b = store.buildings.update(orgId, id, current.version, next, actorId, at);
      if (!b) throw new Error(`building ${id} changed inside its own transaction`);
      store.audit.record({ orgId, actor: actorId, action: "building.update", resourceType: "building", resourceId: id, requestId: request.id, at });
      return { status: 200, body: buildingView(b) };
    });
  });

  app.get("/v1/buildings/:id/history", { schema: contracts.buildingHistory }, async (request) => {
    const { id } = parseOr400(idParams, request.params);
    const { orgId } = request.actor;
    findBuilding(store, orgId, id);
    const items = store.buildings.history(orgId, id).map(buildingVersionView);
    return { buildingId: id, order: "oldest_first", items };
  });
}
