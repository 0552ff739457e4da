import type { Role } from "../auth/keys.js";

/**
 * Who may call what. Reads are open to every role; computations that store nothing too. Writing buildings
 * (creating and changing them), surveys, revisions and stored interval analyses: admin and surveyor.
 * Keys: admin. The audit log: admin and auditor. Any other write: admin only (deny by default).
 */
const ALL: readonly Role[] = ["admin", "surveyor", "auditor"];
const WRITERS: readonly Role[] = ["admin", "surveyor"];
const ADMIN: readonly Role[] = ["admin"];

const STATELESS = new Set(["/v1/sizing", "/v1/harmonics/scan", "/v1/interval-analyses", "/v1/sizing/report"]);
const WRITES = [
  /^\/v1\/buildings$/,
  /^\/v1\/buildings\/:id$/,
  /^\/v1\/buildings\/:id\/surveys$/,
  /^\/v1\/surveys\/:id\/revisions$/,
  /^\/v1\/buildings\/:id\/interval-analyses$/,
];

/** The roles allowed on a route, given its method and its pattern as registered (e.g. /v1/buildings/:id). */
export function allowedRoles(method: string, route: string): readonly Role[] {
  if (route === "/v1/keys" || route.startsWith("/v1/keys/")) return ADMIN;
  if (route === "/v1/audit-log") return ["admin", "auditor"];
  const m = method.toUpperCase();
  if (m === "GET" || m === "HEAD") return ALL;
  if (m === "POST" && STATELESS.has(route)) return ALL;
  if ((m === "POST" || m === "PATCH") && WRITES.some((w) => w.test(route))) return WRITERS;
  return ADMIN;
}
