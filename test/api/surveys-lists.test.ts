import type { FastifyInstance } from "fastify";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { LOADS_CSV_HEADER } from "../../src/http/loads-csv.js";
import { makeStoreApp } from "../helpers/db.js";
import { buildingBody, loads, surveyBody } from "../store/fixtures.js";
import { inject } from "../helpers/auth.js";

let app: FastifyInstance;
let buildingId: string;
/** 25 surveys, one every 10 days from 2023-01-01, two of them at the same instant. */
const dates = Array.from({ length: 25 }, (_, i) => new Date(Date.UTC(2023, 0, 1 + 10 * i, 9)).toISOString());
dates[13] = dates[12]!;
const created: { id: string; surveyedAt: string }[] = [];

beforeAll(async () => {
  ({ app } = await makeStoreApp());
  buildingId = (await inject(app, { method: "POST", url: "/v1/buildings", payload: buildingBody() })).json().id;
  // posted out of order, so the order of the list comes from surveyedAt, not from insertion
  for (const i of [...dates.keys()].sort((a, b) => ((a * 7) % 25) - ((b * 7) % 25))) {
    const res = await inject(app, {
      method: "POST",
      url: `/v1/buildings/${buildingId}/surveys`,
      payload: surveyBody({ surveyedAt: dates[i], loads: loads(2 + (i % 4)) }),
    });
    expect(res.statusCode).toBe(201);
    created.push({ id: res.json().id, surveyedAt: dates[i]! });
  }
});
afterAll(() => app.close());

const newestFirst = () =>
  [...created].sort((a, b) => (a.surveyedAt === b.surveyedAt ? (a.id < b.id ? 1 : -1) : a.surveyedAt < b.surveyedAt ? 1 : -1));

async function allPages(query: string, limit: number): Promise<{ items: { id: string }[][] }> {
  const pages: { id: string }[][] = [];
  let cursor: string | null = null;
  do {
    const url: string = `/v1/buildings/${buildingId}/surveys?limit=${limit}${query}${cursor ? `&cursor=${cursor}` : ""}`;
    const res = await inject(app, url);
    expect(res.statusCode).toBe(200);
    const body: { items: { id: string }[]; nextCursor: string | null } = res.json();
    pages.push(body.items);
    cursor = body.nextCursor;
  } while (cursor);
  return { items: pages };
}

describe("GET /v1/buildings/{id}/surveys", () => {
  it("lists newest first by surveyedAt then id, over several pages, each survey once", async () => {
    const { items } = await allPages("", 7);
    expect(items.map((p) => p.length)).toEqual([7, 7, 7, 4]);
    expect(items.flat().map((s) => s.id)).toEqual(newestFirst().map((s) => s.id));
  });

  it("gives summaries from the stored columns", async () => {
    const first = (await inject(app, `/v1/buildings/${buildingId}/surveys?limit=1`)).json().items[0];
    expect(Object.keys(first).sort()).toEqual([
      "displacementPF",
      "id",
      "kW",
      "kvar",
      "kvarRequired",
      "revision",
      "surveyedAt",
      "surveyor",
      "warningCount",
    ]);
    const full = (await inject(app, `/v1/surveys/${first.id}`)).json();
    expect(first).toEqual({
      id: full.id,
      revision: 1,
      surveyedAt: full.inputs.surveyedAt,
      surveyor: "Test surveyor",
      kW: full.result.site.kW,
      kvar: full.result.site.kvar,
      displacementPF: full.result.site.displacementPF,
      kvarRequired: full.result.correction.kvarRequired,
      warningCount: full.result.warnings.length,
    });
  });

  it("reflects a revision in the summary", async () => {
    const target = created[3]!;
    const res = await inject(app, {
      method: "POST",
      url: `/v1/surveys/${target.id}/revisions`,
      payload: { ...surveyBody({ surveyedAt: target.surveyedAt, surveyor: "Reviser" }), reason: "name" },
    });
    expect(res.statusCode).toBe(201);
    const { items } = await allPages("", 100);
    expect(items.flat().find((s) => s.id === target.id)).toMatchObject({ revision: 2, surveyor: "Reviser", kW: res.json().result.site.kW });
  });

  it("filters by from/to, inclusive; a date means the whole day", async () => {
    const all = newestFirst();
    const within = (from: string, to: string) => all.filter((s) => s.surveyedAt >= from && s.surveyedAt <= to).map((s) => s.id);
    const ids = async (q: string) => (await allPages(q, 4)).items.flat().map((s) => s.id);
    expect(await ids("&from=2023-03-02&to=2023-05-01")).toEqual(within("2023-03-02T00:00:00.000Z", "2023-05-01T23:59:59.999Z"));
    expect(await ids("&from=2023-03-02&to=2023-05-01").then((x) => x.length)).toBe(8); // 2 Mar … 1 May 09:00 (twice)
    expect(await ids(`&from=${encodeURIComponent(dates[20]!)}`)).toEqual(within(dates[20]!, "9999"));
    expect(await ids(`&to=${encodeURIComponent("2023-01-11T09:00:00+00:00")}`)).toEqual(within("0", dates[1]!));
    expect(await ids("&from=2030-01-01")).toEqual([]);
  });

  it("refuses bad filters, limits and cursors with 400, and 404s an unknown building", async () => {
    for (const [q, path] of [
      ["from=yesterday", "from"],
      ["to=2023-02-30", "to"],
      ["from=2023-05-01&to=2023-01-01", "from"],
      ["limit=1000", "limit"],
      [`cursor=${Buffer.from(JSON.stringify({ k: "b", n: "x", i: "y" })).toString("base64url")}`, "cursor"],
      ["colour=red", "colour"],
    ] as const) {
      const res = await inject(app, `/v1/buildings/${buildingId}/surveys?${q}`);
      expect(res.statusCode, q).toBe(400);
      expect(res.json().errors[0].path, q).toBe(path);
    }
    expect((await inject(app, "/v1/buildings/bld_none/surveys")).statusCode).toBe(404);
    expect((await inject(app, "/v1/buildings/bld_none/trend")).statusCode).toBe(404);
  });
});

describe("GET /v1/buildings/{id}/trend", () => {
  it("gives one point per survey, oldest first, from the latest revisions", async () => {
    const res = await inject(app, `/v1/buildings/${buildingId}/trend`);
    expect(res.statusCode).toBe(200);
    const trend = res.json();
    expect(trend).toMatchObject({ buildingId, order: "oldest_first", truncated: false });
    expect(trend.items.map((p: { surveyId: string }) => p.surveyId)).toEqual(
      newestFirst()
        .reverse()
        .map((s) => s.id),
    );
    const list = (await allPages("", 100)).items.flat() as Record<string, unknown>[];
    for (const p of trend.items) {
      const s = list.find((x) => x.id === p.surveyId)!;
      expect(p).toEqual({
        surveyId: s.id,
        revision: s.revision,
        surveyedAt: s.surveyedAt,
        kW: s.kW,
        kvar: s.kvar,
        displacementPF: s.displacementPF,
        kvarRequired: s.kvarRequired,
        installedKvarInService: null,
        kvarDelivered: null,
      });
    }
    const narrowed = (await inject(app, `/v1/buildings/${buildingId}/trend?from=2023-06-01&to=2023-06-30`)).json();
    expect(narrowed.items.map((p: { surveyedAt: string }) => p.surveyedAt)).toEqual(dates.filter((d) => d.startsWith("2023-06")));
  });
});

describe("GET /v1/surveys/{id}/loads.csv", () => {
  it("writes one RFC 4180 row per load, measured then computed, with units in the header", async () => {
    const label = 'Pump, "north"\nbay';
    const body = surveyBody({
      loads: [
        { label, kind: "motor", quantity: 2, measurement: { method: "v_i_pf", volts: 400, amps: 30, pf: 0.8, sense: "lagging" } },
        { label: '=HYPERLINK("x")', measurement: { method: "kw_kvar", kW: 12, kvar: -3 } },
        { label: "Lights", kind: "lighting", measurement: { method: "kw_pf", kW: 5, pf: 0.9, sense: "lagging", pfType: "true", currentTHDPct: 20 } },
      ],
    });
    const s = (await inject(app, { method: "POST", url: `/v1/buildings/${buildingId}/surveys`, payload: body })).json();
    const res = await inject(app, `/v1/surveys/${s.id}/loads.csv`);
    expect(res.statusCode).toBe(200);
    expect(res.headers["content-type"]).toMatch(/^text\/csv; charset=utf-8/);
    expect(res.headers["content-disposition"]).toBe(`attachment; filename="${s.id}-r1-loads.csv"`);
    const lines = res.body.split("\r\n");
    expect(lines[0]).toBe(LOADS_CSV_HEADER.join(","));
    expect(lines[0]).toContain("kW (kW)");
    expect(lines[0]).toContain("line current (A)");
    const [l0, l1, l2] = s.result.loads;
    const r = (x: number, d: number) => String(Number(x.toFixed(d)));
    // records end with CRLF; the LF inside the quoted label does not end one
    expect(lines[1]).toBe(
      [
        "1",
        '"Pump, ""north""\nbay"',
        "motor",
        "2",
        "3",
        "v_i_pf",
        "",
        "",
        "",
        "0.8",
        "lagging",
        "400",
        "30",
        "",
        "",
        r(l0.kW, 3),
        r(l0.kvar, 3),
        r(l0.kVA, 3),
        r(l0.displacementPF, 4),
        "lagging",
        r(l0.lineCurrentA, 2),
      ].join(","),
    );
    expect(lines[2]).toBe(
      [
        "2",
        `"'=HYPERLINK(""x"")"`,
        "other",
        "1",
        "3",
        "kw_kvar",
        "12",
        "",
        "-3",
        "",
        "",
        "",
        "",
        "",
        "",
        r(l1.kW, 3),
        r(l1.kvar, 3),
        r(l1.kVA, 3),
        r(l1.displacementPF, 4),
        "leading",
        r(l1.lineCurrentA, 2),
      ].join(","),
    );
    expect(lines[3]).toBe(
      [
        "3",
        "Lights",
        "lighting",
        "1",
        "3",
        "kw_pf",
        "5",
        "",
        "",
        "0.9",
        "lagging",
        "",
        "",
        "true",
        "20",
        r(l2.kW, 3),
        r(l2.kvar, 3),
        r(l2.kVA, 3),
        r(l2.displacementPF, 4),
        "lagging",
        r(l2.lineCurrentA, 2),
      ].join(","),
    );
    expect(lines.slice(4)).toEqual([""]); // the last record ends with CRLF too
    expect(l2.displacementPF).toBeGreaterThan(0.9); // derived from the true PF and THD by the engine
  });

  it("gives a spreadsheet set to ';' or tab no cell that begins a formula (OWASP, CSV Injection)", async () => {
    const labels = ['Feeder 3;=HYPERLINK("x")', ";-2+3", "Chiller\t@SUM(1)", "MCC-2; spare"];
    const body = surveyBody({ loads: labels.map((label) => ({ label, measurement: { method: "kw_kvar", kW: 10, kvar: 4 } })) });
    const s = (await inject(app, { method: "POST", url: `/v1/buildings/${buildingId}/surveys`, payload: body })).json();
    const text = (await inject(app, `/v1/surveys/${s.id}/loads.csv`)).body;
    for (const sep of [";", "\t"]) {
      for (const cell of text.split(/\r\n/).flatMap((line) => line.split(sep))) {
        expect(/^[ \t]*[=+\-@]/.test(cell), `${JSON.stringify(cell)} split on ${JSON.stringify(sep)}`).toBe(false);
      }
    }
    expect(text).toContain(`"Feeder 3;'=HYPERLINK(""x"")"`);
    expect(text).toContain(",;'-2+3,");
    expect(text).toContain(",MCC-2; spare,"); // ordinary text is left alone
  });
});
