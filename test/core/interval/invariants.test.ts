import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { analyseIntervals } from "../../../src/core/interval/analyse.js";
import { simulateController } from "../../../src/core/interval/simulate.js";
import { summarise } from "../../../src/core/interval/summary.js";
import { seriesOf } from "./fixtures.js";

const power = fc.double({ min: 0, max: 5000, noNaN: true });
const reactive = fc.double({ min: -2000, max: 5000, noNaN: true });

/** Every number in a JSON value, depth-first. */
function numbers(v: unknown, out: number[] = []): number[] {
  if (typeof v === "number") out.push(v);
  else if (Array.isArray(v)) v.forEach((x) => numbers(x, out));
  else if (v && typeof v === "object") Object.values(v).forEach((x) => numbers(x, out));
  return out;
}

describe("invariants on random series and banks (property tests)", () => {
  it("all figures finite; the controller never adds a lead beyond the limit that the fixed part alone does not cause", () => {
    fc.assert(
      fc.property(
        fc.array(fc.tuple(power, reactive), { minLength: 2, maxLength: 300 }),
        fc.double({ min: 0, max: 300, noNaN: true }),
        fc.array(fc.double({ min: 1, max: 400, noNaN: true }), { maxLength: 6 }),
        fc.double({ min: 0.8, max: 1, noNaN: true }),
        (rows, fixedKvar, stepsKvar, targetPF) => {
          const t = rows.map((_, i) => Date.UTC(2026, 0, 1) + i * 900_000);
          const s = seriesOf(
            t,
            rows.map((r) => r[0]),
            rows.map((r) => r[1]),
            15,
            "America/Chicago",
          );
          const a = analyseIntervals(s, targetPF);
          const sim = simulateController(s, { fixedKvar, stepsKvar }, targetPF);
          for (const x of numbers({ a, sim, summary: summarise(a) })) expect(Number.isFinite(x)).toBe(true);
          // the fixed kvar alone leads beyond the limit in these intervals; switched steps must add none
          const tanLead = Math.sqrt(1 - 0.98 ** 2) / 0.98;
          const fixedBeyond = rows.filter(([p, q]) => q - fixedKvar < -p * tanLead - 1e-9).length;
          expect(sim.intervalsLeading.afterBeyondLimit).toBeLessThanOrEqual(fixedBeyond);
          expect(sim.intervalsBelowTarget.after).toBeLessThanOrEqual(rows.length);
          for (const st of sim.switching.perStep) expect(st.operations).toBeLessThanOrEqual(rows.length);
          // needed kvar is monotone in the percentile and never negative
          const needed = Object.values(a.neededKvar.percentiles);
          for (let i = 1; i < needed.length; i++) expect(needed[i]!).toBeGreaterThanOrEqual(needed[i - 1]!);
          expect(needed[0]!).toBeGreaterThanOrEqual(0);
        },
      ),
      { numRuns: 200 },
    );
  });
});
