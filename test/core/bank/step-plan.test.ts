import fc from "fast-check";
import { percentileOf } from "../../../src/core/interval/percentiles.js";
import { describe, expect, it } from "vitest";
import { chooseFixedPart, demandArrays, type DemandPoint, type ReactiveDemand } from "../../../src/core/bank/demand.js";
import { controllerResponseA, planSteps } from "../../../src/core/bank/step-plan.js";
import { STANDARD_UNIT_KVAR } from "../../../src/core/bank/standard-sizes.js";
import { expectClose, TOL } from "../../helpers/tolerance.js";
import { DTOL } from "./tolerances.js";

function arraysOf(demand: ReactiveDemand) {
  const { arrays, issues } = demandArrays(demand);
  expect(issues).toEqual([]);
  return arrays as NonNullable<typeof arrays>;
}

describe("nearest-rank percentile", () => {
  it.each([
    // hand calculation: rank = ⌈p·n⌉ of the sorted values
    { values: Array.from({ length: 100 }, (_, i) => 100 - i), p: 0.99, want: 99, src: "⌈0.99·100⌉ = 99th of 1…100" },
    { values: [3, 1, 2, 4], p: 0.5, want: 2, src: "⌈0.5·4⌉ = 2nd of 1, 2, 3, 4" },
    { values: [5, 7], p: 0.99, want: 7, src: "⌈1.98⌉ = 2nd: with two readings the larger" },
    { values: [8], p: 0.99, want: 8, src: "one reading" },
  ])("$src", ({ values, p, want }) => {
    expect(percentileOf(Float64Array.from(values), p * 100)).toBe(want);
  });
});

describe("fixed part", () => {
  it.each([
    // common practice: fixed ≤ the minimum reactive demand, largest standard unit under it
    {
      demand: {
        kind: "intervals",
        samples: [
          { kW: 100, kvar: 35.2 },
          { kW: 300, kvar: 200 },
        ],
      },
      need: 120,
      tx: undefined,
      want: 30,
      src: "min Q 35.2 → 30 kvar",
    },
    {
      demand: { kind: "readings", survey: { kW: 300, kvar: 250 }, lightLoad: { kW: 60, kvar: 12 } },
      need: 150,
      tx: undefined,
      want: 10,
      src: "light-load 12 kvar → 10 kvar",
    },
    {
      demand: {
        kind: "intervals",
        samples: [
          { kW: 100, kvar: 80 },
          { kW: 300, kvar: 200 },
        ],
      },
      need: 18,
      tx: undefined,
      want: 15,
      src: "need 18 kvar caps it below min Q → 15 kvar",
    },
    {
      demand: {
        kind: "intervals",
        samples: [
          { kW: 100, kvar: -5 },
          { kW: 300, kvar: 200 },
        ],
      },
      need: 120,
      tx: undefined,
      want: 0,
      src: "the site sometimes leads → no fixed part",
    },
    {
      demand: { kind: "readings", survey: { kW: 300, kvar: 250 } },
      need: 151,
      tx: 500,
      want: 25,
      src: "no light load: 5 % of 500 kVA = 25 kvar (rule of thumb)",
    },
    { demand: { kind: "readings", survey: { kW: 300, kvar: 250 } }, need: 151, tx: undefined, want: 0, src: "no light load, no transformer → 0" },
  ] as const)("$src", ({ demand, need, tx, want }) => {
    const f = chooseFixedPart(arraysOf(demand as ReactiveDemand), need, STANDARD_UNIT_KVAR, tx);
    expect(f.fixedKvar).toBe(want);
    expect(f.lightLoadKnown).toBe(demand.kind === "intervals" || "lightLoad" in demand);
  });

  it("subtracts capacitors already placed locally from every sample", () => {
    const a = arraysOf({ kind: "intervals", samples: [{ kW: 10, kvar: 50 }] });
    const { arrays } = demandArrays({ kind: "intervals", samples: [{ kW: 10, kvar: 50 }] }, 20);
    expect([...(arrays?.kvar ?? [])]).toEqual([(a.kvar[0] as number) - 20]);
  });

  it("reports non-finite samples and empty data as issues", () => {
    expect(demandArrays({ kind: "intervals", samples: [{ kW: 1, kvar: Number.NaN }] }).issues[0]?.path).toEqual(["demand", "samples", 0]);
    expect(demandArrays({ kind: "intervals", samples: [] }).issues.length).toBe(1);
  });
});

const alternate = (a: DemandPoint, b: DemandPoint, n: number) => Array.from({ length: n }, (_, i) => (i % 2 === 0 ? a : b));

describe("step search", () => {
  it("two load levels: ties on intervals, steps and operations go to the least installed kvar", () => {
    // hand calculation, target 0.95 (tan = 0.328684): light (100 kW, 80 kvar) needs 47.13, heavy (400, 300) needs 168.53
    // fixed ≤ min Q 80 → 75 kvar; switched need 168.53 − 75 = 93.53 kvar. Three-step programs rounding up:
    // 1:1:1 3×40 = 120; 1:2:2 20+40+40 = 100; 1:2:4 15+30+60 = 105 — each meets all 20 samples with 3 toggles per
    // change (19 changes = 57 operations); the least installed kvar is 1:2:2 at 100 kvar.
    const plan = planSteps({
      demand: arraysOf({ kind: "intervals", samples: alternate({ kW: 100, kvar: 80 }, { kW: 400, kvar: 300 }, 20) }),
      targetPF: 0.95,
    });
    expect(plan.fixed.fixedKvar).toBe(75);
    expectClose(plan.needAtCoverageKvar, 300 - 400 * 0.3286841051788632, TOL.power, "need at coverage");
    expectClose(plan.switchedNeededKvar, 300 - 400 * 0.3286841051788632 - 75, TOL.power, "switched need");
    expect(plan.switched?.ratio).toBe("1:2:2");
    expect(plan.switched?.stepsKvar).toEqual([20, 40, 40]);
    expect(plan.metShare).toBe(1);
    expect(plan.switchingOperations).toBe(57);
  });

  it("a finer program wins when coarse steps cannot serve the light load without leading", () => {
    // hand calculation, target 0.95: samples (10 kW, 2 kvar), (50, 40), (400, 300); min Q 2 → no fixed part.
    // Need at coverage 168.53 kvar. (50, 40) needs 23.57 with 40 kvar of room: 1:1:1 3×60 and 1:2:2 50/100/100 have a
    // smallest step above 40 → not met; 1:2:4 25/50/100 (175) serves it with 25 and the heavy sample with all 7 × 25.
    // Operations: 0 → 1 multiple (1 toggle), 1 → 7 ({1} → {1,2,4}: 2 toggles) = 3.
    const plan = planSteps({
      demand: arraysOf({
        kind: "intervals",
        samples: [
          { kW: 10, kvar: 2 },
          { kW: 50, kvar: 40 },
          { kW: 400, kvar: 300 },
        ],
      }),
      targetPF: 0.95,
    });
    expect(plan.fixed.fixedKvar).toBe(0);
    expect(plan.switched?.ratio).toBe("1:2:4");
    expect(plan.switched?.stepsKvar).toEqual([25, 50, 100]);
    expect(plan.metShare).toBe(1);
    expect(plan.switchingOperations).toBe(3);
  });

  it("with a tie share, near-equal met counts tie and the fewest operations decide", () => {
    // hand calculation, same three samples, metTieShare 1/3 (one sample's worth): best met 3, so plans meeting 2 tie.
    // Three-step plans: 1:2:4 25/50/100 (3 toggles), 1:1:1 3×60 (0, 0, 3: 3 toggles), 1:2:2 50/100/100 (0, 0, k = 4 = {2,2}:
    // 2 toggles), 1:2:2 30/60/60 (1 + 2 = 3), 1:2:4 15/30/60 (1 + 2 = 3) → 1:2:2 50/100/100 with 2 operations
    const plan = planSteps({
      demand: arraysOf({
        kind: "intervals",
        samples: [
          { kW: 10, kvar: 2 },
          { kW: 50, kvar: 40 },
          { kW: 400, kvar: 300 },
        ],
      }),
      targetPF: 0.95,
      options: { metTieShare: 1 / 3 },
    });
    expect(plan.switched?.stepsKvar).toEqual([50, 100, 100]);
    expect(plan.switchingOperations).toBe(2);
  });

  it("survey only, 500 kVA transformer: fixed by the 5 % rule and a warning to take a light-load reading", () => {
    // hand calculation: need = 250 − 300·0.328684 = 151.39; fixed min(25, 250, 151.39) → 25; switched 126.39.
    // Three-step programs rounding up (every step a listed size): 1:1:1 3×50 = 150, 1:2:2 30/60/60 = 150,
    // 1:2:4 25/50/100 = 175 (20/40/80 is out: no 80 kvar unit). All meet the one reading with no switching;
    // least kvar ties 1:1:1 and 1:2:2 at 150, the finer smallest step (30 kvar) decides.
    const plan = planSteps({ demand: arraysOf({ kind: "readings", survey: { kW: 300, kvar: 250 } }), targetPF: 0.95, transformerKVA: 500 });
    expect(plan.fixed.fixedKvar).toBe(25);
    expect(plan.switched?.stepsKvar).toEqual([30, 60, 60]);
    expect(plan.warnings.map((w) => w.code)).toEqual(["light_load_unknown"]);
  });

  it("survey with a light-load reading", () => {
    // hand calculation: fixed ≤ light-load 30 kvar → 30; survey then needs 220 − 98.605 = 121.39 with 220 of room.
    // Three steps rounding up: 1:1:1 3×50 (k = 3: 3 toggles), 1:2:2 25/50/50 (k = 5 = 1+2+2: 3 toggles),
    // 1:2:4 25/50/100 (k = 5 = 1+4: 2 toggles) → fewest operations wins before least kvar: 25/50/100
    const plan = planSteps({
      demand: arraysOf({ kind: "readings", survey: { kW: 300, kvar: 250 }, lightLoad: { kW: 60, kvar: 30 } }),
      targetPF: 0.95,
    });
    expect(plan.fixed.fixedKvar).toBe(30);
    expect(plan.switched?.stepsKvar).toEqual([25, 50, 100]);
    expect(plan.switchingOperations).toBe(2);
    expect(plan.warnings).toEqual([]);
  });

  it("nothing to correct: no fixed part and no steps", () => {
    // hand calculation: PF 0.99 (100 kW, 14.2 kvar) is above 0.95
    const plan = planSteps({ demand: arraysOf({ kind: "intervals", samples: [{ kW: 100, kvar: 14.2 }] }), targetPF: 0.95 });
    expect(plan.needAtCoverageKvar).toBe(0);
    expect(plan.fixed.fixedKvar).toBe(0);
    expect(plan.switched).toBeNull();
  });

  it("properties: fixed never above the minimum demand; the plan meets at least as many samples as the fixed part alone", () => {
    fc.assert(
      fc.property(
        fc.array(fc.tuple(fc.double({ min: 1, max: 800, noNaN: true }), fc.double({ min: 0.6, max: 1, noNaN: true })), {
          minLength: 1,
          maxLength: 60,
        }),
        (raw) => {
          const samples = raw.map(([kW, pf]) => ({ kW, kvar: kW * Math.tan(Math.acos(pf)) }));
          const d = arraysOf({ kind: "intervals", samples });
          const plan = planSteps({ demand: d, targetPF: 0.95 });
          const minQ = Math.min(...samples.map((s) => s.kvar));
          const fixedOnly = planSteps({ demand: d, targetPF: 0.95, options: { ratios: [] } });
          const sizesOk = (plan.switched?.stepsKvar ?? []).every((s) => (STANDARD_UNIT_KVAR as readonly number[]).includes(s) || s % 100 === 0);
          return plan.fixed.fixedKvar <= minQ + 1e-9 && plan.metCoveredShare >= fixedOnly.metCoveredShare - 1e-12 && sizesOk;
        },
      ),
      { numRuns: 100, seed: 3 },
    );
  });
});

describe("controller response threshold C/k", () => {
  it("25 kvar, 400 V, CT 1000/5: 0.180 A", () => {
    // hand calculation (from the brief): 25000/(1.732·400·200) = 0.180 A
    expectClose(controllerResponseA(25, 400, 200), 0.18, DTOL.currentRoundedA, "C/k");
    expectClose(controllerResponseA(25, 400, 200), 25000 / (Math.sqrt(3) * 400 * 200), TOL.currentA, "C/k exact");
  });
  it("single phase 10 kvar, 230 V, CT 100/5: 2.174 A", () => {
    // hand calculation: 10000/(230·20) = 2.1739 A
    expectClose(controllerResponseA(10, 230, 20, 1), 2.1739130434782608, TOL.currentA, "C/k 1φ");
  });
});
