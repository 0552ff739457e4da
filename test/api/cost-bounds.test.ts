import type { FastifyInstance } from "fastify";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { MAX_SERIES_POINTS } from "../../src/core/harmonics/site-study.js";
import { size } from "../../src/core/pipeline/size.js";
import { harmonicScanRequestSchema } from "../../src/http/schemas/harmonics.js";
import { MAX_INSTALLED_STEPS, MIN_STEP_KVAR, sizingRequestSchema } from "../../src/http/schemas/sizing.js";
import { makeTestApp } from "../helpers/app.js";
import { inject } from "../helpers/auth.js";
import { exampleSizingBody } from "../helpers/bodies.js";
import { nonFinitePaths } from "../helpers/finite.js";
import { expectClose, TOL } from "../helpers/tolerance.js";
import { worstSizingBody } from "../helpers/worst-bodies.js";

/**
 * Bounded cost: the heaviest requests the schemas accept answer in bounded time and size, and the requests that
 * once stalled the service or failed answer a correct 200 or a 400 naming the field. The time bound is generous
 * (5 s wall on a shared 2-core machine running other suites; the goal is 1 s of CPU), the size bound is the goal.
 */
const WALL_MS = 5_000;
const MAX_ANSWER_BYTES = 10_000_000;

let app: FastifyInstance;
beforeAll(async () => {
  app = await makeTestApp();
});
afterAll(async () => {
  await app.close();
});

async function post(url: string, body: unknown) {
  const payload = JSON.stringify(body);
  const t0 = performance.now();
  const r = await inject(app, { method: "POST", url, payload, headers: { "content-type": "application/json" } });
  return { r, ms: performance.now() - t0 };
}

/** JSON.stringify turns NaN into null: the same body through the engine, its outcome walked before serialising. */
function nonFiniteInEngine(url: string, body: unknown): string[] {
  const { scan, combination, ...sizing } = harmonicScanRequestSchema.parse(body);
  const outcome =
    url === "/v1/sizing"
      ? size(sizingRequestSchema.parse(body))
      : size(sizing, {
          forceHarmonicStudy: true,
          harmonics: { includeScanSeries: true, ...(scan ? { scan } : {}), ...(combination ? { combination } : {}) },
        });
  expect(outcome.ok).toBe(true);
  return nonFinitePaths(outcome).slice(0, 5);
}

/** A body as large as the 1 MiB body limit allows with every load's full 49-order spectrum. */
const SPECTRA_LOADS = 120;

describe("the heaviest schema-valid requests", () => {
  const cases: [string, string, () => Record<string, unknown>][] = [
    ["sizing: 2000 loads × 10 000, 64-step detuned bank, 64 installed steps, full background", "/v1/sizing", () => worstSizingBody()],
    ["sizing: plain 64-step bank, one installed bank of 32 steps", "/v1/sizing", () => worstSizingBody({ proposedReactorPct: 0, installedBanks: 1 })],
    [`sizing: ${SPECTRA_LOADS} loads with full spectra`, "/v1/sizing", () => worstSizingBody({ loads: SPECTRA_LOADS, spectra: true })],
    // 7 series (the bus, 2 + 2 stages, a 2-stage detuned proposal) × 24 501 points: 171 507, near MAX_SERIES_POINTS
    ["scan: 7 series at stepOrder 0.002", "/v1/harmonics/scan", () => ({ ...exampleSizingBody(), scan: { stepOrder: 0.002 } })],
    [
      "scan: the bus alone at the schema's finest grid (49 001 points)",
      "/v1/harmonics/scan",
      () => ({
        ...exampleSizingBody(),
        proposedBank: undefined,
        loads: [{ label: "Heater", kind: "other", measurement: { method: "kw_pf", kW: 10, pf: 0.99, sense: "lagging" } }],
        scan: { fromOrder: 1, toOrder: 50, stepOrder: 0.001 },
      }),
    ],
  ];
  for (const [name, url, body] of cases) {
    it(`${name}: answers within the bounds`, async () => {
      const { r, ms } = await post(url, body());
      expect(r.statusCode, r.body.slice(0, 400)).toBe(200);
      expect(ms).toBeLessThan(WALL_MS);
      expect(r.body.length).toBeLessThan(MAX_ANSWER_BYTES);
      expect(nonFiniteInEngine(url, body())).toEqual([]);
    });
  }
});

describe("the requests that once stalled the service or failed", () => {
  for (const quantity of [1000, 10_000]) {
    it(`quantity ${quantity} of a 1,000,000 kW load: a correct 200 in bounded time`, async () => {
      const body = {
        system: { voltageV: 480, frequencyHz: 60, phases: 3 },
        targetPF: 0.95,
        loads: [{ label: "Smelter", quantity, measurement: { method: "kw_pf", kW: 1_000_000, pf: 0.8, sense: "lagging" } }],
      };
      const { r, ms } = await post("/v1/sizing", body);
      expect(r.statusCode, r.body.slice(0, 400)).toBe(200);
      expect(ms).toBeLessThan(WALL_MS);
      // hand calculation: Q = P·(tan φ1 − tan φ2), P = quantity·1e6 kW, tan(acos 0.8) = 0.75, tan(acos 0.95) = 0.328684
      const kW = quantity * 1e6;
      expectClose(r.json().correction.kvarRequired, kW * (0.75 - Math.tan(Math.acos(0.95))), TOL.power, "kvarRequired");
      expect(r.json().recommendedBank.effectiveKvar).toBeGreaterThan(0);
    });
  }

  it("a 64-step bank scanned at stepOrder 0.001: a 400 naming scan.stepOrder and the limit", async () => {
    const body = {
      ...exampleSizingBody(),
      proposedBank: { ratedVoltageV: 480, reactorPct: 7, steps: Array.from({ length: 64 }, () => ({ kvar: 25 })) },
      scan: { stepOrder: 0.001 },
    };
    const { r, ms } = await post("/v1/harmonics/scan", body);
    expect(r.statusCode).toBe(400);
    expect(ms).toBeLessThan(WALL_MS);
    const err = r.json().errors[0];
    expect(err.path).toBe("scan.stepOrder");
    expect(err.message).toContain(String(MAX_SERIES_POINTS));
  });

  it("a step of 5e-324 kvar with background distortion: a 400 naming the step's kvar and the limit", async () => {
    const body = {
      ...exampleSizingBody(),
      proposedBank: { ratedVoltageV: 480, steps: [{ kvar: 5e-324 }] },
      backgroundVoltageDistortion: [{ order: 5, pct: 3 }],
    };
    for (const url of ["/v1/sizing", "/v1/harmonics/scan"]) {
      const { r } = await post(url, body);
      expect(r.statusCode).toBe(400);
      expect(r.json().errors[0].path).toBe("proposedBank.steps.0.kvar");
      expect(r.json().errors[0].message).toContain(String(MIN_STEP_KVAR));
    }
  });

  it("the smallest step allowed, with background distortion, answers a finite 200", async () => {
    const body = {
      ...exampleSizingBody(),
      proposedBank: { ratedVoltageV: 480, steps: [{ kvar: MIN_STEP_KVAR }] },
      backgroundVoltageDistortion: [{ order: 5, pct: 3 }],
    };
    for (const url of ["/v1/sizing", "/v1/harmonics/scan"]) {
      const { r } = await post(url, body);
      expect(r.statusCode, r.body.slice(0, 400)).toBe(200);
      expect(nonFiniteInEngine(url, body)).toEqual([]);
    }
  });

  it(`more than ${MAX_INSTALLED_STEPS} installed steps in all: a 400 naming installedBanks`, async () => {
    const body = worstSizingBody({ loads: 1, installedBanks: 3 }) as { installedBanks: { steps: unknown[] }[] };
    body.installedBanks[0]!.steps.push({ kvar: 75 });
    body.installedBanks[1]!.steps.push({ kvar: 75 });
    const { r } = await post("/v1/sizing", body);
    expect(r.statusCode).toBe(400);
    expect(r.json().errors[0].path).toBe("installedBanks");
    expect(r.json().errors[0].message).toContain(String(MAX_INSTALLED_STEPS));
  });
});
