import { describe, expect, it } from "vitest";
import { ckSettingA, createController } from "../../../src/core/interval/controller.js";
import { simulateController } from "../../../src/core/interval/simulate.js";
import { expectClose } from "../../helpers/tolerance.js";
import { ITOL, seriesOf, syntheticYear } from "./fixtures.js";

const TAN95 = Math.sqrt(1 - 0.95 ** 2) / 0.95; // 0.328684
const TAN98 = Math.sqrt(1 - 0.98 ** 2) / 0.98; // 0.203059

describe("controller decision", () => {
  const c = createController({ fixedKvar: 0, stepsKvar: [50, 50, 100] }, 0.95);

  it("switches the least kvar that reaches the target (hand: 400 kW, 300 kvar → need ≥ 300 − 131.47 = 168.5 → 200)", () => {
    const m = c.decide(400, 300, 0);
    expect(c.switchedKvar(m)).toBe(200);
    expect(m).toBe(0b111); // 50 + 50 + 100: the only combination of 200
  });

  it("takes the best combination, not the steps in order (need 60 of [50, 100] → the 100 alone)", () => {
    const c2 = createController({ fixedKvar: 0, stepsKvar: [50, 100] }, 0.95);
    // hand: P = 0 so the target allows no kvar: need 60 → 100 is the least ≥ 60; ceiling 60 + 0 forbids it (would lead)
    expect(c2.switchedKvar(c2.decide(0, 60, 0))).toBe(50);
    // P = 300: target allows 98.6 kvar; Q = 160 → need ≥ 61.4 → 100; ceiling 160 + 60.9 = 220.9 → 100 allowed
    expect(c2.decide(300, 160, 0)).toBe(0b10);
  });

  it("never leads beyond the limit: takes the most kvar within it when the target cannot be met", () => {
    const c3 = createController({ fixedKvar: 0, stepsKvar: [300] }, 0.95);
    // P = 100, Q = 200: need ≥ 167.1, but 300 would leave −100 kvar, beyond −100·tan(acos 0.98) = −20.3 → stay off
    expect(c3.decide(100, 200, 0)).toBe(0);
  });

  it("holds the steps while the kvar left is in the dead band (target to unity ± 0.65 × the smallest step)", () => {
    // 400 kW: target leaves 131.47 kvar; threshold 0.65 × 50 = 32.5 → band −32.5 … 163.97 kvar left
    expect(c.thresholdKvar).toBe(32.5);
    expect(c.decide(400, 300, 0b111)).toBe(0b111); // 100 left: hold
    expect(c.decide(400, 250, 0b111)).toBe(0b111); // 50 left: hold
    expect(c.decide(400, 250, 0b100)).toBe(0b100); // 150 left: a shortfall under the threshold, hold
    // 100 switched, Q 280 → 180 left > 163.97 → need ≥ 148.5 → 150 = steps 1 + 3 (one change)
    expect(c.decide(400, 280, 0b100)).toBe(0b101);
    // 200 switched, Q 150 → −50 < −32.5 → need ≥ 18.5 → 50: steps 1 or 2 alone, two changes either way → the lower
    expect(c.decide(400, 150, 0b111)).toBe(0b001);
    expect(c.decide(400, 100, 0b111)).toBe(0); // −100 left → need < 0 → all off
  });

  it("with a zero response threshold the band is exactly target to unity", () => {
    const z = createController({ fixedKvar: 0, stepsKvar: [50, 50, 100] }, 0.95, { responseThreshold: 0 });
    expect(z.decide(400, 250, 0b100)).toBe(0b101); // 150 left > 131.47 → need ≥ 118.5 → 150
    // 200 switched, Q 190 → −10 left (leading) → need ≥ 58.5 → 100: 50 + 50 (one change from all on) beats 100 alone (two)
    expect(z.decide(400, 190, 0b111)).toBe(0b011);
  });

  it("a steady load with noise inside the band does not chatter", () => {
    let m = c.decide(400, 281, 0); // need ≥ 149.5 → 150 → 131 left
    expect(c.switchedKvar(m)).toBe(150);
    for (const q of [281, 270, 240, 200, 160, 281]) {
      const next = c.decide(400, q, m);
      expect(next, `Q ${q}`).toBe(m); // left = q − 150 stays within [0, 131.47]
      m = next;
    }
  });

  it("largestAtMost: the achievable sums of 50, 50, 100 are 0, 50, 100, 150, 200 (hand enumeration)", () => {
    expect([-5, 0, 49.9, 120, 200, 1000].map((q) => c.largestAtMost(q))).toEqual([0, 0, 0, 100, 200, 200]);
  });

  it("among equal kvar keeps the combination with the fewest changes", () => {
    // 50 needed with step 2 (50) already on: keep step 2 rather than swapping to step 1
    expect(c.decide(0, 50, 0b010)).toBe(0b010);
    expect(c.decide(0, 50, 0)).toBe(0b001);
  });
});

describe("C/k setting", () => {
  it("hand: 50 kvar at 480 V → 50 000/(√3·480) = 60.14 A; CT 1000/5 (200) → 0.3007 A", () => {
    expectClose(ckSettingA(50, 480, 200), 50_000 / (Math.sqrt(3) * 480) / 200, ITOL.exact, "C/k");
    expectClose(ckSettingA(50, 480, 200), 0.3007, { abs: 0.0001 }, "C/k hand value");
  });
});

describe("simulateController — piecewise-constant day", () => {
  // night 200 kW / 100 kvar, day (08–24 h) 600 kW / 450 kvar; bank 50 fixed + 50, 100, 100 switched.
  // Night: 100 − 50 = 50 ≤ 200·0.3287 = 65.7 → no steps; day: 450 − 50 = 400 needs ≥ 400 − 197.2 = 202.8 → all 250.
  // Both leave Q:P = 1:4 → PF = 4/√17 = 0.970143. Each step: 365 switch-ons at 08:00, 364 switch-offs at 00:00.
  const s = syntheticYear(96, (k) => (k < 32 ? { kW: 200, kvar: 100 } : { kW: 600, kvar: 450 }));
  const sim = simulateController(s, { fixedKvar: 50, stepsKvar: [50, 100, 100] }, 0.95);

  it("PF after is 4/√17 in every interval; none below target, none leading", () => {
    for (const v of Object.values(sim.pfAfter.percentiles)) expectClose(v, 4 / Math.sqrt(17), ITOL.pf, "PF after");
    expect(sim.intervalsBelowTarget).toEqual({ before: 365 * 96, after: 0 });
    expect(sim.intervalsLeading).toEqual({ before: 0, after: 0, afterBeyondLimit: 0 });
    expect(sim.kvarAfter.percentiles.P0).toBe(50);
    expect(sim.kvarAfter.percentiles.P100).toBe(150);
  });

  it("switching: 729 operations per step in 365 days", () => {
    expect(sim.switching.perStep.map((p) => p.operations)).toEqual([729, 729, 729]);
    expectClose(sim.switching.perStep[0]!.operationsPerDay, 729 / 365, ITOL.exact, "ops/day");
    expect(sim.switching.totalOperations).toBe(3 * 729);
    expectClose(sim.switching.perStep[1]!.onPct, (64 / 96) * 100, ITOL.exact, "on %");
  });

  it("billing PF per month before and after (hand: January 11 200/√(11 200² + 8 000²) → 11 200/√(11 200² + 2 800²))", () => {
    const jan = sim.monthly[0]!;
    expectClose(jan.billingPFBefore, 11_200 / Math.hypot(11_200, 8_000), ITOL.pf, "January before");
    // after: kvarh = 31 × (8 h × 50 + 16 h × 150) = 31 × 2 800
    expectClose(jan.kvarhNetAfter, 31 * 2_800, ITOL.sum, "January kvarh after");
    expectClose(jan.billingPFAfter, 11_200 / Math.hypot(11_200, 2_800), ITOL.pf, "January after");
    expectClose(jan.peakKVAAfter, Math.hypot(600, 150), ITOL.exact, "peak kVA after");
    expectClose(sim.total.billingPFAfter, 4 / Math.sqrt(17), ITOL.pf, "year after");
  });
});

describe("simulateController — fixed bank on a sinusoidal demand (closed form)", () => {
  // Q = 300 + 200·sin θ, P = 800, fixed 150 kvar: leading ⇔ sin θ < −0.75, share ½ + asin(−0.75)/π = 0.230054;
  // below 0.95 ⇔ Q − 150 > 800·0.328684 ⇔ sin θ > (412.947 − 300)/200, share ½ − asin(·)/π. Each of the 365
  // sampled days can differ from the continuous share by one interval.
  const A = 300,
    B = 200,
    N = 1440,
    P = 800,
    C = 150;
  const s = syntheticYear(N, (k) => ({ kW: P, kvar: A + B * Math.sin((2 * Math.PI * (k + 0.5)) / N) }));
  const sim = simulateController(s, { fixedKvar: C, stepsKvar: [] }, 0.95);
  const n = 365 * N;

  it("leading intervals", () => {
    const share = 0.5 + Math.asin((C - A) / B) / Math.PI;
    expectClose(sim.intervalsLeading.after, n * share, { abs: 365 }, "leading count");
    expect(sim.intervalsLeading.afterBeyondLimit).toBe(0); // Q − C ≥ −50 > −800·0.2031 = −162.4
    expect(sim.intervalsLeading.before).toBe(0);
  });

  it("intervals below target", () => {
    const share = 0.5 - Math.asin((C + P * TAN95 - A) / B) / Math.PI;
    expectClose(sim.intervalsBelowTarget.after, n * share, { abs: 365 }, "below-target count");
  });

  it("kvar after = Q − C at every percentile; no switching", () => {
    for (const p of [0, 50, 100])
      expectClose(sim.kvarAfter.percentiles[`P${p}`], A + B * Math.sin(Math.PI * (p / 100 - 0.5)) - C, { abs: (2 * Math.PI * B) / N }, `P${p}`);
    expect(sim.switching.totalOperations).toBe(0);
  });

  it.each([0.98, 0.99])("a 500-kvar step with leading limit %s: on exactly while Q ≥ 500 − P·tan(acos limit)", (limit) => {
    // Off → on when Q exceeds the target's 262.9 kvar and switching 500 leads no more than the limit allows;
    // on → off when Q − 500 leads beyond it. Both tests reduce to Q ≥ 500 − 800·tan(acos limit), which for
    // Q = 300 + 200·sin θ holds a share ½ − asin((threshold − 300)/200)/π of the time, once up and once down a day.
    const lim = simulateController(s, { fixedKvar: 0, stepsKvar: [500] }, 0.95, { leadingLimitPF: limit, responseThreshold: 0 });
    const threshold = 500 - P * (Math.sqrt(1 - limit ** 2) / limit); // 0.98 → 337.55; 0.99 → 385.99
    const share = 0.5 - Math.asin((threshold - A) / B) / Math.PI;
    expect(lim.leadingLimitPF).toBe(limit);
    expectClose(lim.switching.perStep[0]!.onPct, share * 100, { abs: (365 / n) * 100 }, "step on %");
    expect(lim.switching.perStep[0]!.operations).toBe(730);
    expect(lim.intervalsLeading.afterBeyondLimit).toBe(0);
    expect(threshold).toBeGreaterThan(P * TAN95); // so the target is never what holds it off
  });

  it("the default leading limit is 0.98", () => {
    expect(simulateController(s, { fixedKvar: 0, stepsKvar: [500] }, 0.95).leadingLimitPF).toBe(0.98);
    expectClose(TAN98, 0.203059, { abs: 1e-6 }, "tan(acos 0.98), hand: √0.0396/0.98 = 0.198997/0.98");
  });
});

describe("simulateController — input checks", () => {
  it("refuses negative or too many steps", () => {
    const s = seriesOf([0, 60_000], [1, 1], [1, 1], 1);
    expect(() => simulateController(s, { fixedKvar: -1, stepsKvar: [] }, 0.95)).toThrow(RangeError);
    expect(() => simulateController(s, { fixedKvar: 0, stepsKvar: Array(17).fill(10) }, 0.95)).toThrow(RangeError);
    expect(() => simulateController(s, { fixedKvar: 0, stepsKvar: [0] }, 0.95)).toThrow(RangeError);
  });
});
