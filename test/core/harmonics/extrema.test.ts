import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { impedanceExtrema } from "../../../src/core/harmonics/extrema.js";
import { buildBusModel, capacitorBranch, drivingPointImpedanceOhm, type BusModel } from "../../../src/core/harmonics/harmonics-api.js";
import { fillImpedanceOhm } from "../../../src/core/harmonics/network.js";
import { expectClose, TOL } from "../../helpers/tolerance.js";

/**
 * The analytic peaks and dips (bracketed between tuning orders, refined on the exact |Z(h)|) against a dense fine
 * scan of the same |Z(h)|: an independent search that knows nothing of the brackets.
 *
 * Tolerance: the dense grid has step STEP = 0.0005 in h; a grid extremum only says the true one lies within one
 * step of it, so orders agree within STEP; the analytic |Z| is the exact extremum, so it is at least the best grid
 * sample (within 1e-9 relative: rounding), and a peak's |Z| exceeds it by little (within 5 %, a sharp peak between
 * two samples).
 */
const STEP = 0.0005;
const FROM = 1;
const TO = 50;

function dense(model: BusModel): { peaks: { order: number; z: number }[]; dips: { order: number; z: number }[]; h: Float64Array; z: Float64Array } {
  const n = Math.floor((TO - FROM) / STEP + 1e-9) + 1;
  const h = new Float64Array(n);
  const z = new Float64Array(n);
  fillImpedanceOhm(model, FROM, STEP, h, z);
  const peaks: { order: number; z: number }[] = [];
  const dips: { order: number; z: number }[] = [];
  for (let i = 1; i < n - 1; i++) {
    if (z[i]! > z[i - 1]! && z[i]! >= z[i + 1]!) peaks.push({ order: h[i]!, z: z[i]! });
    else if (z[i]! < z[i - 1]! && z[i]! <= z[i + 1]!) dips.push({ order: h[i]!, z: z[i]! });
  }
  return { peaks, dips, h, z };
}

const branchArb = fc.record({
  kvar: fc.double({ min: 5, max: 3000, noNaN: true }),
  reactorPct: fc.oneof(fc.constant(0), fc.double({ min: 0.5, max: 14, noNaN: true }), fc.constantFrom(5.67, 7, 14)),
  quality: fc.constantFrom(20, 50, 100),
});
const modelArb = fc
  .record({
    shortCircuitKVA: fc.double({ min: 2000, max: 200_000, noNaN: true }),
    xOverR: fc.double({ min: 1, max: 100, noNaN: true }),
    linearLoadKW: fc.oneof(fc.constant(0), fc.double({ min: 10, max: 2000, noNaN: true })),
    branches: fc.array(branchArb, { minLength: 1, maxLength: 3 }),
  })
  .map((m) =>
    buildBusModel(
      { voltageV: 480, frequencyHz: 60, shortCircuitKVA: m.shortCircuitKVA, xOverR: m.xOverR, linearLoadKW: m.linearLoadKW },
      m.branches.map((b) => capacitorBranch(480, b.kvar, b.reactorPct, b.quality)),
    ),
  );

/** Features closer than a few grid steps are beyond the dense scan's resolution: the comparison skips such models. */
function resolvable(orders: number[]): boolean {
  const s = [...orders].sort((a, b) => a - b);
  for (let i = 0; i < s.length; i++) {
    if (s[i]! - FROM < 4 * STEP || TO - s[i]! < 4 * STEP) return false;
    if (i > 0 && s[i]! - s[i - 1]! < 8 * STEP) return false;
  }
  return true;
}

describe("analytic peaks and dips of |Z(h)|", () => {
  it("agree with a dense fine scan: same count, orders within one grid step, |Z| at least the best sample", () => {
    let compared = 0;
    fc.assert(
      fc.property(modelArb, (model) => {
        const a = impedanceExtrema(model, FROM, TO);
        const d = dense(model);
        const orders = (x: { peaks: { order: number }[]; dips: { order: number }[] }) => [...x.peaks, ...x.dips].map((p) => p.order);
        if (!resolvable(orders(a)) || !resolvable(orders(d))) return;
        compared++;
        expect(a.peaks.map((p) => p.order).length, "peak count").toBe(d.peaks.length);
        expect(a.dips.length, "dip count").toBe(d.dips.length);
        a.peaks.forEach((p, i) => {
          const g = d.peaks[i]!;
          expectClose(p.order, g.order, { abs: STEP }, `peak ${i} order`);
          expect(p.impedanceOhm).toBeGreaterThanOrEqual(g.z * (1 - 1e-9));
          expect(p.impedanceOhm).toBeLessThanOrEqual(g.z * 1.05);
          expectClose(p.impedanceOhm, drivingPointImpedanceOhm(model, p.order), TOL.ohm, `peak ${i} |Z|`);
        });
        a.dips.forEach((p, i) => {
          const g = d.dips[i]!;
          expectClose(p.order, g.order, { abs: STEP }, `dip ${i} order`);
          expect(p.impedanceOhm).toBeLessThanOrEqual(g.z * (1 + 1e-9));
        });
      }),
      { numRuns: 60, seed: 0xe7e3 },
    );
    // not vacuous: most random buses have resolvable features
    expect(compared).toBeGreaterThan(40);
  });

  it("finds a detuned stage's close peak–dip pair that a 0.1 grid cannot separate", () => {
    // 7 % reactor: tuning order 1/√0.07 = 3.780; a small step on a strong source puts the parallel peak just below it
    // (lossless h = 1/√(Q_C/S_sc + p) = 1/√(10/100 000 + 0.07) = 3.7769), 0.003 away: closer than 0.1
    const model = buildBusModel({ voltageV: 480, frequencyHz: 60, shortCircuitKVA: 100_000, xOverR: 10 }, [capacitorBranch(480, 10, 7)]);
    const a = impedanceExtrema(model, 1, 50);
    expect(a.peaks).toHaveLength(1);
    expect(a.dips).toHaveLength(1);
    // the lossless closed form h = 1/√(Q_C/S_sc + p) = 3.7769; the reactor's and source's resistance move it a little
    expectClose(a.peaks[0]!.order, 1 / Math.sqrt(10 / 100_000 + 0.07), { abs: 0.02 }, "peak order near the lossless closed form");
    expectClose(a.dips[0]!.order, 1 / Math.sqrt(0.07), { abs: 0.02 }, "dip order near the tuning order 1/√p");
    // and where a local scan at 1e-5 puts them (an independent search, to within its step)
    const local = (lo: number, hi: number, sign: 1 | -1) => {
      let best = lo;
      for (let h = lo; h <= hi; h += 1e-5) if (sign * drivingPointImpedanceOhm(model, h) > sign * drivingPointImpedanceOhm(model, best)) best = h;
      return best;
    };
    expectClose(a.peaks[0]!.order, local(3.7, a.dips[0]!.order, 1), { abs: 2e-5 }, "peak order against a 1e-5 local scan");
    expectClose(a.dips[0]!.order, local(a.peaks[0]!.order, 3.9, -1), { abs: 2e-5 }, "dip order against a 1e-5 local scan");
    expect(a.dips[0]!.order - a.peaks[0]!.order).toBeLessThan(0.1);
  });

  it("a bus without capacitors has neither", () => {
    const model = buildBusModel({ voltageV: 480, frequencyHz: 60, shortCircuitKVA: 20_000, xOverR: 8, linearLoadKW: 300 });
    expect(impedanceExtrema(model, 1, 50)).toEqual({ peaks: [], dips: [] });
  });
});
