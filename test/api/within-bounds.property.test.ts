import type { FastifyInstance } from "fastify";
import fc from "fast-check";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { size } from "../../src/core/pipeline/size.js";
import { harmonicScanRequestSchema } from "../../src/http/schemas/harmonics.js";
import { MAX_FIGURE, MIN_FIGURE, MIN_PF, MIN_REACTOR_PCT, MIN_STEP_KVAR, sizingRequestSchema } from "../../src/http/schemas/sizing.js";
import { makeTestApp } from "../helpers/app.js";
import { inject } from "../helpers/auth.js";
import { nonFinitePaths } from "../helpers/finite.js";

/**
 * Bodies generated WITHIN every bound of the sizing and scan schemas (tiny and huge magnitudes, many steps, extreme
 * but valid PF and voltages, spectra): never a 5xx, and no NaN or Infinity anywhere in an answer. JSON.stringify
 * turns NaN into null, so each 200's body is also run through the engine and its outcome walked before serialising.
 * Deterministic seed; FC_RUNS raises the run count.
 */
const SEED = Number(process.env.FC_SEED ?? 0xb0d5);
const RUNS = Number(process.env.FC_RUNS ?? 120);

let app: FastifyInstance;
beforeAll(async () => {
  app = await makeTestApp();
});
afterAll(async () => {
  await app.close();
});

/** Log-uniform over the schema's whole range, with its edges and a few awkward values as constants. */
const magnitude = (min: number, max: number) =>
  fc.oneof(
    {
      weight: 4,
      arbitrary: fc
        .double({ min: Math.log10(Math.max(min, 1e-300)), max: Math.log10(max), noNaN: true })
        .map((e) => Math.min(max, Math.max(min, 10 ** e))),
    },
    { weight: 1, arbitrary: fc.constantFrom(...[min, max, 1, 1e-3, 0.5].filter((x) => x >= min && x <= max && x > 0)) },
  );
/** A power or current figure as the schema allows it: MIN_FIGURE to MAX_FIGURE. */
const figure = fc.oneof(
  { weight: 6, arbitrary: magnitude(MIN_FIGURE, MAX_FIGURE) },
  { weight: 1, arbitrary: fc.constantFrom(MIN_FIGURE, MAX_FIGURE) },
);
const pf = fc.oneof(fc.double({ min: MIN_PF, max: 1, noNaN: true }), fc.constantFrom(1, 0.999999, MIN_PF, 0.8));
const volts = fc.oneof(fc.double({ min: 50, max: 35_000, noNaN: true }), fc.constantFrom(50, 35_000, 480, 208));
const thd = fc.record(
  { pfType: fc.constantFrom("displacement", "true"), currentTHDPct: fc.double({ min: 0, max: 300, noNaN: true }) },
  { requiredKeys: [] },
);

type System = { voltageV: number; frequencyHz: number; phases: 1 | 3 };

/**
 * A reading consistent enough for the engine's plausibility checks (kW ≤ kVA, a meter voltage near the system's):
 * one triangle S, PF, sense written in any of the five methods, with every figure inside the schema's range.
 */
const measurement = (sys: System) =>
  fc
    .record({
      kVA: figure,
      pf,
      sense: fc.constantFrom("lagging", "leading"),
      method: fc.constantFrom("kw_kva", "kw_kvar", "kw_pf", "v_i_kw", "v_i_pf"),
      vFactor: fc.double({ min: 0.45, max: 1.9, noNaN: true }),
      t: thd,
    })
    .map(({ kVA, pf: p, sense: sn, method, vFactor, t }) => {
      const kW = Math.max(MIN_FIGURE, Math.min(MAX_FIGURE, kVA * p));
      const sense = p === 1 ? "unity" : sn;
      const volts = Math.min(35_000, Math.max(50, sys.voltageV * vFactor));
      const amps = Math.max(MIN_FIGURE, Math.min(MAX_FIGURE, (kVA * 1000) / (sys.phases === 3 ? Math.sqrt(3) * volts : volts)));
      const kvar = Math.min(MAX_FIGURE, kVA * Math.sqrt(Math.max(0, 1 - p * p))) * (sn === "leading" ? -1 : 1);
      const m =
        method === "kw_kva"
          ? { method, kW, kVA }
          : method === "kw_kvar"
            ? { method, kW, kvar }
            : method === "kw_pf"
              ? { method, kW, pf: p, sense }
              : method === "v_i_kw"
                ? { method, volts, amps, kW: Math.min(kW, (amps * volts * (sys.phases === 3 ? Math.sqrt(3) : 1)) / 1000) }
                : { method, volts, amps, pf: p, sense };
      return { ...m, ...t };
    });

/** Distinct orders 2–50, percents summing to at most `maxSum`. */
const spectrum = (maxPct: number, maxSum: number) =>
  fc.uniqueArray(fc.integer({ min: 2, max: 50 }), { minLength: 1, maxLength: 49 }).chain((orders) =>
    fc.array(fc.double({ min: 0, max: maxPct, noNaN: true }), { minLength: orders.length, maxLength: orders.length }).map((pcts) => {
      const sum = pcts.reduce((a, b) => a + b, 0);
      const k = sum > maxSum ? maxSum / sum : 1;
      return orders.map((order, i) => ({ order, pct: (pcts[i] ?? 0) * k * 0.999 }));
    }),
  );

const load = (sys: System) =>
  fc.record(
    {
      label: fc.constantFrom("Press", "Kiln fan", "Chiller 2", "Line B"),
      kind: fc.constantFrom("motor", "drive", "lighting", "hvac", "welder", "other"),
      phases: fc.constant(sys.phases),
      quantity: fc.oneof(fc.integer({ min: 1, max: 10_000 }), fc.constant(10_000)),
      measurement: measurement(sys),
      harmonics: spectrum(300, 300),
      starting: fc.constantFrom("across_the_line", "star_delta", "soft_starter", "jogging"),
      separateCapacitorContactor: fc.boolean(),
      group: fc.constantFrom("MCC 1", "MCC 2"),
      noLoadAmps: figure,
      continuousDuty: fc.boolean(),
      motorConductorAmpacityA: figure,
    },
    { requiredKeys: ["label", "measurement"] },
  );

const stepKvar = fc.oneof(magnitude(MIN_STEP_KVAR, 100_000), fc.constantFrom(MIN_STEP_KVAR, 100_000));
const bank = fc.record(
  {
    ratedVoltageV: volts,
    ratedFrequencyHz: fc.constantFrom(50, 60),
    steps: fc.array(fc.record({ kvar: stepKvar }), { minLength: 1, maxLength: 64 }),
    reactorPct: fc.oneof(fc.double({ min: MIN_REACTOR_PCT, max: 20, noNaN: true }), fc.constantFrom(0, MIN_REACTOR_PCT, 5.67, 7, 14, 20)),
  },
  { requiredKeys: ["ratedVoltageV", "steps"] },
);

const installedBanks = fc
  .array(
    fc.record({
      location: fc.constant("service"),
      control: fc.constantFrom("fixed", "automatic"),
      ratedVoltageV: volts,
      reactorPct: fc.constantFrom(0, 7, 14),
      steps: fc.array(fc.record({ kvar: stepKvar }), { minLength: 1, maxLength: 32 }),
    }),
    { minLength: 1, maxLength: 3 },
  )
  .map((banks) => {
    let left = 64;
    return banks.map((b, i) => {
      const steps =
        b.control === "fixed" ? b.steps.slice(0, 1) : b.steps.slice(0, Math.max(1, Math.min(b.steps.length, left - (banks.length - i - 1))));
      left -= steps.length;
      return { ...b, label: `Bank ${i + 1}`, steps };
    });
  });

const system = fc.record({ voltageV: volts, frequencyHz: fc.constantFrom(50, 60), phases: fc.constantFrom<1 | 3>(1, 3) });
const sizingBody = system.chain((sys) =>
  fc.record(
    {
      system: fc.constant(sys),
      targetPF: fc.oneof(fc.double({ min: 0.8, max: 1, noNaN: true }), fc.constantFrom(0.8, 1)),
      loads: fc.array(load(sys), { minLength: 1, maxLength: 12 }),
      serviceEntrance: fc.record({ measurement: measurement(sys) }),
      lightLoad: fc.record({ measurement: measurement(sys) }),
      transformer: fc.record(
        {
          kVA: figure,
          impedancePct: fc.oneof(
            fc.double({ min: 0.5, max: 25, noNaN: true }).filter((x) => x > 0.5),
            fc.constantFrom(25, 0.5000001),
          ),
          xOverR: fc.oneof(fc.double({ min: 0.1, max: 100, noNaN: true }), fc.constantFrom(0.1, 100)),
        },
        { requiredKeys: ["kVA", "impedancePct"] },
      ),
      utility: fc.record({ faultMVA: figure }),
      proposedBank: bank,
      harmonicSources: fc.uniqueArray(fc.constantFrom("six_pulse", "twelve_pulse", "single_phase_electronic"), { maxLength: 3 }),
      backgroundVoltageDistortion: spectrum(20, 49 * 20),
      installedBanks,
      bankDesign: fc.record(
        {
          ctRatio: magnitude(1e-3, 100_000),
          reactorPct: fc.constantFrom(0, MIN_REACTOR_PCT, 7, 20),
          coverage: fc.double({ min: 0.5, max: 1, noNaN: true }),
          protectionDevice: fc.constantFrom("fuse", "breaker"),
          ocpdFactor: fc.double({ min: 1, max: 3, noNaN: true }),
        },
        { requiredKeys: [] },
      ),
      economics: fc.record({
        currency: fc.constant("EUR"),
        tariff: fc.record({ form: fc.constant("kva_demand"), chargePerKVA: fc.double({ min: 0, max: 1e9, noNaN: true }) }),
      }),
    },
    { requiredKeys: ["system", "loads"] },
  ),
);

const scanBody = fc
  .tuple(
    sizingBody,
    fc.record(
      {
        fromOrder: fc.double({ min: 1, max: 40, noNaN: true }),
        toOrder: fc.double({ min: 41, max: 50, noNaN: true }),
        stepOrder: fc.oneof(fc.double({ min: 0.001, max: 1, noNaN: true }), fc.constantFrom(0.001, 0.01, 1)),
      },
      { requiredKeys: [] },
    ),
    fc.constantFrom("arithmetic", "rss"),
  )
  .map(([b, scan, combination]) => ({ ...b, transformer: b.transformer ?? { kVA: 1500, impedancePct: 5.75 }, scan, combination }));

async function post(url: string, body: unknown) {
  return inject(app, { method: "POST", url, payload: JSON.stringify(body), headers: { "content-type": "application/json" } });
}

describe("bodies within every bound", () => {
  it("/v1/sizing: no 5xx, no NaN or Infinity in an answer", async () => {
    let answered = 0;
    await fc.assert(
      fc.asyncProperty(sizingBody, async (body) => {
        const parsed = sizingRequestSchema.safeParse(body);
        const r = await post("/v1/sizing", body);
        expect(r.statusCode, r.body.slice(0, 300)).toBeLessThan(500);
        if (r.statusCode !== 200) return;
        answered++;
        expect(parsed.success).toBe(true);
        if (parsed.success) expect(nonFinitePaths(size(parsed.data)).slice(0, 5)).toEqual([]);
      }),
      { numRuns: RUNS, seed: SEED },
    );
    // not vacuous: most generated bodies are answered (the rest are readings the engine finds implausible)
    expect(answered).toBeGreaterThan(RUNS / 3);
  }, 90_000);

  it("/v1/harmonics/scan: no 5xx, no NaN or Infinity in an answer", async () => {
    let answered = 0;
    await fc.assert(
      fc.asyncProperty(scanBody, async (body) => {
        const r = await post("/v1/harmonics/scan", body);
        expect(r.statusCode, r.body.slice(0, 300)).toBeLessThan(500);
        if (r.statusCode !== 200) return;
        answered++;
        const { scan, combination, ...sizing } = harmonicScanRequestSchema.parse(body);
        const outcome = size(sizing, { forceHarmonicStudy: true, harmonics: { includeScanSeries: true, ...(scan ? { scan } : {}), combination } });
        expect(nonFinitePaths(outcome).slice(0, 5)).toEqual([]);
      }),
      { numRuns: Math.ceil(RUNS / 8), seed: SEED + 1 },
    );
    expect(answered).toBeGreaterThan(0);
  }, 90_000);
});
