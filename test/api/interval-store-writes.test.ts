import type { FastifyInstance } from "fastify";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Store } from "../../src/store/ports.js";
import { csvOfSeries, syntheticYear } from "../core/interval/fixtures.js";
import { makeStoreApp, rowCounts } from "../helpers/db.js";
import { buildingBody, surveyBody } from "../store/fixtures.js";
import { api, inject } from "../helpers/auth.js";
import { sqlCount } from "../helpers/store.js";

let app: FastifyInstance;
let store: Store;
let path: string;
let buildingId: string;
beforeAll(async () => {
  ({ app, store, path } = await makeStoreApp());
  buildingId = (await inject(app, { method: "POST", url: "/v1/buildings", payload: buildingBody({ name: "Upload hall" }) })).json().id;
});
afterAll(() => app.close());

const CSV = { "content-type": "text/csv" };
/** Two days of hourly data, 250 kW / 180 kvar, and the same with 190 kvar (invented). */
const twoDays = csvOfSeries(syntheticYear(24, () => ({ kW: 250, kvar: 180 }), 2));
const twoDaysOther = csvOfSeries(syntheticYear(24, () => ({ kW: 250, kvar: 190 }), 2));
const url = (b = buildingId, q = "") => `/v1/buildings/${b}/interval-analyses${q}`;
const attach = (payload: string, headers: Record<string, string> = CSV, q = "", b = buildingId) =>
  inject(app, { method: "POST", url: url(b, q), headers, payload });
const analysisRows = () => sqlCount(store, "SELECT count(*) AS n FROM interval_analyses");

describe("rejected uploads change nothing", () => {
  const good = "time,kW,kvar\n2026-03-01 00:00,100,50\n2026-03-01 00:15,100,50\n2026-03-01 00:30,100,50\n";
  const badRows = [
    "time,kW,kvar",
    ...Array.from({ length: 20 }, (_, i) => `2026-03-01 ${String(i).padStart(2, "0")}:00,${i < 3 ? "x" : 100},50`),
  ].join("\n");
  it.each([
    ["a bad option", () => attach(good, CSV, "?targetPF=0.5"), 400, "targetPF"],
    ["a header without kvar", () => attach("time,kW\n2026-03-01 00:00,1\n"), 400, "kvarColumn"],
    ["too many bad rows", () => attach(badRows), 422, "line.2.kW"],
    ["JSON instead of CSV", () => attach('{"a":1}', { "content-type": "application/json" }), 415, undefined],
    ["an unknown building", () => attach(good, CSV, "", "bld_nope"), 404, undefined],
    ["a bad Idempotency-Key", () => attach(good, { ...CSV, "idempotency-key": "bad key with spaces" }), 400, "headers.idempotency-key"],
  ])("%s", async (_what, send, status, path) => {
    const before = await rowCounts(store);
    const res = await send();
    expect(res.statusCode).toBe(status);
    expect(res.headers["content-type"]).toMatch(/^application\/problem\+json/);
    if (path) expect(res.json().errors.map((e: { path: string }) => e.path)).toContain(path);
    expect(await rowCounts(store)).toEqual(before);
  });

  it("a multipart form without a file", async () => {
    const before = await rowCounts(store);
    const res = await api(app).post(url()).field("targetPF", "0.9");
    expect(res.status).toBe(400);
    expect(res.body.errors[0].path).toBe("file");
    expect(await rowCounts(store)).toEqual(before);
  });
});

describe("Idempotency-Key on uploads (digest of the bytes read)", () => {
  it("a replay answers the first response and stores nothing more", async () => {
    const headers = { ...CSV, "idempotency-key": "upload-1" };
    const first = await attach(twoDays, headers);
    expect(first.statusCode).toBe(201);
    expect(first.headers["idempotent-replayed"]).toBe("false");
    const rows = await analysisRows();
    const again = await attach(twoDays, headers);
    expect(again.statusCode).toBe(201);
    expect(again.headers["idempotent-replayed"]).toBe("true");
    expect(again.headers.location).toBe(first.headers.location);
    expect(again.json()).toEqual(first.json());
    expect(await analysisRows()).toBe(rows);
  });

  it("the same key with other bytes, another query or another form field is a 422", async () => {
    const headers = { ...CSV, "idempotency-key": "upload-2" };
    expect((await attach(twoDays, headers)).statusCode).toBe(201);
    const before = await rowCounts(store);
    const otherBytes = await attach(twoDaysOther, headers);
    expect(otherBytes.statusCode).toBe(422);
    expect(otherBytes.json().type).toMatch(/idempotency-key-reused$/);
    expect((await attach(twoDays, headers, "?targetPF=0.9")).statusCode).toBe(422);
    expect(await rowCounts(store)).toEqual(before);

    const form = (targetPF: string) =>
      api(app).post(url()).set("idempotency-key", "upload-3").field("targetPF", targetPF).attach("file", Buffer.from(twoDays), "d.csv");
    const m1 = await form("0.9");
    expect(m1.status).toBe(201);
    const m2 = await form("0.9");
    expect(m2.status).toBe(201);
    expect(m2.body.id).toBe(m1.body.id);
    expect((await form("0.92")).status).toBe(422);
  });
});

describe("restart", () => {
  it("a stored analysis, and the survey that used it, survive closing and reopening the database file", async () => {
    const a = (await attach(twoDays)).json();
    const survey = (
      await inject(app, { method: "POST", url: `/v1/buildings/${buildingId}/surveys`, payload: surveyBody({ scope: "whole_site" }) })
    ).json();
    const list = (await inject(app, url())).json();
    await app.close();

    ({ app, store } = await makeStoreApp({ DATABASE_PATH: path }));
    const again = await inject(app, `/v1/interval-analyses/${a.id}`);
    expect(again.statusCode).toBe(200);
    expect(again.json().summary).toEqual(a.summary);
    expect((await inject(app, url())).json()).toEqual(list);
    expect((await inject(app, `/v1/surveys/${survey.id}`)).json().building.intervalAnalysisId).toBe(a.id);
    const next = (
      await inject(app, { method: "POST", url: `/v1/buildings/${buildingId}/surveys`, payload: surveyBody({ scope: "whole_site" }) })
    ).json();
    expect(next.result.recommendedBank.stepPlan.source).toBe("intervals");
  });
});
