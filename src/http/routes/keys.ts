import type { FastifyInstance } from "fastify";
import * as contracts from "../contracts/admin.js";
import { z } from "zod";
import { issueKey } from "../../auth/bootstrap.js";
import type { ApiKeyRecord } from "../../store/keys-repo.js";
import type { Store } from "../../store/store.js";
import { notFound, problem, ProblemError } from "../problem.js";
import { parseOr400 } from "../validate.js";
import { keyCreateSchema, type keySchema } from "../schemas/keys.js";

const idParams = z.object({ id: z.string() });

/** Never the hash: the id, public prefix, role and times. */
const keyView = (k: ApiKeyRecord): z.infer<typeof keySchema> => ({
  id: k.id, prefix: k.prefix, role: k.role, label: k.label, createdAt: k.createdAt, createdBy: k.createdBy, lastUsedAt: k.lastUsedAt, revokedAt: k.revokedAt,
});

/** Keys of the caller's organisation (admin only; see access.ts). New organisations are made with `npm run keys`. */
export async function keysRoutes(app: FastifyInstance, opts: { store: Store }): Promise<void> {
  const { store } = opts;

  app.post("/v1/keys", { schema: contracts.createKey }, async (request, reply) => {
    const body = parseOr400(keyCreateSchema, request.body ?? {});
    const { orgId, actorId } = request.actor;
    const issued = issueKey(store, { orgId, role: body.role, label: body.label ?? null, createdBy: actorId, requestId: request.id });
    reply.header("cache-control", "no-store");
    return reply.code(201).header("location", `/v1/keys/${issued.record.id}`).send({ ...keyView(issued.record), key: issued.key });
  });

  app.get("/v1/keys", { schema: contracts.listKeys }, async (request) => ({ items: store.keys.list(request.actor.orgId).map(keyView) }));

  app.delete("/v1/keys/:id", { schema: contracts.revokeKey }, async (request, reply) => {
    const { id } = parseOr400(idParams, request.params);
    const { orgId, actorId } = request.actor;
    store.write(() => {
      const k = store.keys.get(orgId, id);
      if (!k) throw new ProblemError(notFound(`key ${id}`));
      if (k.revokedAt) return;
      if (k.role === "admin" && store.keys.activeAdminCount(orgId) === 1) {
        const detail = "this is the organisation's last active admin key; create another admin key first";
        throw new ProblemError(problem(409, "last-admin-key", "Conflict", detail, [{ path: "id", message: detail }]));
      }
      const at = store.now().toISOString();
      store.keys.revoke(orgId, id, at);
      store.audit.record({ orgId, actor: actorId, action: "key.revoke", resourceType: "api_key", resourceId: id, requestId: request.id, at });
    });
    return reply.code(204).send();
  });
}
