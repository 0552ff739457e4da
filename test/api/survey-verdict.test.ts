/**
 * GET /v1/surveys/{id}/verdict: page 1 of a stored survey's report as data. It must be the report's own words —
 * each line the endpoint answers appears on the report's first page (HTML) as it is — for the latest revision and
 * an earlier one, and it is kept to the survey's organisation like every read.
 */
import type { FastifyInstance } from "fastify";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { makeStoreApp } from "../helpers/db.js";
import { inject, keyFor } from "../helpers/auth.js";
import { buildingBody, surveyBody } from "../store/fixtures.js";
import { verdictOf } from "../../src/report/sections/verdict.js";
import { organisationNamed } from "../../src/auth/bootstrap.js";
import type { SizingResult } from "../../src/core/pipeline/size.js";

let app: FastifyInstance;
beforeAll(async () => {
  ({ app } = await makeStoreApp());
});
afterAll(() => app.close());

const post = (url: string, payload: unknown) => inject(app, { method: "POST", url, payload: payload as object });

/** The report's text with its markup removed and entities decoded, spaces collapsed, as a reader sees it. */
function textOf(html: string): string {
  const body = html.replace(/<style[\s\S]*?<\/style>/g, " ").replace(/<svg[\s\S]*?<\/svg>/g, " ");
  return body
    .replace(/<[^>]+>/g, " ")
    .replace(/&amp;/g, "&")
    .replace(/&lt;/g, "<")
    .replace(/&gt;/g, ">")
    .replace(/&quot;/g, '"')
    .replace(/&#39;/g, "'")
    .replace(/\s+/g, " ");
}

const economics = { currency: "EUR", tariff: { form: "kva_demand", chargePerKVA: 11 }, cost: { perKvar: 30, fixed: 1200 } };

describe("a stored survey's verdict", () => {
  it("is the report's page 1, line for line, for the latest revision and an earlier one", async () => {
    const b = (await post("/v1/buildings", buildingBody({ name: "Verdict works", economics }))).json();
    const created = (await post(`/v1/buildings/${b.id}/surveys`, surveyBody())).json();
    const revised = await post(`/v1/surveys/${created.id}/revisions`, {
      ...surveyBody({ targetPF: 0.98 }),
      reason: "target raised by the facility manager",
    });
    expect(revised.statusCode).toBe(201);
    for (const n of [undefined, 1]) {
      const url = `/v1/surveys/${created.id}/verdict${n ? `?revision=${n}` : ""}`;
      const res = await inject(app, url);
      expect(res.statusCode).toBe(200);
      const v = res.json();
      expect(v).toMatchObject({ surveyId: created.id, revision: n ?? 2 });
      const stored = (await inject(app, `/v1/surveys/${created.id}/revisions/${n ?? 2}`)).json();
      const { install, instead, repairFirst, after, money, risks } = verdictOf(stored.result as SizingResult);
      expect(v).toMatchObject({ install, instead, repairFirst, after, money, risks });
      const page = textOf((await inject(app, `/v1/surveys/${created.id}/report${n ? `?revision=${n}` : ""}`)).body);
      const lines = [...v.install, ...(v.instead ? [v.instead] : []), ...v.repairFirst, v.after, ...v.risks, v.caution];
      expect(lines.length).toBeGreaterThan(2);
      for (const line of lines) expect(page).toContain(line);
      expect(v.money).not.toBeNull();
      for (const m of [v.money.cost, v.money.savingPerYear, v.money.payback].filter(Boolean)) expect(page).toContain(m);
    }
    // the two revisions differ in their target: the verdicts say so
    const [latest, first] = await Promise.all([
      inject(app, `/v1/surveys/${created.id}/verdict`).then((r) => r.json()),
      inject(app, `/v1/surveys/${created.id}/verdict?revision=1`).then((r) => r.json()),
    ]);
    expect(latest.after).not.toBe(first.after);
  });

  it("404 for an unknown survey, a revision it does not have, or another organisation's survey; 400 for a bad revision", async () => {
    const b = (await post("/v1/buildings", buildingBody())).json();
    const s = (await post(`/v1/buildings/${b.id}/surveys`, surveyBody())).json();
    expect((await inject(app, "/v1/surveys/srv_nothing/verdict")).statusCode).toBe(404);
    expect((await inject(app, `/v1/surveys/${s.id}/verdict?revision=9`)).statusCode).toBe(404);
    const bad = await inject(app, `/v1/surveys/${s.id}/verdict?revision=0`);
    expect(bad.statusCode).toBe(400);
    expect(bad.headers["content-type"]).toMatch(/^application\/problem\+json/);
    expect(bad.json().errors[0]).toMatchObject({ path: "revision" });
    const other = await keyFor(app, "admin", (await organisationNamed(app.store, "Verdict's other organisation")).id);
    expect((await inject(app, `/v1/surveys/${s.id}/verdict`, other)).statusCode).toBe(404);
  });
});
