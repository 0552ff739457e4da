import type { FastifyInstance } from "fastify";
import fc from "fast-check";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { organisationNamed } from "../../src/auth/bootstrap.js";
import type { Store } from "../../src/store/ports.js";
import { inject, keyFor, keyIdOf } from "../helpers/auth.js";
import { makeStoreApp, rowCounts } from "../helpers/db.js";
import {
  appRoutes,
  label,
  queryNames,
  takesBody,
  takesUpload,
  urlWithIds,
  validBody,
  weekCsv,
  type AppRoute,
  type RouteIds,
} from "../helpers/routes.js";
import { buildingBody, surveyBody } from "../store/fixtures.js";
import { sqlRows } from "../helpers/store.js";

/**
 * Property-based fuzzing of every route of the app (read from the app, so a new route is fuzzed too; the survey page's
 * static files and the docs viewer as well): random or mutated bodies, queries, path parameters and headers (keys of
 * every role, another organisation's, junk). No answer is ≥ 500 and a rejected request changes no row. FUZZ_RUNS
 * cases in total (300 by default; 10 000 for a long run).
 */
const TOTAL = Number(process.env.FUZZ_RUNS ?? 300);
const SEED = Number(process.env.FC_SEED ?? 0x5eed);

const routes = await appRoutes();
const perRoute = Math.max(1, Math.ceil(TOTAL / routes.length));

let app: FastifyInstance;
let store: Store;
const ids = {} as RouteIds;
const keys: (string | undefined)[] = [];
const week = weekCsv;

beforeAll(async () => {
  ({ app, store } = await makeStoreApp());
  const b = (await inject(app, { method: "POST", url: "/v1/buildings", payload: buildingBody({ name: "Fuzz hall" }) })).json();
  ids.building = b.id;
  ids.interval = (
    await inject(app, { method: "POST", url: `/v1/buildings/${b.id}/interval-analyses`, headers: { "content-type": "text/csv" }, payload: week })
  ).json().id;
  ids.survey = (await inject(app, { method: "POST", url: `/v1/buildings/${b.id}/surveys`, payload: surveyBody() })).json().id;
  const spare = await keyFor(app, "auditor");
  ids.key = keyIdOf(app, spare);
  const other = await keyFor(app, "admin", (await organisationNamed(store, "Fuzz other")).id);
  // 0: the admin key (inject adds it); 1 and 7: no key or a junk header; then malformed, another organisation's, each role.
  keys.push(undefined, undefined, "Bearer", "junk", other, await keyFor(app, "surveyor"), await keyFor(app, "auditor"), undefined);
});
afterAll(() => app.close());

const printable = fc.string({ unit: fc.mapToConstant({ num: 95, build: (v) => String.fromCharCode(v + 0x20) }), maxLength: 40 });

/** A valid body with one field replaced by a random value, or removed. */
function mutated(valid: unknown): fc.Arbitrary<unknown> {
  const paths: string[][] = [];
  const walk = (v: unknown, p: string[]) => {
    if (p.length) paths.push(p);
    if (v && typeof v === "object") for (const [k, c] of Object.entries(v)) walk(c, [...p, k]);
  };
  walk(valid, []);
  if (!paths.length) return fc.constant(valid);
  return fc.tuple(fc.nat(paths.length - 1), fc.option(fc.jsonValue({ maxDepth: 2 }))).map(([i, value]) => {
    const copy = structuredClone(valid) as Record<string, any>;
    const path = paths[i] as string[];
    let at: any = copy;
    for (const k of path.slice(0, -1)) at = at[k];
    const last = path[path.length - 1] as string;
    if (value === null) delete at[last];
    else at[last] = value;
    return copy;
  });
}

function bodyArb(r: AppRoute): fc.Arbitrary<{ payload?: string; type?: string }> {
  const types = fc.constantFrom(
    undefined,
    "application/json",
    "text/csv",
    "text/plain",
    "multipart/form-data; boundary=zz",
    "application/x-www-form-urlencoded",
  );
  if (takesUpload(r)) {
    const csv = fc.oneof(
      fc.constant(week),
      printable,
      fc.tuple(fc.nat(week.length), printable).map(([i, s]) => week.slice(0, i) + s + week.slice(i)),
    );
    return fc.record({ payload: csv, type: fc.oneof(fc.constant("text/csv"), types) });
  }
  if (!takesBody(r))
    return fc.record({
      payload: fc.option(
        fc.jsonValue().map((v) => JSON.stringify(v) ?? ""),
        { nil: undefined },
      ),
      type: types,
    });
  const valid = validBody(r, "fuzz")?.payload;
  const json = fc.oneof(fc.constant(valid), mutated(valid), fc.jsonValue()).map((v) => JSON.stringify(v) ?? "");
  return fc.record({ payload: fc.oneof(json, printable), type: fc.oneof(fc.constant("application/json"), types) });
}

function urlArb(r: AppRoute): fc.Arbitrary<string> {
  // Each parameter (and a wildcard's tail) real or random; the real URL on its own too.
  const parts = r.url.split(/(:\w+|\*)/);
  const real = urlWithIds(r.url, ids).replace("*", "");
  const random = fc.tuple(
    ...parts.map((p, i) => (i % 2 === 1 ? fc.oneof(fc.constant(p === ":n" ? "1" : ""), printable.map(encodeURIComponent)) : fc.constant(p))),
  );
  const path = fc.oneof(
    fc.constant(real),
    random.map((ps) => ps.join("")),
  );
  const names = [...queryNames(r), "limit", "cursor", "x"];
  const query = fc.dictionary(fc.constantFrom(...names), printable, { maxKeys: 3 }).map((q) => new URLSearchParams(q).toString());
  return fc.tuple(path, query).map(([p, q]) => p + (q ? `?${q}` : ""));
}

const headerArb = fc.record({
  key: fc.nat(7),
  junkAuth: fc.option(printable, { nil: undefined }),
  idem: fc.option(printable, { nil: undefined }),
  extra: fc.option(fc.tuple(fc.constantFrom("x-request-id", "accept", "if-none-match", "origin", "content-length"), printable), { nil: undefined }),
});

/** Row counts, plus the columns an UPDATE can change (building versions, latest revisions, revocations). */
async function fingerprint(): Promise<string> {
  const changed = await sqlRows(
    store,
    "SELECT (SELECT coalesce(sum(version), 0) FROM buildings) AS v, (SELECT coalesce(sum(latest_revision), 0) FROM surveys) AS r, (SELECT count(revoked_at) FROM api_keys) AS k",
  );
  return JSON.stringify([await rowCounts(store), changed]);
}

describe("fuzzing every route", () => {
  it.each(routes.map((r) => [label(r), r] as const))("%s: never ≥ 500, a rejection changes nothing", async (_, r) => {
    await fc.assert(
      fc.asyncProperty(urlArb(r), bodyArb(r), headerArb, async (url, body, h) => {
        const headers: Record<string, string> = {};
        const admin = h.key === 0;
        const key = keys[h.key];
        if (!admin) headers.authorization = key ? (key.startsWith("pfc_") ? `Bearer ${key}` : key) : (h.junkAuth ?? "");
        if (!admin && key === undefined && h.junkAuth === undefined) delete headers.authorization;
        if (body.type) headers["content-type"] = body.type;
        if (h.idem !== undefined) headers["idempotency-key"] = h.idem;
        if (h.extra) headers[h.extra[0]] = h.extra[1];
        const before = await fingerprint();
        const method = r.method as "GET";
        const res = admin
          ? await inject(app, { method, url, headers, ...(body.payload === undefined || method === "GET" ? {} : { payload: body.payload }) })
          : await app.inject({ method, url, headers, ...(body.payload === undefined || method === "GET" ? {} : { payload: body.payload }) });
        const shown = `${method} ${url} ${JSON.stringify(headers)} ${String(body.payload).slice(0, 200)}`;
        expect(res.statusCode, `${res.statusCode} for ${shown}: ${res.body.slice(0, 300)}`).toBeLessThan(500);
        if (res.statusCode >= 400) {
          expect(res.headers["content-type"], shown).toMatch(/^application\/problem\+json/);
          expect(await fingerprint(), `a rejected ${shown} changed stored data`).toBe(before);
        }
      }),
      { numRuns: perRoute, seed: SEED },
    );
  });
});
