import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { maxMultiple, simulateStepProgram, stepMultipliers, switchingOperations, type StepRatio } from "../../../src/core/bank/step-ranking.js";
import type { RuleSettings } from "../../../src/core/bank/controller-rule.js";

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
const popcount = (x: number) =>
  x
    .toString(2)
    .split("")
    .filter((c) => c === "1").length;

// tan(acos 0.95) = 0.31225/0.95 = 0.328684; tan(acos 0.98) = 0.198997/0.98 = 0.203058 (hand calculation)
const TAN_TARGET = 0.3286841051788632;
const TAN_LEAD = 0.20305866409979;
const ruleFor = (base: number): RuleSettings => ({ tanTarget: TAN_TARGET, tanLead: TAN_LEAD, thresholdKvar: 0.65 * base, leadingLimitPF: 0.98 });

/** The rule's own kvar tolerance (RULE_EPS_KVAR). */
const TOL = 1e-9;

/**
 * The controller rule written out by enumeration (CONTROLLER_RULE in words): hold while the kvar left lies from
 * −threshold to target + threshold and the steps in do not lead beyond the limit; otherwise the least sum reaching the
 * target within the leading limit, else the most sum within it.
 */
function oracle(steps: number[], samples: [number, number][], threshold: number) {
  const subs = subsets(steps);
  const sums = [...new Set(subs.map((s) => s.sum))].sort((a, b) => a - b);
  let met = 0;
  let ops = 0;
  let prev = 0;
  samples.forEach(([p, q], i) => {
    const target = p * TAN_TARGET;
    const ceiling = q + p * TAN_LEAD;
    const leftNow = q - prev;
    let c = prev;
    const hold = prev <= ceiling + TOL && leftNow <= target + threshold + TOL && leftNow >= -threshold - TOL;
    if (!hold) {
      const reach = sums.find((s) => q - s <= target + TOL && s <= ceiling + TOL);
      c = reach ?? Math.max(0, ...sums.filter((s) => s <= ceiling + TOL));
    }
    if (q - c <= target + TOL && q - c >= -p * TAN_LEAD - TOL) met++;
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

const samplesOf = (raw: [number, number][], covered?: number[]) => ({
  kW: Float64Array.from(raw, ([p]) => p),
  residualKvar: Float64Array.from(raw, ([, q]) => q),
  covered: covered ? Uint8Array.from(covered) : new Uint8Array(raw.length).fill(1),
});

describe("controller simulation against the brute-force oracle", () => {
  it("matches met count and switching operations for random samples and programs", () => {
    fc.assert(
      fc.property(
        fc.constantFrom<StepRatio>("1:1:1", "1:2:2", "1:2:4"),
        fc.integer({ min: 3, max: 6 }),
        fc.constantFrom(5, 12.5, 25),
        fc.array(fc.tuple(fc.double({ min: 0, max: 300, noNaN: true }), fc.double({ min: -20, max: 400, noNaN: true })), {
          minLength: 1,
          maxLength: 30,
        }),
        (ratio, n, base, raw) => {
          const r = simulateStepProgram(ratio, n, base, samplesOf(raw), ruleFor(base));
          const o = oracle(
            LITERAL_STEPS[ratio](n).map((m) => m * base),
            raw,
            0.65 * base,
          );
          return r.metCount === o.met && r.metCoveredCount === o.met && r.switchingOperations === o.ops;
        },
      ),
      { numRuns: 300, seed: 7 },
    );
  });

  it("never switches in beyond the leading limit: k·b ≤ Q' + P·tan(acos 0.98)", () => {
    fc.assert(
      fc.property(
        fc.array(fc.tuple(fc.double({ min: 0, max: 500, noNaN: true }), fc.double({ min: -50, max: 500, noNaN: true })), {
          minLength: 1,
          maxLength: 50,
        }),
        (raw) => {
          const trace = new Int32Array(raw.length);
          simulateStepProgram("1:2:2", 5, 10, samplesOf(raw), ruleFor(10), trace);
          return raw.every(([p, q], i) => (trace[i] as number) * 10 <= Math.max(0, q + p * TAN_LEAD) + 1e-6);
        },
      ),
      { numRuns: 200, seed: 11 },
    );
  });

  it("a hand-worked sequence: 3 × 40 kvar equal steps, dead band and leading limit", () => {
    // hand calculation, target 0.95 (P·tan = 32.87 kvar at 100 kW), limit 0.98 (20.31 kvar at 100 kW), threshold 26 kvar:
    // 1 (100 kW, 62.87): left 62.87 > 32.87 + 26 → least k·40 ≥ 30.0 → 1 step, left 22.87: met
    // 2 (100, 150): left 110 → need 117.13 → 3 steps, left 30: met (2 toggles)
    // 3 (100, 140): left 20 within −26…58.87 → hold 3: met
    // 4 (100, 80): left −40 < −26 → need 47.13 → 2 steps, left 0: met (1 toggle)
    // 5 (100, 115): left 35 within the band → hold 2, but 35 > 32.87: not met
    // 6 (100, 10): left −70 → need < 0 → 0 steps, left 10: met (2 toggles)
    // 7 (100, 55): left 55 ≤ 58.87 → hold 0: not met
    // 8 (20, 60): band top 6.57 + 26 → need 53.43 wants 80, ceiling 60 + 4.06 = 64.06 → 40: not met (1 toggle), not covered
    const raw: [number, number][] = [
      [100, 62.87],
      [100, 150],
      [100, 140],
      [100, 80],
      [100, 115],
      [100, 10],
      [100, 55],
      [20, 60],
    ];
    const trace = new Int32Array(raw.length);
    const r = simulateStepProgram("1:1:1", 3, 40, samplesOf(raw, [1, 1, 1, 1, 1, 1, 1, 0]), ruleFor(40), trace);
    expect([...trace]).toEqual([1, 3, 3, 2, 2, 0, 0, 1]);
    expect(r).toEqual({ samples: 8, metCount: 5, coveredCount: 7, metCoveredCount: 5, switchingOperations: 6 });
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
