import type { FastifyInstance } from "fastify";
import * as contracts from "../contracts/admin.js";
import { z } from "zod";
import { issueKey } from "../../auth/bootstrap.js";
import { revokeKey } from "../../application/keys.js";
import type { Store } from "../../store/ports.js";
import type { ApiKeyRecord } from "../../store/types.js";
import { whoOf } from "../actor.js";
import { parseOr400 } from "../validate.js";
import { keyCreateSchema, type keySchema } from "../schemas/keys.js";

const idParams = z.object({ id: z.string() });

/** Never the hash: the id, public prefix, role and times. */
const keyView = (k: ApiKeyRecord): z.infer<typeof keySchema> => ({
  id: k.id,
  prefix: k.prefix,
  role: k.role,
  label: k.label,
  createdAt: k.createdAt,
  createdBy: k.createdBy,
  lastUsedAt: k.lastUsedAt,
  revokedAt: k.revokedAt,
});

/** Keys of the caller's organisation (admin only; see access.ts). New organisations are made with `npm run keys`. */
export async function keysRoutes(app: FastifyInstance, opts: { store: Store }): Promise<void> {
  const { store } = opts;

  app.post("/v1/keys", { schema: contracts.createKey }, async (request, reply) => {
    const body = parseOr400(keyCreateSchema, request.body ?? {});
    const { orgId, actorId } = request.actor;
    const issued = await issueKey(store, { orgId, role: body.role, label: body.label ?? null, createdBy: actorId, requestId: request.id });
    reply.header("cache-control", "no-store");
    return reply
      .code(201)
      .header("location", `/v1/keys/${issued.record.id}`)
      .send({ ...keyView(issued.record), key: issued.key });
  });

  app.get("/v1/keys", { schema: contracts.listKeys }, async (request) => ({ items: (await store.keys.list(request.actor.orgId)).map(keyView) }));

  app.delete("/v1/keys/:id", { schema: contracts.revokeKey }, async (request, reply) => {
    const { id } = parseOr400(idParams, request.params);
    await revokeKey(store, whoOf(request), id);
    return reply.code(204).send();
  });
}
