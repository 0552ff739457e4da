import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { FastifyInstance } from "fastify";
import { ROLES, type Role } from "../../src/auth/keys.js";
import { allowedRoles } from "../../src/http/access.js";
import { inject, keyFor } from "../helpers/auth.js";
import { makeStoreApp, rowCounts } from "../helpers/db.js";
import { label, urlWithIds, v1Routes, validBody, weekCsv, type RouteIds } from "../helpers/routes.js";
import { buildingBody, surveyBody } from "../store/fixtures.js";

/**
 * Every /v1 route of the app (read from the app, so a new route is walked too) with a key of every role: a role
 * outside allowedRoles gets 403 and writes nothing; an allowed one never 403.
 */
const routes = await v1Routes();
let app: FastifyInstance;
const keys = {} as Record<Role, string>;
const ids = {} as RouteIds;

beforeAll(async () => {
  ({ app } = await makeStoreApp());
  for (const role of ROLES) keys[role] = await keyFor(app, role);
  ids.building = (await inject(app, { method: "POST", url: "/v1/buildings", payload: buildingBody({ name: "Roles hall" }) })).json().id;
  ids.survey = (await inject(app, { method: "POST", url: `/v1/buildings/${ids.building}/surveys`, payload: surveyBody() })).json().id;
  ids.interval = (
    await inject(app, {
      method: "POST",
      url: `/v1/buildings/${ids.building}/interval-analyses`,
      headers: { "content-type": "text/csv" },
      payload: weekCsv,
    })
  ).json().id;
  // An id no key has: DELETE /v1/keys/:id answers 404 to an admin, and revokes nothing the walk needs.
  ids.key = "key_unknown";
});
afterAll(() => app.close());

describe("roles on every operation", () => {
  it("the policy is as documented", () => {
    expect(allowedRoles("PATCH", "/v1/buildings/:id")).toEqual(["admin", "surveyor"]);
    expect(allowedRoles("GET", "/v1/audit-log")).toEqual(["admin", "auditor"]);
    expect(allowedRoles("GET", "/v1/keys")).toEqual(["admin"]);
    expect(allowedRoles("DELETE", "/v1/buildings/:id")).toEqual(["admin"]);
  });

  it("walks every /v1 route of the app, among them those once left out of the hand-kept list", () => {
    const walked = routes.map(label);
    for (const r of ["GET /v1/surveys/:id/report", "GET /v1/surveys/:id/report.pdf", "POST /v1/sizing/report", "POST /v1/interval-analyses"])
      expect(walked).toContain(r);
    expect(walked.length).toBeGreaterThan(20);
  });

  const cases = routes.flatMap((r) => ROLES.map((role) => [`${role} ${label(r)}`, r, role] as const));
  it.each(cases)("%s", async (_, r, role) => {
    const url = urlWithIds(r.url, ids);
    expect(url, "a path parameter the walk cannot fill: teach urlWithIds in test/helpers/routes.ts").not.toMatch(/:/);
    const allowed = allowedRoles(r.method, r.url).includes(role);
    const body = validBody(r, role);
    const before = await rowCounts(app.store);
    const res = await inject(
      app,
      { method: r.method as "GET", url, ...(body ? { payload: body.payload as string, headers: { "content-type": body.contentType } } : {}) },
      keys[role],
    );
    if (allowed) {
      expect(res.statusCode, res.body).not.toBe(403);
      expect(res.statusCode, res.body).toBeLessThan(500);
    } else {
      expect(res.statusCode, res.body).toBe(403);
      expect(await rowCounts(app.store)).toEqual(before);
    }
  });
});
