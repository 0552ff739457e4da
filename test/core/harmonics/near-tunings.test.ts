import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { parallelResonanceOrders } from "../../../src/core/harmonics/combined-stages.js";
import { buildBusModel, capacitorBranch, parallelResonanceOrder, scanImpedance } from "../../../src/core/harmonics/harmonics-api.js";
import { expectClose } from "../../helpers/tolerance.js";

/**
 * Detuned branches whose tuning orders 1/√p (nearly) coincide: equal reactor percentages on capacitors of different
 * kvar (their p = X_L/X_C differ by a rounding), or percentages 1e-11 or 1e-6 apart. Damping makes one dip of them;
 * the peaks and dips the scan reports (located without a grid) must be those of its own dense series.
 *
 * Oracle: the scan's |Z(h)| series at STEP = 0.0005 (the series the scan endpoint returns, at a fine step), its local
 * minima and maxima counted point by point. Orders agree within one step (a grid extremum only places the true one
 * within a step).
 */
const STEP = 0.0005;

function gridExtrema(z: Float64Array, h: Float64Array): { peaks: number[]; dips: number[] } {
  const peaks: number[] = [];
  const dips: number[] = [];
  for (let i = 1; i + 1 < z.length; i++) {
    if (z[i]! > z[i - 1]! && z[i]! >= z[i + 1]!) peaks.push(h[i]!);
    else if (z[i]! < z[i - 1]! && z[i]! <= z[i + 1]!) dips.push(h[i]!);
  }
  return { peaks, dips };
}

/** An invented 480 V, 60 Hz bus on a 10 MVA source, X/R 8, with detuned branches (kvar, reactor %, reactor X/R). */
function bus(branches: [kvar: number, reactorPct: number, quality?: number][], linearLoadKW = 0) {
  return buildBusModel(
    { voltageV: 480, frequencyHz: 60, shortCircuitKVA: 10_000, xOverR: 8, linearLoadKW },
    branches.map(([kvar, pct, q]) => capacitorBranch(480, kvar, pct, q ?? 50)),
  );
}

const cases: { name: string; branches: [number, number, number?][]; loadKW?: number; dips: number }[] = [
  {
    name: "14 % and 13.99999999999 %",
    branches: [
      [100, 14],
      [150, 13.99999999999],
    ],
    dips: 1,
  },
  {
    name: "14 % and 14.00000000001 %",
    branches: [
      [100, 14],
      [150, 14.00000000001],
    ],
    dips: 1,
  },
  {
    name: "7 % and 7 % on 50 and 150 kvar (p a rounding apart)",
    branches: [
      [50, 7, 100],
      [150, 7, 100],
    ],
    dips: 1,
  },
  {
    name: "7 % and 7.000001 %",
    branches: [
      [50, 7, 100],
      [150, 7.000001, 100],
    ],
    loadKW: 1000,
    dips: 1,
  },
  {
    name: "14 % and a plain branch (0 %)",
    branches: [
      [100, 14],
      [150, 0],
    ],
    dips: 1,
  },
  {
    name: "14 %, 14.00000000001 % and 7 %",
    branches: [
      [100, 14],
      [150, 14.00000000001],
      [80, 7],
    ],
    dips: 2,
  },
];

describe("peaks and dips of branches tuned (nearly) alike", () => {
  it.each(cases)("$name: as many as the dense series shows, at its orders", ({ branches, loadKW, dips }) => {
    const scan = scanImpedance(bus(branches, loadKW), { fromOrder: 1, toOrder: 50, stepOrder: STEP });
    const grid = gridExtrema(scan.impedanceOhm, scan.ordersH);
    expect(grid.dips, "the dense series' dips").toHaveLength(dips);
    expect(scan.dips.map((d) => d.order)).toHaveLength(grid.dips.length);
    expect(scan.peaks.map((p) => p.order)).toHaveLength(grid.peaks.length);
    scan.dips.forEach((d, i) => expectClose(d.order, grid.dips[i]!, { abs: STEP }, `dip ${i} order`));
    scan.peaks.forEach((p, i) => expectClose(p.order, grid.peaks[i]!, { abs: STEP }, `peak ${i} order`));
  });

  it("random buses with two branches a rounding to 1e-6 apart: one dip, as in the dense series", () => {
    const arb = fc.record({
      kvar: fc.tuple(fc.double({ min: 5, max: 1000, noNaN: true }), fc.double({ min: 5, max: 1000, noNaN: true })),
      reactorPct: fc.oneof(fc.constantFrom(5.67, 7, 14), fc.double({ min: 1, max: 14, noNaN: true })),
      apart: fc.constantFrom(0, 1e-13, -1e-13, 1e-11, -1e-11, 1e-9, 1e-6, -1e-6),
      quality: fc.constantFrom(20, 50, 100),
      loadKW: fc.constantFrom(0, 100, 1000),
    });
    fc.assert(
      fc.property(arb, ({ kvar, reactorPct, apart, quality, loadKW }) => {
        const model = bus(
          [
            [kvar[0], reactorPct, quality],
            [kvar[1], reactorPct * (1 + apart), quality],
          ],
          loadKW,
        );
        const scan = scanImpedance(model, { fromOrder: 1, toOrder: 50, stepOrder: STEP });
        const grid = gridExtrema(scan.impedanceOhm, scan.ordersH);
        expect(scan.dips).toHaveLength(grid.dips.length);
        expect(scan.dips).toHaveLength(1);
        expect(scan.peaks).toHaveLength(grid.peaks.length);
      }),
      { numRuns: 40, seed: 0x1606 },
    );
  });

  it("two reactor values a rounding apart resonate as one branch of their summed kvar (lossless closed form)", () => {
    // 100 + 150 kvar at p = 0.14 on 10 MVA: h = √(S_sc/(Q + p·S_sc)) = √(10 000/(250 + 1400)) = 2.4618 (resonance.ts)
    const orders = parallelResonanceOrders(
      [
        { capacitorKvar: 100, reactorFraction: 0.14 },
        { capacitorKvar: 150, reactorFraction: 0.14 * (1 + 1e-13) },
      ],
      10_000,
    );
    expect(orders).toHaveLength(1);
    expectClose(orders[0]!, parallelResonanceOrder(250, 10_000, 0.14), { rel: 1e-9 }, "the one resonance");
    expectClose(orders[0]!, 2.4618, { abs: 1e-4 }, "by hand");
  });
});
