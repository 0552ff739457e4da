import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { FastifyInstance } from "fastify";
import { organisationNamed } from "../../src/auth/bootstrap.js";
import { inject, keyFor, keyIdOf } from "../helpers/auth.js";
import { makeStoreApp } from "../helpers/db.js";
import { label, urlWithIds, v1Routes, validBody, weekCsv, type AppRoute, type RouteIds } from "../helpers/routes.js";
import { buildingBody, surveyBody } from "../store/fixtures.js";
import { sqlRows, TEST_STORE_KIND } from "../helpers/store.js";

/**
 * Every /v1 route of the app (read from the app, so a new route is called too) with an admin key of another organisation, path
 * parameters filled with the first organisation's real ids: each is a 404 (never 403, nothing leaks), a list
 * shows none of the first organisation's ids, and nothing of the first organisation changes.
 */
const v1 = await v1Routes();
let app: FastifyInstance;
let other: string;
const ids = {} as RouteIds;
const week = weekCsv;

beforeAll(async () => {
  ({ app } = await makeStoreApp());
  const b = (await inject(app, { method: "POST", url: "/v1/buildings", payload: buildingBody({ name: "First org hall" }) })).json();
  const a = await inject(app, {
    method: "POST",
    url: `/v1/buildings/${b.id}/interval-analyses`,
    headers: { "content-type": "text/csv" },
    payload: week,
  });
  const s = (await inject(app, { method: "POST", url: `/v1/buildings/${b.id}/surveys`, payload: surveyBody() })).json();
  ids.building = b.id;
  ids.survey = s.id;
  ids.interval = a.json().id;
  ids.key = keyIdOf(app);
  const org = await organisationNamed(app.store, "Second organisation");
  other = await keyFor(app, "admin", org.id);
});
afterAll(() => app.close());

function bodyOf(r: AppRoute): { payload?: unknown; headers?: Record<string, string> } {
  const body = validBody(r, "another organisation");
  return body ? { payload: body.payload, headers: { "content-type": body.contentType } } : {};
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
  const rows = await Promise.all(
    tables.map(({ name }) => sqlRows(app.store, `SELECT * FROM "${name}" t WHERE org_id = 'org_default' ORDER BY ${order}`)),
  );
  return JSON.stringify(rows).replace(/"last_used_at":"[^"]*"/g, "");
}

describe("another organisation's key", () => {
  it("covers every /v1 route, with a real id in each path parameter", () => {
    expect(v1.length).toBeGreaterThan(20);
    for (const r of v1) expect(urlWithIds(r.url, ids), label(r)).not.toMatch(/:/);
  });

  it.each(v1.map((r) => [label(r), r] as const))("%s: 404 for the first org's ids, none of them in a list", async (_, r) => {
    const before = await firstOrgRows();
    const { payload, headers } = bodyOf(r);
    const res = await inject(
      app,
      {
        method: r.method as "GET",
        url: urlWithIds(r.url, ids),
        ...(payload === undefined ? {} : { payload: payload as string }),
        ...(headers ? { headers } : {}),
      },
      other,
    );
    if (r.url.includes(":")) {
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
