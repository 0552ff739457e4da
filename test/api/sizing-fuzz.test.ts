import type { FastifyInstance } from "fastify";
import fc from "fast-check";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import * as sizingContracts from "../../src/http/contracts/sizing.js";
import { sizingResultSchema } from "../../src/http/schemas/results.js";
import { makeTestApp } from "../helpers/app.js";
import { exampleSizingBody } from "../helpers/bodies.js";
import { inject } from "../helpers/auth.js";

/** Robustness: no body, however wrong, gets a 500; every 200 is a schema-valid result. Deterministic seeds. */
const SEED = Number(process.env.FC_SEED ?? 0xf022);
const RUNS = Number(process.env.FC_RUNS ?? 300);

let app: FastifyInstance;
beforeAll(async () => {
  app = await makeTestApp();
});
afterAll(async () => {
  await app.close();
});

const declared = sizingContracts.size.response["200"]?.content?.["application/json"]?.schema;

async function post(payload: string, contentType = "application/json") {
  return inject(app, { method: "POST", url: "/v1/sizing", payload, headers: { "content-type": contentType } });
}

function allNumbersFinite(v: unknown): boolean {
  if (typeof v === "number") return Number.isFinite(v);
  if (Array.isArray(v)) return v.every(allNumbersFinite);
  if (v && typeof v === "object") return Object.values(v).every(allNumbersFinite);
  return true;
}

/** Status 200 (schema-valid, finite) or a 4xx problem; anything else fails with the payload shown. */
function expectHandled(r: Awaited<ReturnType<typeof post>>, payload: string): void {
  const show = payload.length > 300 ? `${payload.slice(0, 300)}…` : payload;
  if (r.statusCode === 200) {
    const body = r.json();
    for (const schema of [sizingResultSchema, declared]) {
      const parsed = schema!.safeParse(body);
      expect(parsed.success, `200 not schema-valid for ${show}: ${parsed.success ? "" : JSON.stringify(parsed.error.issues.slice(0, 3))}`).toBe(true);
    }
    expect(allNumbersFinite(body), `non-finite number in 200 for ${show}`).toBe(true);
    return;
  }
  expect(r.statusCode >= 400 && r.statusCode < 500, `status ${r.statusCode} for ${show}: ${r.body.slice(0, 300)}`).toBe(true);
  expect(r.headers["content-type"]).toMatch(/^application\/problem\+json/);
  const body = r.json();
  expect(body.status).toBe(r.statusCode);
}

describe("junk bodies", () => {
  it("random JSON values → a 4xx problem, never a 500", async () => {
    await fc.assert(
      fc.asyncProperty(fc.jsonValue(), async (v) => {
        const payload = JSON.stringify(v) ?? "";
        const r = await post(payload);
        expectHandled(r, payload);
        expect(r.statusCode).toBe(400);
      }),
      { numRuns: RUNS, seed: SEED },
    );
  });

  it("fc.anything() serialised → never a 500", async () => {
    await fc.assert(
      fc.asyncProperty(fc.anything(), async (v) => {
        let payload: string;
        try {
          payload = JSON.stringify(v) ?? "";
        } catch {
          payload = String(v);
        }
        expectHandled(await post(payload), payload);
      }),
      { numRuns: RUNS, seed: SEED + 1 },
    );
  });

  it("random text and bytes declared as JSON → 400", async () => {
    await fc.assert(
      fc.asyncProperty(
        fc.oneof(
          fc.string({ unit: "binary" }),
          fc.uint8Array({ maxLength: 200 }).map((b) => Buffer.from(b).toString("latin1")),
        ),
        async (s) => {
          const r = await post(s);
          expectHandled(r, s);
        },
      ),
      { numRuns: RUNS, seed: SEED + 2 },
    );
  });
});

/** Every path to a value in the example body (objects and arrays included). */
function pathsOf(v: unknown, at: (string | number)[] = []): (string | number)[][] {
  const out: (string | number)[][] = [at];
  if (Array.isArray(v)) v.forEach((x, i) => out.push(...pathsOf(x, [...at, i])));
  else if (v && typeof v === "object") for (const [k, x] of Object.entries(v)) out.push(...pathsOf(x, [...at, k]));
  return out;
}
const EXAMPLE_PATHS = pathsOf(exampleSizingBody()).filter((p) => p.length > 0);

type Mutation = { path: (string | number)[]; op: "delete" | "set" | "scale"; value?: unknown; factor?: number };

/** Plausible-magnitude replacements (huge magnitudes are a separate, reported finding below). */
const replacement = fc.oneof(
  fc.double({ min: -1e6, max: 1e6, noNaN: true, noDefaultInfinity: true }),
  fc.integer({ min: -100, max: 3000 }),
  fc.constantFrom(0, -0, 1, 0.5, 0.8, 1.0000001, 50, 60, 3, 2, 35_000, 35_001, 49.999),
  fc.string({ maxLength: 12 }),
  fc.constantFrom("lagging", "leading", "unity", "kw_kva", "kw_kvar", "kw_pf", "v_i_kw", "v_i_pf", "drive", "true", "six_pulse"),
  fc.boolean(),
  fc.constant(null),
  fc.array(fc.integer({ min: 0, max: 60 }), { maxLength: 3 }),
  fc.dictionary(fc.constantFrom("kvar", "order", "pct", "kW", "x"), fc.integer({ min: -5, max: 400 }), { maxKeys: 3 }),
);

const mutationArb: fc.Arbitrary<Mutation> = fc.record({
  path: fc.constantFrom(...EXAMPLE_PATHS),
  op: fc.constantFrom("delete" as const, "set" as const, "scale" as const),
  value: replacement,
  factor: fc.constantFrom(-1, 0, 0.001, 0.5, 1.01, 2, 10, 1000),
});

function applyMutation(body: any, m: Mutation): void {
  const parentPath = m.path.slice(0, -1);
  const key = m.path[m.path.length - 1] as string | number;
  let parent = body;
  for (const k of parentPath) {
    if (parent === null || typeof parent !== "object") return;
    parent = parent[k];
  }
  if (parent === null || typeof parent !== "object" || !(key in parent)) return;
  if (m.op === "delete") {
    if (Array.isArray(parent)) parent.splice(key as number, 1);
    else delete parent[key];
  } else if (m.op === "scale" && typeof parent[key] === "number") parent[key] = parent[key] * (m.factor ?? 1);
  else parent[key] = m.value;
}

describe("mutated valid bodies", () => {
  it("one to four mutations of the contract example → a schema-valid 200 or a 400 problem, never a 500", async () => {
    let ok = 0;
    await fc.assert(
      fc.asyncProperty(fc.array(mutationArb, { minLength: 1, maxLength: 4 }), fc.boolean(), async (mutations, addDrive) => {
        const body = exampleSizingBody();
        if (addDrive) body.loads.push({ label: "VFD", kind: "drive", measurement: { method: "kw_kva", kW: 40, kVA: 50 } });
        for (const m of mutations) applyMutation(body, m);
        const payload = JSON.stringify(body);
        const r = await post(payload);
        expectHandled(r, payload);
        if (r.statusCode === 200) ok++;
      }),
      { numRuns: RUNS, seed: SEED + 3 },
    );
    // the property is not vacuous: some mutations (e.g. a scaled reading) stay valid
    expect(ok).toBeGreaterThan(0);
  });
});

describe("extreme magnitudes the schema accepts", () => {
  // kW, kVA, kvar and amps are bounded in the schema, so products and sums cannot overflow to Infinity (JSON null).
  it("amps 1e308 is handled (a 400, not a 200 with null numbers)", async () => {
    const b = exampleSizingBody();
    b.loads[0].measurement.amps = 1e308;
    const payload = JSON.stringify(b);
    const r = await post(payload);
    expectHandled(r, payload);
    expect(r.statusCode).toBe(400);
    expect(r.json().errors[0].path).toBe("loads.0.measurement.amps");
  });

  it("two kw_kvar loads of 1e308 kW are handled (no overflow in the site sum)", async () => {
    const b = exampleSizingBody();
    const load = { label: "huge", measurement: { method: "kw_kvar", kW: 1e308, kvar: 1e308 } };
    b.loads = [load, load];
    const payload = JSON.stringify(b);
    const r = await post(payload);
    expectHandled(r, payload);
    expect(r.statusCode).toBe(400);
  });
});
