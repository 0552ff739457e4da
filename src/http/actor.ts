import type { FastifyInstance, FastifyRequest } from "fastify";
import { parseKey, secretMatches, type Role } from "../auth/keys.js";
import type { Who } from "../application/write-outcome.js";
import type { Store } from "../store/ports.js";
import { allowedRoles } from "./access.js";
import { problem, ProblemError } from "./problem.js";

/** Who is asking, and for which organisation. Every store call takes the organisation from here. */
export interface Actor {
  orgId: string;
  /** The API key's id: what the audit log records. */
  actorId: string;
  role: Role;
}

declare module "fastify" {
  interface FastifyRequest {
    /** Set for an authenticated /v1 request; null otherwise (open routes, or a failed authentication). */
    actor: Actor;
    /** Why authentication failed, when it did. */
    authFailure: string | null;
  }
}

/** /v1 needs a key; /health, /openapi.json, /docs and the tablet page stay open. CORS preflights carry no credentials. */
export function needsKey(request: FastifyRequest): boolean {
  if (request.method === "OPTIONS") return false;
  // The matched route's pattern, not the raw URL: the router decodes %-escapes (/%761/buildings is /v1/buildings).
  const path = request.routeOptions.url ?? decoded(request.url.split("?")[0] ?? "");
  return path === "/v1" || path.startsWith("/v1/");
}

function decoded(path: string): string {
  try {
    return decodeURIComponent(path);
  } catch {
    return path;
  }
}

async function authenticate(store: Store, request: FastifyRequest): Promise<Actor | string> {
  const header = request.headers.authorization;
  if (header === undefined) return "the request has no Authorization header; send Authorization: Bearer <API key>";
  const m = /^Bearer +(\S+)\s*$/i.exec(header);
  if (!m) return "the Authorization header must be Bearer <API key>";
  const parsed = parseKey(m[1] as string);
  if (!parsed) return "the API key is not valid";
  const row = await store.keys.findByPrefix(parsed.prefix);
  // Hash and compare in constant time even when the prefix is unknown (against a dummy hash).
  const ok = secretMatches(parsed.secret, row?.secretSha256);
  if (!ok || !row) return "the API key is not valid";
  if (row.revokedAt) return "the API key is not valid";
  await store.keys.touch(row, store.now());
  return { orgId: row.orgId, actorId: row.id, role: row.role };
}

/** The acting key, its organisation and the request: what a use case records. */
export const whoOf = (request: FastifyRequest): Who => ({ orgId: request.actor.orgId, actorId: request.actor.actorId, requestId: request.id });

const unauthorized = (detail: string) =>
  new ProblemError(problem(401, "unauthorized", "Authentication required", detail), { "www-authenticate": 'Bearer realm="pfc-sizing"' });

/**
 * Identify the key in onRequest (so the rate limit can count per key), then refuse in preParsing — after the
 * rate limit, before any body is read: 401 without or with a bad key, 403 for a role that may not act.
 */
export function installActor(app: FastifyInstance, store: Store): void {
  app.decorateRequest("actor", null as unknown as Actor);
  app.decorateRequest("authFailure", null);
  app.addHook("onRequest", async (request) => {
    if (!needsKey(request)) return;
    const who = await authenticate(store, request);
    if (typeof who === "string") request.authFailure = who;
    else request.actor = who;
  });
  app.addHook("preParsing", async (request) => {
    if (!needsKey(request)) return;
    if (request.authFailure !== null || !request.actor) throw unauthorized(request.authFailure ?? "the API key is not valid");
    const route = request.routeOptions.url;
    if (route === undefined) return; // no such route: the 404 handler answers
    const roles = allowedRoles(request.method, route);
    if (!roles.includes(request.actor.role)) {
      throw new ProblemError(
        problem(403, "forbidden", "Not allowed", `the ${request.actor.role} role may not ${request.method} ${route}; allowed: ${roles.join(", ")}`),
      );
    }
  });
}
