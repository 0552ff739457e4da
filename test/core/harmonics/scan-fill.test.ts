import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { buildBusModel, capacitorBranch, scanImpedance, type BusModel, type CapacitorBranch } from "../../../src/core/harmonics/harmonics-api.js";
import { fillImpedanceOhm } from "../../../src/core/harmonics/network.js";
import { fillPlannedImpedanceOhm, planScan } from "../../../src/core/harmonics/scan-fill.js";

/**
 * The one-division scan loop against the reciprocal-per-term loop (network.ts, itself checked against complex.js in
 * oracle.test.ts), over parameters far wider than the schemas allow. Tolerance: relative 1e-9 of |Z|, as the oracle
 * test; both loops round each term to a few ulp, and near a sharp parallel resonance both lose the same digits to the
 * susceptance's cancellation (Q ≤ ~5000 here), so they agree far closer than that.
 */
const REL = 1e-9;

const logUniform = (min: number, max: number) => fc.double({ min: Math.log(min), max: Math.log(max), noNaN: true }).map(Math.exp);

const modelArb = fc.record({
  voltageV: logUniform(100, 1e5),
  shortCircuitKVA: logUniform(1, 1e8),
  xOverR: logUniform(0.5, 1000),
  linearLoadKW: fc.oneof(fc.constant(0), logUniform(0.1, 1e6)),
  stages: fc.array(
    fc.record({
      kvar: logUniform(0.01, 1e6),
      reactorPct: fc.oneof(fc.constant(0), fc.double({ min: 0.1, max: 20, noNaN: true })),
      quality: logUniform(5, 1000),
    }),
    {
      maxLength: 6,
    },
  ),
  fromOrder: logUniform(0.1, 10),
  spanOrders: logUniform(0.05, 200),
});

function reference(model: BusModel, from: number, step: number, n: number): { h: Float64Array; z: Float64Array } {
  const h = new Float64Array(n);
  const z = new Float64Array(n);
  fillImpedanceOhm(model, from, step, h, z);
  return { h, z };
}

describe("one-division scan loop", () => {
  it("equals the reciprocal-per-term loop wherever its range bound is accepted (relative 1e-9)", () => {
    let planned = 0;
    fc.assert(
      fc.property(modelArb, (p) => {
        const model = buildBusModel(
          { voltageV: p.voltageV, frequencyHz: 60, shortCircuitKVA: p.shortCircuitKVA, xOverR: p.xOverR, linearLoadKW: p.linearLoadKW },
          p.stages.map((s) => capacitorBranch(p.voltageV, s.kvar, s.reactorPct, s.quality)),
        );
        const n = 301;
        const step = p.spanOrders / (n - 1);
        const plan = planScan(model, p.fromOrder, p.fromOrder + (n - 1) * step);
        if (!plan) return;
        planned++;
        const want = reference(model, p.fromOrder, step, n);
        const h = new Float64Array(n);
        const z = new Float64Array(n);
        fillPlannedImpedanceOhm(plan, p.fromOrder, step, h, z);
        expect(h).toEqual(want.h);
        let worst = 0;
        for (let i = 0; i < n; i++) worst = Math.max(worst, Math.abs(z[i]! - want.z[i]!) / want.z[i]!);
        expect(z.every((x) => Number.isFinite(x) && x > 0)).toBe(true);
        expect(worst).toBeLessThan(REL);
      }),
      { numRuns: 400 },
    );
    // up to 6 branches over these ranges the bound holds (S stays far below 400): the check above is not vacuous
    expect(planned).toBe(400);
  });

  it("accepts the service's scans: one stage of a bank on a 480 V bus, and the bus alone", () => {
    const network = { voltageV: 480, frequencyHz: 60, shortCircuitKVA: 26_087, transformerKVA: 1500, linearLoadKW: 600 };
    expect(planScan(buildBusModel(network, [capacitorBranch(480, 300, 7)]), 1, 50)).not.toBeNull();
    expect(planScan(buildBusModel(network), 1, 50)).not.toBeNull();
  });
});

describe("models the range bound does not cover fall back to the reciprocal-per-term loop", () => {
  const network = { voltageV: 480, frequencyHz: 60, shortCircuitKVA: 20_000, xOverR: 10 };
  const scan = { fromOrder: 1, toOrder: 50, stepOrder: 0.01 };

  function expectReferenceScan(model: BusModel) {
    const got = scanImpedance(model, scan);
    const want = reference(model, scan.fromOrder, scan.stepOrder, got.grid.points);
    expect(got.impedanceOhm).toEqual(want.z);
  }

  it("a lossless detuned branch tuned inside the range (it can short the bus)", () => {
    // X_L = X_C/25: tuned at h = 5 exactly, a grid point; with r = 0 the bus is shorted there
    const lossless: CapacitorBranch = { capacitorReactanceOhm: 2.5, reactorReactanceOhm: 0.1, reactorResistanceOhm: 0, reactorPct: 4 };
    const model = buildBusModel(network, [lossless]);
    expect(planScan(model, 1, 50)).toBeNull();
    expectReferenceScan(model);
    expect(scanImpedance(model, scan).impedanceOhm[400]).toBe(0); // h = 1 + 400·0.01 = 5
  });

  it("a lossless source (no resistance: the conductance could vanish)", () => {
    const model = buildBusModel({ ...network, xOverR: Number.POSITIVE_INFINITY }, [capacitorBranch(480, 200, 7)]);
    expect(model.source.resistanceOhm).toBe(0);
    expect(planScan(model, 1, 50)).toBeNull();
    expectReferenceScan(model);
  });

  it("a branch of infinite reactance (a vanishing step)", () => {
    const model = buildBusModel(network, [
      capacitorBranch(480, 200, 7),
      { capacitorReactanceOhm: Number.POSITIVE_INFINITY, reactorReactanceOhm: 0, reactorResistanceOhm: 0, reactorPct: 0 },
    ]);
    expect(planScan(model, 1, 50)).toBeNull();
  });

  it("very many branches (the product of their ranges exceeds the bound)", () => {
    // hand calculation: a 7 % branch with Q = 50, tuned inside 1..50, has D_min = r² and D_max ≈ (2500·X_L − X_C)²,
    // ρ = √(D_max/D_min) ≈ 1.2·10⁵ (~17 bits); 60 of them ≈ 1000 bits > 400
    const model = buildBusModel(
      network,
      Array.from({ length: 60 }, (_, i) => capacitorBranch(480, 10 + i, 7)),
    );
    expect(planScan(model, 1, 50)).toBeNull();
    expectReferenceScan(model);
  });
});
