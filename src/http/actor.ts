import type { FastifyInstance } from "fastify";
import { DEFAULT_ORG_ID } from "../store/store.js";

/** Who is asking, and for which organisation. Every store call takes the organisation from here. */
export interface Actor {
  orgId: string;
  actorId: string;
}

declare module "fastify" {
  interface FastifyRequest {
    actor: Actor;
  }
}

/** Until access control lands every request is the local actor of the default organisation. */
export const LOCAL_ACTOR: Actor = Object.freeze({ orgId: DEFAULT_ORG_ID, actorId: "local" });

/** The one place that decides the actor: access control replaces this hook with an API-key lookup. */
export function installActor(app: FastifyInstance): void {
  app.decorateRequest("actor", null as unknown as Actor);
  app.addHook("onRequest", async (request) => {
    request.actor = LOCAL_ACTOR;
  });
}
