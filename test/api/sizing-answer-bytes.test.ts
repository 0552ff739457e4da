import type { FastifyInstance } from "fastify";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { twentyLoadBody } from "../../bench/bodies.js";
import { twentyLoadBodyWithDrives } from "../../bench/engine.js";
import { size } from "../../src/core/pipeline/size.js";
import { jsonBytes } from "../../src/application/json-bytes.js";
import { sizingRequestSchema } from "../../src/http/schemas/sizing.js";
import { makeTestApp } from "../helpers/app.js";
import { api } from "../helpers/auth.js";

/**
 * POST /v1/sizing writes its answer as UTF-8 bytes it serialised itself (src/application/json-bytes.ts): every field must
 * survive, so the answer is byte for byte JSON.stringify's of the same result, and reads back as it.
 */

describe("jsonBytes", () => {
  const samples: [string, unknown][] = [
    ["typographic characters", { note: "≥ 135 % — see → notes; √3·V·I; ±10 %; 5 Ω; X²" }],
    ["Latin-1 and DEL", { s: "café\u00a0naïve\u007f" }],
    ["a character outside the BMP (a surrogate pair)", { s: "kvar 🔋 ok" }],
    ["a lone surrogate", { s: "a\ud800b\udc00c" }],
    ["control characters, quotes and backslashes", { s: 'tab\tline\nquote"back\\slash\u0001' }],
    ["numbers, nulls, booleans, nesting", { n: [0, -0, 1e-300, 1.7976931348623157e308, 0.1 + 0.2], z: null, t: true, o: { a: [{ b: "Ω" }] } }],
    ["a bare string", "≥"],
    ["an empty object", {}],
  ];
  for (const [name, value] of samples) {
    it(`${name}: JSON.stringify's text in UTF-8`, () => {
      const bytes = jsonBytes(value);
      expect(Buffer.isBuffer(bytes)).toBe(true);
      expect(bytes.toString("utf8")).toBe(JSON.stringify(value));
      expect(JSON.parse(bytes.toString("utf8"))).toEqual(JSON.parse(JSON.stringify(value)));
    });
  }
});

/** One byte a character in UTF-8: nothing beyond ASCII. */
const isAscii = (text: string): boolean => Buffer.byteLength(text, "utf8") === text.length;

type Body = Record<string, unknown> & { loads: Record<string, unknown>[] };
const copy = <T>(v: T): T => JSON.parse(JSON.stringify(v)) as T;

/** The bench body, and bodies that reach the other parts of an answer. */
function bodies(): [string, Body][] {
  const plain = twentyLoadBody() as Body;
  const drives = twentyLoadBodyWithDrives() as Body;
  const installed = copy(drives);
  installed.installedBanks = [
    { label: "MSB", location: "service", control: "automatic", ratedVoltageV: 480, steps: [{ kvar: 50 }, { kvar: 50 }, { kvar: 50 }], reactorPct: 7 },
    { label: "Fixed 1", location: "service", control: "fixed", ratedVoltageV: 480, steps: [{ kvar: 25 }] },
  ];
  installed.bankReadings = [
    {
      bank: "MSB",
      inServiceSteps: [1, 2],
      stepCurrents: [
        { step: 1, amps: [60, 59, 61] },
        { step: 2, amps: 30 },
      ],
    },
  ];
  const leading = copy(plain);
  leading.loads = leading.loads.slice(0, 3).map((l, i) => ({ ...l, measurement: { method: "kw_kvar", kW: 50 + i, kvar: -40 } }));
  leading.proposedBank = { ratedVoltageV: 480, steps: [{ kvar: 400 }] };
  const distorted = copy(drives);
  distorted.backgroundVoltageDistortion = [
    { order: 5, pct: 2.5 },
    { order: 7, pct: 1.5 },
    { order: 11, pct: 0.5 },
  ];
  distorted.loads[1]!.harmonics = [
    { order: 5, pct: 30 },
    { order: 7, pct: 12 },
    { order: 3, pct: 8 },
  ];
  distorted.harmonicSources = ["twelve_pulse"];
  distorted.bankDesign = { ctRatio: 200, reactorPct: 7, ratedVoltageV: 525, protectionDevice: "breaker" };
  const priced = copy(plain);
  priced.economics = {
    currency: "USD",
    tariff: { form: "kw_demand_pf_adjusted", chargePerKW: 12, basePF: 0.95 },
    cost: { perKvar: 30, perStep: 500, fixed: 2000 },
  };
  priced.serviceEntrance = { measurement: { method: "kw_pf", kW: 900, pf: 0.78, sense: "lagging" } };
  priced.lightLoad = { measurement: { method: "kw_pf", kW: 200, pf: 0.8, sense: "lagging" } };
  priced.scope = "whole_site";
  // the engine's own texts are Latin-1 (test/core/latin1-texts.test.ts); a user's label may hold anything
  const labelled = copy(plain);
  labelled.loads[0]!.label = "Bomba nº 2 — sótano ≥ 3 🔧";
  return [
    ["the bench body", plain],
    ["drives (harmonic study, detuned proposal)", drives],
    ["installed banks with readings", installed],
    ["a leading site", leading],
    ["background distortion, a measured spectrum, a designed detuned bank", distorted],
    ["economics, a service entrance and a light-load reading", priced],
    ["a label beyond Latin-1 (a two-byte answer)", labelled],
  ];
}

let app: FastifyInstance;
beforeAll(async () => {
  app = await makeTestApp();
});
afterAll(async () => {
  await app.close();
});

describe("POST /v1/sizing answers JSON.stringify's bytes of the result", () => {
  const cases = bodies();
  for (const [name, body] of cases) {
    it(name, async () => {
      const res = await api(app).post("/v1/sizing").send(body);
      expect(res.status).toBe(200);
      expect(res.headers["content-type"]).toMatch(/^application\/json; charset=utf-8/);
      const outcome = size(sizingRequestSchema.parse(body));
      if (!outcome.ok) throw new Error("the body must size");
      const expected = JSON.stringify(outcome.result);
      expect(res.text).toBe(expected);
      expect(res.headers["content-length"]).toBe(String(Buffer.byteLength(expected)));
      expect(JSON.parse(res.text)).toEqual(JSON.parse(expected));
    });
  }

  it("the bodies reach installed banks, the harmonic study, warnings and non-ASCII text (not vacuous)", () => {
    const results = cases.map(([, body]) => {
      const outcome = size(sizingRequestSchema.parse(body));
      if (!outcome.ok) throw new Error("the body must size");
      return outcome.result;
    });
    expect(results.some((r) => r.installedBanks !== undefined && r.combinedStages !== undefined)).toBe(true);
    expect(results.some((r) => (r.harmonics?.proposals.length ?? 0) > 0)).toBe(true);
    expect(results.some((r) => r.economics !== undefined)).toBe(true);
    expect(results.some((r) => r.site.sense === "leading")).toBe(true);
    expect(results.every((r) => r.warnings.length > 0)).toBe(true);
    expect(results.filter((r) => !isAscii(JSON.stringify(r))).length).toBeGreaterThanOrEqual(3);
    // Latin-1 answers from the engine's texts alone, and one two-byte answer from the label
    expect(results.filter((r) => /[\u0100-\uffff]/.test(JSON.stringify(r)))).toHaveLength(1);
  });
});
