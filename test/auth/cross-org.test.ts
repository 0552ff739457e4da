import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { FastifyInstance } from "fastify";
import { organisationNamed } from "../../src/auth/bootstrap.js";
import { operations, type Operation } from "../../src/http/operations.js";
import { csvOfSeries, syntheticYear } from "../core/interval/fixtures.js";
import { exampleSizingBody } from "../helpers/bodies.js";
import { inject, keyFor, keyIdOf } from "../helpers/auth.js";
import { makeStoreApp } from "../helpers/db.js";
import { buildingBody, surveyBody } from "../store/fixtures.js";
import { sqlRows, TEST_STORE_KIND } from "../helpers/store.js";

/**
 * Every operation of src/http/operations.ts called with an admin key of another organisation, path
 * parameters filled with the first organisation's real ids: each is a 404 (never 403, nothing leaks), a list
 * shows none of the first organisation's ids, and nothing of the first organisation changes.
 */
let app: FastifyInstance;
let other: string;
const ids: Record<string, string> = {};
const week = csvOfSeries(syntheticYear(24, () => ({ kW: 300, kvar: 200 }), 7));

beforeAll(async () => {
  ({ app } = await makeStoreApp());
  const b = (await inject(app, { method: "POST", url: "/v1/buildings", payload: buildingBody({ name: "First org hall" }) })).json();
  const a = await inject(app, { method: "POST", url: `/v1/buildings/${b.id}/interval-analyses`, headers: { "content-type": "text/csv" }, payload: week });
  const s = (await inject(app, { method: "POST", url: `/v1/buildings/${b.id}/surveys`, payload: surveyBody() })).json();
  ids.building = b.id;
  ids.survey = s.id;
  ids.interval = a.json().id;
  ids.key = keyIdOf(app);
  const org = await organisationNamed(app.store, "Second organisation");
  other = await keyFor(app, "admin", org.id);
});
afterAll(() => app.close());

function bodyOf(op: Operation): { payload?: unknown; headers?: Record<string, string> } {
  if (op.bodyType === "text/csv") return { payload: week, headers: { "content-type": "text/csv" } };
  if (!op.body) return {};
  const bodies: Record<string, unknown> = {
    createBuilding: buildingBody({ name: "Second org hall" }),
    updateBuilding: { notes: "changed by another organisation" },
    createSurvey: surveyBody(),
    reviseSurvey: { ...surveyBody(), reason: "another organisation" },
    createKey: { role: "auditor" },
  };
  return { payload: bodies[op.operationId] ?? exampleSizingBody() };
}

function urlOf(op: Operation): string {
  return op.path
    .replace(/^\/v1\/buildings\/\{id\}/, `/v1/buildings/${ids.building}`)
    .replace(/^\/v1\/surveys\/\{id\}/, `/v1/surveys/${ids.survey}`)
    .replace(/^\/v1\/interval-analyses\/\{id\}/, `/v1/interval-analyses/${ids.interval}`)
    .replace(/^\/v1\/keys\/\{id\}/, `/v1/keys/${ids.key}`)
    .replace("{n}", "1");
}

/** The first organisation's rows, every table with an org_id column. */
async function firstOrgRows(): Promise<string> {
  const postgres = TEST_STORE_KIND === "postgres";
  const tables = await sqlRows<{ name: string }>(
    app.store,
    postgres
      ? "SELECT DISTINCT table_name AS name FROM information_schema.columns WHERE table_schema = 'public' AND column_name = 'org_id' ORDER BY 1"
      : "SELECT name FROM sqlite_master WHERE type = 'table' AND sql LIKE '%org_id%'",
  );
  // PostgreSQL has no rowid: the rows in the order of their text.
  const order = postgres ? "t::text" : "rowid";
  const rows = await Promise.all(tables.map(({ name }) => sqlRows(app.store, `SELECT * FROM "${name}" t WHERE org_id = 'org_default' ORDER BY ${order}`)));
  return JSON.stringify(rows).replace(/"last_used_at":"[^"]*"/g, "");
}

describe("another organisation's key", () => {
  const v1 = operations.filter((op) => op.path.startsWith("/v1/"));

  it("covers every /v1 operation, with a real id in each path parameter", () => {
    expect(v1.length).toBeGreaterThan(15);
    for (const op of v1) expect(urlOf(op), op.operationId).not.toMatch(/\{/);
  });

  it.each(v1.map((op) => [`${op.method.toUpperCase()} ${op.path}`, op] as const))("%s: 404 for the first org's ids, none of them in a list", async (_, op) => {
    const before = await firstOrgRows();
    const { payload, headers } = bodyOf(op);
    const res = await inject(app, { method: op.method.toUpperCase() as "GET", url: urlOf(op), ...(payload === undefined ? {} : { payload: payload as string }), ...(headers ? { headers } : {}) }, other);
    if (op.path.includes("{")) {
      expect(res.statusCode, res.body).toBe(404);
      expect(res.headers["content-type"]).toMatch(/^application\/problem\+json/);
    } else {
      expect(res.statusCode, res.body).toBeLessThan(300);
      for (const id of Object.values(ids)) expect(res.body).not.toContain(id);
    }
    expect(await firstOrgRows()).toBe(before);
  });

  it.each(["report", "report.pdf"])("the survey's %s is 404 too", async (what) => {
    const res = await inject(app, `/v1/surveys/${ids.survey}/${what}`, other);
    expect(res.statusCode).toBe(404);
  });

  it("still sees the first organisation's data with the first organisation's key", async () => {
    expect((await inject(app, `/v1/buildings/${ids.building}`)).statusCode).toBe(200);
    expect((await inject(app, `/v1/interval-analyses/${ids.interval}`)).statusCode).toBe(200);
    expect((await inject(app, `/v1/surveys/${ids.survey}/report`)).statusCode).toBe(200);
  });
});
