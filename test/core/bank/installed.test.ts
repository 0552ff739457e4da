import { describe, expect, it } from "vitest";
import { capacitanceShare, evaluateInstalledBanks, expectedStep, stepStatus, unbalancePct } from "../../../src/core/bank/installed.js";
import type { InstalledBankInput, SystemInput } from "../../../src/core/inputs.js";
import { expectClose, TOL } from "../../helpers/tolerance.js";

const sys480: SystemInput = { voltageV: 480, frequencyHz: 60, phases: 3 };
const plain480 = { ratedVoltageV: 480 } as const;

/** A 4 × 50 kvar plain automatic bank rated 480 V / 60 Hz at the service. */
const bankA: InstalledBankInput = {
  label: "MSB bank",
  location: "service",
  control: "automatic",
  ratedVoltageV: 480,
  steps: [{ kvar: 50 }, { kvar: 50 }, { kvar: 50 }, { kvar: 50 }],
};

describe("expected step current from the nameplate", () => {
  it("50 kvar, 480 V plain, read at 480 V: I = 50 000/(√3·480) = 50 000/831.384 = 60.141 A (circuit theory)", () => {
    const e = expectedStep(50, plain480, 480, 60, 3);
    expectClose(e.kvar, 50, TOL.power, "kvar");
    expectClose(e.currentA, 60.1407, TOL.quoted4dp, "current");
  });

  it("read at 470 V: Q = 50·(470/480)² = 47.9384 kvar, I = 47 938.4/(√3·470) = 58.8878 A (Q ∝ V², IEEE Std 18 rating basis)", () => {
    const e = expectedStep(50, plain480, 470, 60, 3);
    expectClose(e.kvar, 47.9384, TOL.powerQuoted, "kvar");
    expectClose(e.currentA, 58.8878, TOL.quoted4dp, "current");
  });

  it("50 kvar at 525 V behind 7 %, on 480 V: Q_c = 50·(480/525)² = 41.7959, /0.93 = 44.9418 kvar, I = 44 941.8/831.384 = 54.0566 A", () => {
    const e = expectedStep(50, { ratedVoltageV: 525, reactorPct: 7 }, 480, 60, 3);
    expectClose(e.kvar, 44.9418, TOL.powerQuoted, "kvar");
    expectClose(e.currentA, 54.0566, TOL.quoted4dp, "current");
  });

  it("rated at 50 Hz, used at 60 Hz: 50·60/50 = 60 kvar, I = 60 000/831.384 = 72.1688 A (Q ∝ f)", () => {
    const e = expectedStep(50, { ratedVoltageV: 480, ratedFrequencyHz: 50 }, 480, 60, 3);
    expectClose(e.kvar, 60, TOL.power, "kvar");
    expectClose(e.currentA, 72.1688, TOL.quoted4dp, "current");
  });

  it("single phase: 10 kvar, 240 V: I = Q/V = 10 000/240 = 41.6667 A", () => {
    expectClose(expectedStep(10, { ratedVoltageV: 240 }, 240, 60, 1).currentA, 41.6667, TOL.quoted4dp, "current");
  });
});

describe("capacitance, unbalance and status", () => {
  it("plain: the capacitance share is the current share; 7 % reactor: r = 0.9 → k = 0.9/(0.93 + 0.063) = 0.906344", () => {
    expectClose(capacitanceShare(0.9, 0), 0.9, TOL.pf, "plain");
    expectClose(capacitanceShare(0.9, 0.07), 0.906344, TOL.pf, "detuned");
    // forward check by hand: k(1 − p)/(1 − k·p) = 0.906344·0.93/(1 − 0.063444) = 0.842900/0.936556 = 0.9000
  });

  it("unbalance: [60, 54, 57] → mean 57, worst 3 → 5.263 %; [60, 48, 60] → mean 56, worst 8 → 14.286 % (hand)", () => {
    expectClose(unbalancePct([60, 54, 57]), 5.2632, TOL.pct, "5.26");
    expectClose(unbalancePct([60, 48, 60]), 14.2857, TOL.pct, "14.29");
    expect(unbalancePct([42])).toBe(0);
  });

  it("thresholds: dead phase → failed, < 50 % → failed, > 10 % deviation → unbalanced, < 95 % → degraded", () => {
    expect(stepStatus([60.14, 0, 60.14], 60.14, 66.7).status).toBe("failed");
    expect(stepStatus([25, 25, 25], 60.14, 41.6).status).toBe("failed");
    expect(stepStatus([60, 48, 60], 60.14, 93.1).status).toBe("unbalanced");
    expect(stepStatus([54, 54, 54], 60.14, 89.8).status).toBe("degraded");
    expect(stepStatus([59.5, 59.5, 59.5], 60.14, 98.9).status).toBe("healthy");
    // the 95 % line itself: 94.9 % is degraded, 95.0 % is not
    expect(stepStatus([57], 60, 94.9).status).toBe("degraded");
    expect(stepStatus([57], 60, 95).status).toBe("healthy");
  });
});

describe("evaluateInstalledBanks", () => {
  it("works every step: a degraded step 2 at 54 A reads 54/60.1407 = 89.788 %, delivering 44.894 kvar", () => {
    const out = evaluateInstalledBanks(
      [bankA],
      [
        {
          bank: "MSB bank",
          inServiceSteps: [1, 2],
          stepCurrents: [
            { step: 2, amps: [54, 54, 54] },
            { step: 3, amps: [60, 0, 60] },
          ],
        },
      ],
      sys480,
    );
    expect(out.issues).toEqual([]);
    const b = out.banks[0]!;
    expectClose(b.nameplateKvar, 200, TOL.power, "nameplate");
    expectClose(b.ratedKvarAtSystem, 200, TOL.power, "rated at system");
    expectClose(b.inServiceKvar, 100, TOL.power, "in service");
    const s2 = b.steps[1]!;
    expect(s2.status).toBe("degraded");
    expectClose(s2.capacitancePct, 89.7878, TOL.pct, "capacitance");
    expectClose(s2.measuredKvar, 44.8939, TOL.powerQuoted, "measured kvar");
    // delivered: step 1 unmeasured at its rated 50 kvar + step 2 as measured
    expectClose(b.deliveredKvar, 94.8939, TOL.powerQuoted, "delivered");
    // step 3 was measured (switched in for the test) but not energised during the readings: a blown fuse in phase B
    expect(b.steps[2]).toMatchObject({ status: "failed", inService: false });
    expect(b.steps[3]!.status).toBe("not_measured");
    // step 3: mean (60 + 0 + 60)/3 = 40 A → 50·40/60.1407 = 33.2557 kvar; with step 2: 44.8939 + 33.2557 = 78.1496
    expectClose(b.measuredKvar, 78.1496, TOL.powerQuoted, "measured (steps 2 and 3)");
  });

  it("a zero in one phase is a finding, not an error", () => {
    const out = evaluateInstalledBanks([bankA], [{ bank: "MSB bank", inServiceSteps: [1], stepCurrents: [{ step: 1, amps: [0, 60, 60] }] }], sys480);
    expect(out.issues).toEqual([]);
    expect(out.banks[0]!.steps[0]!.status).toBe("failed");
  });

  it("rejects, naming the field: unknown bank, step outside, > 3 × expected, phases on one phase, duplicate label", () => {
    const bad = evaluateInstalledBanks(
      [bankA],
      [
        { bank: "Nope", inServiceSteps: [] },
        {
          bank: "MSB bank",
          inServiceSteps: [1, 5],
          stepCurrents: [
            { step: 1, amps: 60 },
            { step: 2, amps: [60, 60, 181] },
            { step: 9, amps: 1 },
          ],
        },
      ],
      sys480,
    );
    const paths = bad.issues.map((i) => i.path.join("."));
    expect(paths).toEqual([
      "bankReadings.0.bank",
      "bankReadings.1.inServiceSteps.1",
      "bankReadings.1.stepCurrents.1.amps.2",
      "bankReadings.1.stepCurrents.2.step",
    ]);
    // 3 × 60.1407 = 180.42 A: 181 A is out, 180 A would stand
    const one = evaluateInstalledBanks(
      [{ ...bankA, ratedVoltageV: 240, steps: [{ kvar: 10 }] }],
      [{ bank: "MSB bank", inServiceSteps: [1], stepCurrents: [{ step: 1, amps: [40, 40, 40] }] }],
      { voltageV: 240, frequencyHz: 60, phases: 1 },
    );
    expect(one.issues.map((i) => i.path.join("."))).toEqual(["bankReadings.0.stepCurrents.0.amps"]);
    const dup = evaluateInstalledBanks([bankA, { ...bankA }], [], sys480);
    expect(dup.issues.map((i) => i.path.join("."))).toEqual(["installedBanks.1.label"]);
  });
});
