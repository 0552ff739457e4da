import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { FastifyInstance } from "fastify";
import { ROLES, type Role } from "../../src/auth/keys.js";
import { allowedRoles } from "../../src/http/access.js";
import { operations } from "../../src/http/operations.js";
import { csvOfSeries, syntheticYear } from "../core/interval/fixtures.js";
import { exampleSizingBody } from "../helpers/bodies.js";
import { inject, keyFor } from "../helpers/auth.js";
import { makeStoreApp, rowCounts } from "../helpers/db.js";
import { buildingBody, surveyBody } from "../store/fixtures.js";

/** Every /v1 operation with a key of every role: a role outside allowedRoles gets 403 and writes nothing; an allowed one never 403. */
let app: FastifyInstance;
const keys = {} as Record<Role, string>;
const ids: Record<string, string> = {};
const week = csvOfSeries(syntheticYear(24, () => ({ kW: 300, kvar: 200 }), 7));

beforeAll(async () => {
  ({ app } = await makeStoreApp());
  for (const role of ROLES) keys[role] = await keyFor(app, role);
  ids.building = (await inject(app, { method: "POST", url: "/v1/buildings", payload: buildingBody({ name: "Roles hall" }) })).json().id;
  ids.survey = (await inject(app, { method: "POST", url: `/v1/buildings/${ids.building}/surveys`, payload: surveyBody() })).json().id;
  ids.interval = (await inject(app, { method: "POST", url: `/v1/buildings/${ids.building}/interval-analyses`, headers: { "content-type": "text/csv" }, payload: week })).json().id;
  ids.key = (await app.store.keys.findByPrefix(keys.auditor.slice(4, 12)))!.id;
});
afterAll(() => app.close());

const routeOf = (path: string) => path.replace(/\{(\w+)\}/g, ":$1");
const urlOf = (path: string) =>
  path
    .replace(/^\/v1\/buildings\/\{id\}/, `/v1/buildings/${ids.building}`)
    .replace(/^\/v1\/surveys\/\{id\}/, `/v1/surveys/${ids.survey}`)
    .replace(/^\/v1\/interval-analyses\/\{id\}/, `/v1/interval-analyses/${ids.interval}`)
    .replace(/^\/v1\/keys\/\{id\}/, "/v1/keys/key_unknown")
    .replace("{n}", "1");

describe("roles on every operation", () => {
  it("the policy is as documented", () => {
    expect(allowedRoles("PATCH", "/v1/buildings/:id")).toEqual(["admin", "surveyor"]);
    expect(allowedRoles("GET", "/v1/audit-log")).toEqual(["admin", "auditor"]);
    expect(allowedRoles("GET", "/v1/keys")).toEqual(["admin"]);
    expect(allowedRoles("DELETE", "/v1/buildings/:id")).toEqual(["admin"]);
  });

  const cases = operations.filter((op) => op.path.startsWith("/v1/")).flatMap((op) => ROLES.map((role) => [`${role} ${op.method.toUpperCase()} ${op.path}`, op, role] as const));
  it.each(cases)("%s", async (_, op, role) => {
    const allowed = allowedRoles(op.method, routeOf(op.path)).includes(role);
    const csv = op.bodyType === "text/csv";
    const payload = csv ? week : op.operationId === "createKey" ? { role: "auditor" } : op.operationId === "updateBuilding" ? { notes: `by ${role}` } : op.operationId === "reviseSurvey" ? { ...surveyBody(), reason: "x" } : op.operationId === "createSurvey" ? surveyBody() : op.operationId === "createBuilding" ? buildingBody({ name: `By ${role}` }) : exampleSizingBody();
    const before = await rowCounts(app.store);
    const res = await inject(
      app,
      { method: op.method.toUpperCase() as "GET", url: urlOf(op.path), ...(op.body ? { payload: payload as string } : {}), ...(csv ? { headers: { "content-type": "text/csv" } } : {}) },
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
