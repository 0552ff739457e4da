import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  maxMultiple,
  simulateStepProgram,
  stepMultipliers,
  switchingOperations,
  type StepRatio,
} from "../../../src/core/bank/step-ranking.js";

describe("step programs", () => {
  it.each([
    // by definition of the programs (common controller practice, no source)
    { ratio: "1:1:1", n: 4, mults: [1, 1, 1, 1], k: 4 },
    { ratio: "1:2:2", n: 4, mults: [1, 2, 2, 2], k: 7 },
    { ratio: "1:2:4", n: 3, mults: [1, 2, 4], k: 7 },
    { ratio: "1:2:4", n: 5, mults: [1, 2, 4, 4, 4], k: 15 },
  ] as const)("$ratio with $n steps: $mults, reaching $k base multiples", ({ ratio, n, mults, k }) => {
    expect(stepMultipliers(ratio, n)).toEqual(mults);
    expect(maxMultiple(ratio, n)).toBe(k);
  });
});

/** Brute force over every subset of the steps (the oracle): sums reachable and the least toggles between two sums. */
function subsets(steps: number[]): { sum: number; mask: number }[] {
  const out: { sum: number; mask: number }[] = [];
  for (let m = 0; m < 1 << steps.length; m++) out.push({ sum: steps.reduce((s, x, i) => s + (m & (1 << i) ? x : 0), 0), mask: m });
  return out;
}
const popcount = (x: number) => x.toString(2).split("").filter((c) => c === "1").length;

/** The controller rule, by enumeration: least sum reaching the target without leading, else the most that does not lead. */
function oracle(steps: number[], toTarget: number[], toUnity: number[]) {
  const subs = subsets(steps);
  const sums = [...new Set(subs.map((s) => s.sum))].sort((a, b) => a - b);
  let met = 0;
  let ops = 0;
  let prev = 0;
  toTarget.forEach((need, i) => {
    const room = toUnity[i] as number;
    let c = 0;
    if (need > 1e-6) {
      const reach = sums.find((s) => s >= need - 1e-6 && s <= room + 1e-6);
      c = reach ?? Math.max(0, ...sums.filter((s) => s <= room + 1e-6));
    }
    if (need - c <= 1e-6 && c <= room + 1e-6) met++;
    if (i > 0) {
      const from = subs.filter((s) => Math.abs(s.sum - prev) < 1e-9);
      const to = subs.filter((s) => Math.abs(s.sum - c) < 1e-9);
      ops += Math.min(...from.flatMap((f) => to.map((t) => popcount(f.mask ^ t.mask))));
    }
    prev = c;
  });
  return { met, ops };
}

const LITERAL_STEPS: Record<StepRatio, (n: number) => number[]> = {
  // written out here, independently of stepMultipliers
  "1:1:1": (n) => Array(n).fill(1),
  "1:2:2": (n) => [1, ...Array(n - 1).fill(2)],
  "1:2:4": (n) => [1, 2, ...Array(n - 2).fill(4)],
};

describe("controller simulation against the brute-force oracle", () => {
  it("matches met count and switching operations for random samples and programs", () => {
    fc.assert(
      fc.property(
        fc.constantFrom<StepRatio>("1:1:1", "1:2:2", "1:2:4"),
        fc.integer({ min: 3, max: 6 }),
        fc.constantFrom(5, 12.5, 25),
        fc.array(fc.tuple(fc.double({ min: 0, max: 300, noNaN: true }), fc.double({ min: -20, max: 400, noNaN: true })), { minLength: 1, maxLength: 30 }),
        (ratio, n, base, raw) => {
          // a sample: kvar to unity Q' and kW P, target window 0.3287·P (tan acos 0.95)
          const toUnity = raw.map(([, q]) => q);
          const toTarget = raw.map(([p, q]) => q - 0.3286841051788632 * p);
          const s = { toTargetKvar: Float64Array.from(toTarget), toUnityKvar: Float64Array.from(toUnity), covered: new Uint8Array(raw.length).fill(1) };
          const r = simulateStepProgram(ratio, n, base, s);
          const o = oracle(LITERAL_STEPS[ratio](n).map((m) => m * base), toTarget, toUnity);
          return r.metCount === o.met && r.metCoveredCount === o.met && r.switchingOperations === o.ops;
        },
      ),
      { numRuns: 300, seed: 7 },
    );
  });

  it("never switches in more than the room to unity (never leads)", () => {
    fc.assert(
      fc.property(fc.array(fc.tuple(fc.double({ min: 0, max: 500, noNaN: true }), fc.double({ min: -50, max: 500, noNaN: true })), { minLength: 1, maxLength: 50 }), (raw) => {
        const s = { toTargetKvar: Float64Array.from(raw, ([p, q]) => q - 0.2 * p), toUnityKvar: Float64Array.from(raw, ([, q]) => q), covered: new Uint8Array(raw.length) };
        const trace = new Int32Array(raw.length);
        simulateStepProgram("1:2:2", 5, 10, s, trace);
        return raw.every(([, q], i) => (trace[i] as number) * 10 <= Math.max(0, q) + 1e-6);
      }),
      { numRuns: 200, seed: 11 },
    );
  });

  it("a hand-worked sequence: 3 × 40 kvar equal steps", () => {
    // hand calculation: needs 30, 90, 90, 10, −5 kvar with ample room → 1, 3, 3, 1, 0 steps, all met;
    // sample 6 needs 50 with room 60: 2 steps (80) would lead, 1 step (40) falls short → not met (and outside coverage);
    // toggles 2 + 0 + 2 + 1 + 1 = 6
    const s = {
      toTargetKvar: Float64Array.from([30, 90, 90, 10, -5, 50]),
      toUnityKvar: Float64Array.from([100, 200, 200, 100, 50, 60]),
      covered: Uint8Array.from([1, 1, 1, 1, 1, 0]),
    };
    const trace = new Int32Array(6);
    const r = simulateStepProgram("1:1:1", 3, 40, s, trace);
    expect([...trace]).toEqual([1, 3, 3, 1, 0, 1]);
    expect(r).toEqual({ samples: 6, metCount: 5, coveredCount: 5, metCoveredCount: 5, switchingOperations: 6 });
  });

  it.each([
    // hand calculation from the unique combinations: 1:2:2 k=3 is {1,2}, k=4 is {2,2}: toggles 1 + 1 = 2
    { ratio: "1:2:2", a: 3, b: 4, ops: 2 },
    // 1:2:4 k=3 is {1,2}, k=4 is {4}: three toggles
    { ratio: "1:2:4", a: 3, b: 4, ops: 3 },
    // 1:2:4 k=7 is {1,2,4}, k=9 is {1,4,4}: 2-step off, a second 4-step on
    { ratio: "1:2:4", a: 7, b: 9, ops: 2 },
    { ratio: "1:1:1", a: 5, b: 2, ops: 3 },
  ] as const)("$ratio from $a to $b base multiples: $ops operations", ({ ratio, a, b, ops }) => {
    expect(switchingOperations(ratio, a, b)).toBe(ops);
  });
});
