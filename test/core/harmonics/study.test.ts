import { describe, expect, it } from "vitest";
import { runHarmonicStudy, type HarmonicStudyInput, type HarmonicStudyResult } from "../../../src/core/harmonics/harmonics-api.js";

/** Same site as worked-example.test.ts, the 300 kvar bank in three 100 kvar steps. */
const site = (): HarmonicStudyInput => ({
  network: { voltageV: 480, frequencyHz: 60, shortCircuitKVA: 1500 / 0.0575, xOverR: 8 },
  sources: [{ label: "vfd", kVA: 300, phases: 3, isDrive: true }],
  banks: [{ name: "main", ratedVoltageV: 480, reactorPct: 0, steps: [{ kvar: 100 }, { kvar: 100 }, { kvar: 100 }] }],
});

function run(input: HarmonicStudyInput): HarmonicStudyResult {
  const out = runHarmonicStudy(input);
  if (!out.ok) throw new Error(JSON.stringify(out.issues));
  return out.result;
}

function deepFreeze<T>(o: T): T {
  if (o && typeof o === "object") {
    Object.values(o).forEach(deepFreeze);
    Object.freeze(o);
  }
  return o;
}

describe("runHarmonicStudy", () => {
  it("finds each stage's resonance and the present orders it sits near", () => {
    // hand calculation, h ≈ √(S_sc/Q): 100 kvar → √260.9 = 16.15 (17 ± 10 % = 15.3..18.7 holds it);
    //   200 kvar → √130.4 = 11.42 (11 ± 10 % = 9.9..12.1); 300 kvar → √86.96 = 9.33 (none: 7.7 < 9.33 < 9.9)
    const r = run(deepFreeze(site()));
    const stages = r.banks[0]!.stages;
    expect(stages.map((s) => s.nameplateKvar)).toEqual([100, 200, 300]);
    expect(stages.map((s) => s.resonanceWithin10PctOf)).toEqual([[17], [11], []]);
    const expected = [16.15, 11.42, 9.33];
    stages.forEach((s, i) => expect(Math.abs(s.peaks[0]!.order - expected[i]!) / expected[i]!).toBeLessThan(0.02));
    const codes = r.findings.filter((f) => f.code === "resonance_near_harmonic").map((f) => f.stageNumber);
    expect(codes).toEqual([1, 2]);
    expect(r.withoutCapacitors.peaks).toEqual([]);
    expect(r.presentOrders).toEqual([5, 7, 11, 13, 17, 19, 23, 25, 29, 31, 35, 37, 41, 43, 47, 49]);
  });

  it("proposes a 7 % detuned bank and reruns it without resonance near a present order", () => {
    // hand calculation: 7 % (six-pulse orders, no 3rd), 550 V (480/0.93·1.05 = 541.9), 125 kvar steps (122.1 rounded);
    //   full bank Q_c = 375·(480/550)² = 285.6 kvar → h ≈ 1/√(285.6/26 087 + 0.07) = 3.52, below 3.78 and 5·0.9 = 4.5
    const r = run(site());
    expect(r.proposals).toHaveLength(1);
    const p = r.proposals[0]!;
    expect(p.forBank).toBe("main");
    expect(p.triggeredBy).toContain("resonance_near_harmonic");
    expect(p.design.reactorPct).toBe(7);
    expect(p.design.ratedVoltageV).toBe(550);
    expect(p.design.steps.map((s) => s.nameplateKvar)).toEqual([125, 125, 125]);
    const last = p.study.stages[2]!;
    expect(Math.abs(last.peaks[0]!.order - 3.52) / 3.52).toBeLessThan(0.02);
    expect(last.dips[0]!.order).toBeCloseTo(3.78, 1);
    expect(p.findings.filter((f) => f.code === "resonance_near_harmonic")).toEqual([]);
    expect(p.study.stages.every((s) => s.duty.pass)).toBe(true);
  });

  it("moves to 14 % when the 7 % rerun still resonates near a small 3rd", () => {
    // hand calculation: S_sc 10 000 kVA; 7 % proposal full bank Q_c ≈ 375·(480/550)² = 285.6 kvar →
    //   h ≈ 1/√(0.02856 + 0.07) = 3.19, inside 3 ± 10 % (2.7..3.3) → 14 %: 600 V (480/0.86·1.05 = 586),
    //   125 kvar steps, Q_c = 375·0.64 = 240 kvar → h ≈ 1/√(0.024 + 0.14) = 2.47 < 2.7.
    //   3rd is 3 % of I_1, below the 5 % significance rule, so 7 % was the first choice.
    const input: HarmonicStudyInput = {
      ...site(),
      network: { voltageV: 480, frequencyHz: 60, shortCircuitKVA: 10_000, xOverR: 8 },
      sources: [
        {
          label: "mix",
          kVA: 200,
          phases: 3,
          isDrive: false,
          spectrum: [
            { order: 3, pct: 3 },
            { order: 5, pct: 20 },
            { order: 7, pct: 14 },
          ],
        },
      ],
    };
    const r = run(input);
    expect(r.thirdHarmonicSignificant).toBe(false);
    const p = r.proposals[0]!;
    expect(p.design.reactorPct).toBe(14);
    expect(p.design.ratedVoltageV).toBe(600);
    expect(p.design.rationale[0]).toMatch(/7 % still resonated/);
    expect(Math.abs(p.study.stages[2]!.peaks[0]!.order - 2.47) / 2.47).toBeLessThan(0.02);
    expect(p.findings.filter((f) => f.code === "resonance_near_harmonic")).toEqual([]);
  });

  it("chooses 14 % straight away for a significant 3rd", () => {
    // the engine's rule (no standard): I_3 ≥ 5 % of the sources' fundamental → significant; here 10 %.
    // The 17th is there so stage 1 (h ≈ 16.15, see above) resonates and a proposal is made.
    const spectrum = [
      { order: 3, pct: 10 },
      { order: 5, pct: 20 },
      { order: 17, pct: 6 },
    ];
    const r = run({ ...site(), sources: [{ label: "ups", kVA: 300, phases: 3, isDrive: false, spectrum }] });
    expect(r.thirdHarmonicSignificant).toBe(true);
    expect(r.proposals[0]?.design.reactorPct).toBe(14);
  });

  it("returns scan series only when asked", () => {
    expect(run(site()).banks[0]!.stages[0]!.series).toBeUndefined();
    const r = run({ ...site(), options: { includeScanSeries: true, scan: { fromOrder: 1, toOrder: 25, stepOrder: 0.05 } } });
    // hand calculation: (25 − 1)/0.05 + 1 = 481 points
    expect(r.withoutCapacitors.series?.orders).toHaveLength(481);
    expect(r.banks[0]!.stages[2]!.series?.impedanceOhm).toHaveLength(481);
  });

  it("flags a duty failure and a THD failure with codes", () => {
    // stage 1 (100 kvar) resonates at 16.2 next to the 17th: amplification drives THD and current up
    const r = run(site());
    const s1 = r.findings.filter((f) => f.stageNumber === 1).map((f) => f.code);
    expect(s1).toContain("thd_v_exceeds_limit");
    expect(s1).toContain("capacitor_duty_exceeds_limit");
    expect(r.banks[0]!.stages[0]!.ieee519.thd.pass).toBe(false);
    expect(r.assumptions.length).toBeGreaterThan(5);
  });

  it("has no proposal when nothing fails", () => {
    // hand calculation: one small 2 % 5th source on a stiff bus; 50 kvar on 26 087 kVA → h ≈ √521.7 = 22.8, no present order near it
    const r = run({
      ...site(),
      sources: [{ label: "small", kVA: 10, phases: 3, isDrive: false, spectrum: [{ order: 5, pct: 2 }] }],
      banks: [{ name: "tiny", ratedVoltageV: 480, reactorPct: 0, steps: [{ kvar: 50 }] }],
    });
    expect(r.proposals).toEqual([]);
    expect(r.findings.filter((f) => f.code !== "capacitor_above_rating")).toEqual([]);
  });

  it("returns issues with paths instead of throwing", () => {
    const out = runHarmonicStudy({
      network: { voltageV: -480, frequencyHz: 60, shortCircuitKVA: 0 },
      sources: [{ label: "x", kVA: 10, phases: 3, isDrive: false }],
      banks: [{ name: "b", ratedVoltageV: 480, reactorPct: 7, steps: [{ kvar: 0 }] }],
      options: { scan: { stepOrder: 0 } },
    });
    expect(out.ok).toBe(false);
    if (out.ok) return;
    expect(out.issues.map((i) => i.path)).toEqual([
      "network.voltageV",
      "network.shortCircuitKVA",
      "sources[0].spectrum",
      "banks[0].steps[0].kvar",
      "options.scan.stepOrder",
    ]);
  });
});
