import { Complex } from "complex.js";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  buildBusModel,
  capacitorBranch,
  drivingPointImpedance,
  drivingPointImpedanceOhm,
  scanImpedance,
} from "../../../src/core/harmonics/harmonics-api.js";

/** Independent oracle: same circuit written from the raw parameters with complex.js admittances. */
function oracle(p: {
  voltageV: number;
  shortCircuitKVA: number;
  xOverR: number;
  linearLoadKW: number;
  stages: { kvar: number; reactorPct: number }[];
  quality: number;
  h: number;
}): Complex {
  const zb = p.voltageV ** 2 / (p.shortCircuitKVA * 1000);
  const xs = (zb * p.xOverR) / Math.sqrt(1 + p.xOverR ** 2); // cos/sin of the impedance angle, by Pythagoras
  const rs = xs / p.xOverR;
  let y = new Complex(1, 0).div(new Complex(rs, p.h * xs));
  if (p.linearLoadKW > 0) y = y.add(new Complex((p.linearLoadKW * 1000) / p.voltageV ** 2, 0));
  for (const s of p.stages) {
    const xc = p.voltageV ** 2 / (s.kvar * 1000);
    const xl = (s.reactorPct / 100) * xc;
    y = y.add(new Complex(1, 0).div(new Complex(xl / p.quality, p.h * xl - xc / p.h)));
  }
  return new Complex(1, 0).div(y);
}

const params = fc.record({
  voltageV: fc.double({ min: 200, max: 35_000, noNaN: true }),
  shortCircuitKVA: fc.double({ min: 500, max: 2e6, noNaN: true }),
  xOverR: fc.double({ min: 0.5, max: 60, noNaN: true }),
  linearLoadKW: fc.oneof(fc.constant(0), fc.double({ min: 1, max: 20_000, noNaN: true })),
  stages: fc.array(fc.record({ kvar: fc.double({ min: 5, max: 20_000, noNaN: true }), reactorPct: fc.double({ min: 0, max: 20, noNaN: true }) }), {
    minLength: 0,
    maxLength: 3,
  }),
  quality: fc.double({ min: 5, max: 300, noNaN: true }),
  h: fc.double({ min: 1, max: 50, noNaN: true }),
});

describe("driving-point impedance against complex.js", () => {
  it("matches the independent oracle at random orders and parameters (relative 1e-9 of |Z|)", () => {
    fc.assert(
      fc.property(params, (p) => {
        const model = buildBusModel(
          { voltageV: p.voltageV, frequencyHz: 60, shortCircuitKVA: p.shortCircuitKVA, xOverR: p.xOverR, linearLoadKW: p.linearLoadKW },
          p.stages.map((s) => capacitorBranch(p.voltageV, s.kvar, s.reactorPct, p.quality)),
        );
        const want = oracle(p);
        const mag = want.abs();
        const z = drivingPointImpedance(model, p.h);
        // tolerance relative to |Z|: a component near zero cannot be held to its own relative error
        expect(Math.abs(z.re - want.re) / mag).toBeLessThan(1e-9);
        expect(Math.abs(z.im - want.im) / mag).toBeLessThan(1e-9);
        expect(Math.abs(drivingPointImpedanceOhm(model, p.h) - mag) / mag).toBeLessThan(1e-9);
        // the scan's own hoisted loop, first grid point at h
        const scan = scanImpedance(model, { fromOrder: p.h, toOrder: p.h + 0.02, stepOrder: 0.01 });
        expect(Math.abs(scan.impedanceOhm[0]! - mag) / mag).toBeLessThan(1e-9);
      }),
      { numRuns: 500 },
    );
  });
});
