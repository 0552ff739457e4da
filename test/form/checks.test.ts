/**
 * The page's own arithmetic and checks (src/form/checks.js, drafts.js), run in Node: the live figures must agree
 * with the service's engine on the same reading (the engine's triangleOf is the oracle, over random readings of
 * every method), and the helpers parse what an electrician types.
 */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { expectedStep } from "../../src/core/bank/installed.js";
import { triangleOf } from "../../src/core/readings/triangle.js";
import type { Measurement } from "../../src/core/inputs.js";
import { expectClose, TOL } from "../helpers/tolerance.js";

// Plain ES modules with no type declarations: imported by a computed name so the type checker leaves them be.
const formDir = "../../src/form/";
const checks = (await import(`${formDir}checks.js`)) as {
  triangle: (m: Record<string, unknown>, phases: number) => { kW: number; kvar: number; kVA: number; pf: number; error?: { field: string } } | null;
  voltsHint: (raw: string, system: { voltageV: number; phases: number }) => string;
  ctRatioOf: (raw: string) => number | null;
  spectrumOf: (raw: string) => { order: number; pct: number }[] | string | null;
  spectrum: (raw: string) => string;
  num: (raw: string) => number | null;
  stepsOf: (raw: string) => { kvar: number }[] | string | null;
  steps: (raw: string) => string;
  expectedStepA: (
    kvar: number,
    bank: { ratedVoltageV: number; ratedFrequencyHz?: number; reactorPct?: number },
    voltageV: number,
    system: { frequencyHz: number; phases: number },
  ) => number;
};
const drafts = (await import(`${formDir}drafts.js`)) as { newKey: () => string };

const figure = fc.double({ min: 0.5, max: 5000, noNaN: true });
const pfArb = fc.double({ min: 0.3, max: 1, noNaN: true });
const sense = fc.constantFrom("lagging", "leading");
const reading: fc.Arbitrary<Measurement> = fc.oneof(
  fc.record({ method: fc.constant("kw_pf" as const), kW: figure, pf: pfArb, sense }),
  fc.record({ method: fc.constant("kw_kva" as const), kW: figure, kVA: figure, sense }),
  fc.record({ method: fc.constant("kw_kvar" as const), kW: figure, kvar: fc.double({ min: -5000, max: 5000, noNaN: true }) }),
  fc.record({ method: fc.constant("v_i_kw" as const), volts: fc.double({ min: 100, max: 1000, noNaN: true }), amps: figure, kW: figure, sense }),
  fc.record({ method: fc.constant("v_i_pf" as const), volts: fc.double({ min: 100, max: 1000, noNaN: true }), amps: figure, pf: pfArb, sense }),
  fc.record({
    method: fc.constant("kw_pf" as const),
    kW: figure,
    pf: pfArb,
    sense,
    pfType: fc.constant("true" as const),
    currentTHDPct: fc.double({ min: 0, max: 120, noNaN: true }),
  }),
);

describe("the page's power triangle against the service's engine", () => {
  it("gives the engine's kW and kvar for any reading, and refuses where the engine does", () => {
    fc.assert(
      fc.property(reading, fc.constantFrom(1 as const, 3 as const), (m, phases) => {
        const typed = Object.fromEntries(Object.entries(m).map(([k, v]) => [k, typeof v === "number" ? String(v) : v]));
        const page = checks.triangle(typed, phases);
        const engine = triangleOf(m, phases, ["m"]);
        if (engine.issues.length) {
          expect(page?.error, JSON.stringify(m)).toBeDefined();
          return;
        }
        const t = engine.triangle!;
        expect(page?.error).toBeUndefined();
        expectClose(page!.kW, t.kW, TOL.oracle, "kW");
        expectClose(page!.kvar, t.kvar, { abs: TOL.oracleReactive.rel * t.kVA }, "kvar");
      }),
      { numRuns: 500 },
    );
  });
});

describe("the page's expected step current against the service's engine", () => {
  it("gives the engine's healthy current for any nameplate, reactor and voltage read", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1, max: 500, noNaN: true }),
        fc.constantFrom(230, 400, 415, 480, 525, 690),
        fc.constantFrom(undefined, 50 as const, 60 as const),
        fc.constantFrom(undefined, 0, 5.67, 7, 14),
        fc.double({ min: 0.8, max: 1.15, noNaN: true }),
        fc.constantFrom(50 as const, 60 as const),
        fc.constantFrom(1 as const, 3 as const),
        (kvar, ratedVoltageV, ratedFrequencyHz, reactorPct, ratio, frequencyHz, phases) => {
          const bank = { ratedVoltageV, ratedFrequencyHz, reactorPct };
          const v = ratedVoltageV * ratio;
          const engine = expectedStep(kvar, bank, v, frequencyHz, phases).currentA;
          expectClose(checks.expectedStepA(kvar, bank, v, { frequencyHz, phases }), engine, TOL.oracle, "current");
        },
      ),
      { numRuns: 300 },
    );
  });
});

describe("what the page reads from typed text", () => {
  it("reads a bank's steps as the nameplates are read", () => {
    const fifty = { kvar: 50 };
    expect(checks.stepsOf("5 × 50")).toEqual([fifty, fifty, fifty, fifty, fifty]);
    expect(checks.stepsOf("5x50")).toEqual(checks.stepsOf("5 × 50"));
    expect(checks.stepsOf("50, 50, 25")).toEqual([fifty, fifty, { kvar: 25 }]);
    expect(checks.stepsOf("2x50 + 12,5")).toEqual([fifty, fifty, { kvar: 12.5 }]); // a decimal comma, as tablets type it
    expect(checks.stepsOf("50,50,25")).toMatch(/count × kvar/); // no space after the commas: asked again, not guessed
    expect(checks.stepsOf("2 × 50 kvar + 25 kvar")).toEqual([fifty, fifty, { kvar: 25 }]);
    expect(checks.stepsOf("")).toBeNull();
    expect(checks.stepsOf("five")).toMatch(/count × kvar/);
    expect(checks.steps("33 × 10")).toBe("a bank has at most 32 steps");
    expect(checks.steps("0")).toBe("kvar must be greater than 0");
  });

  it("reads a CT's label as its ratio", () => {
    expect(checks.ctRatioOf("1000/5")).toBe(200); // 1000 A primary, 5 A secondary
    expect(checks.ctRatioOf("200")).toBe(200);
    expect(checks.ctRatioOf("")).toBeNull();
    expect(checks.ctRatioOf("1000/0")).toBeNaN();
  });

  it("reads a harmonic spectrum as order:percent pairs and checks it as the service does", () => {
    expect(checks.spectrumOf("5:30, 7:12")).toEqual([
      { order: 5, pct: 30 },
      { order: 7, pct: 12 },
    ]);
    expect(checks.spectrumOf("5=30;7=12")).toEqual([
      { order: 5, pct: 30 },
      { order: 7, pct: 12 },
    ]);
    expect(checks.spectrumOf("fifth")).toMatch(/order:percent/);
    expect(checks.spectrum("5:30, 5:10")).toBe("each harmonic order may appear only once");
    expect(checks.spectrum("1:30")).toBe("order must be 2 to 50");
    expect(checks.spectrum("5:200, 7:150")).toMatch(/more than 300 %/);
  });

  it("hints at line-to-neutral volts and volts far from the system, and says nothing within 10 %", () => {
    const sys = { voltageV: 400, phases: 3 };
    expect(checks.voltsHint("231", sys)).toMatch(/line-to-neutral/); // 400/√3 = 230.9 V
    expect(checks.voltsHint("415", sys)).toBe(""); // 3.75 % above 400 V
    expect(checks.voltsHint("480", sys)).toMatch(/more than 10 % off/); // 20 % above
    expect(checks.voltsHint("231", { voltageV: 230, phases: 1 })).toBe(""); // single-phase: volts are line-to-neutral
    expect(checks.num("1,5")).toBe(1.5); // a decimal comma, as many tablets type it
  });

  it("makes version-4 UUIDs without crypto.randomUUID, all different", () => {
    const keys = new Set(Array.from({ length: 2000 }, () => drafts.newKey()));
    expect(keys.size).toBe(2000);
    for (const k of keys) expect(k).toMatch(/^[0-9a-f]{8}-[0-9a-f]{4}-4[0-9a-f]{3}-[89ab][0-9a-f]{3}-[0-9a-f]{12}$/);
  });
});
