import { describe, expect, it } from "vitest";
import { evaluateInstalledBanks } from "../../../src/core/bank/installed.js";
import { installedCredit } from "../../../src/core/correction/installed-credit.js";
import type { InstalledBankInput, SizingInput, SystemInput } from "../../../src/core/inputs.js";
import { size } from "../../../src/core/pipeline/size.js";
import { clampOverReadPct } from "../../../src/core/pipeline/installed-banks.js";
import { expectClose, TOL } from "../../helpers/tolerance.js";

const sys: SystemInput = { voltageV: 480, frequencyHz: 60, phases: 3 };
const bank: InstalledBankInput = {
  label: "MSB bank",
  location: "service",
  control: "automatic",
  ratedVoltageV: 480,
  steps: [{ kvar: 50 }, { kvar: 50 }, { kvar: 50 }, { kvar: 50 }],
};
// tan(acos 0.95) = √(1 − 0.9025)/0.95 = 0.312250/0.95 = 0.328684 (power triangle)
const TAN95 = 0.328684;

function evaluated(stepCurrents = [{ step: 2, amps: [54, 54, 54] }]) {
  const out = evaluateInstalledBanks([bank], [{ bank: "MSB bank", inServiceSteps: [1, 2], stepCurrents }], sys);
  expect(out.issues).toEqual([]);
  return out.banks;
}

describe("credit for installed banks", () => {
  it("service reading with steps 1–2 on: adds back 94.894 kvar, needs 213.420 kvar, 13.420 kvar beyond the restored bank", () => {
    // delivered: 50 (step 1, rated) + 50·54/60.1407 = 44.894 (step 2, measured) = 94.894 kvar
    // uncorrected 250 + 94.894 = 344.894; allowed 400·0.328684 = 131.474; required 213.420; additional 213.420 − 200 = 13.420
    const c = installedCredit({ kW: 400, kvar: 250, basis: "service_entrance" }, 0.95, evaluated(), []);
    expectClose(c.kvarInstalledInService, 94.8939, TOL.powerQuoted, "in service");
    expectClose(c.kvarIncludedInReadings, 94.8939, TOL.powerQuoted, "included");
    expectClose(c.kvarRequiredTotal, 250 + 94.8939 - 400 * TAN95, TOL.powerQuoted, "required total");
    expectClose(c.kvarAdditional, 13.4203, TOL.powerQuoted, "additional");
    // repair: step 2 restores 50·(1 − 0.89788) = 5.106 kvar
    expect(c.repairFirst).toHaveLength(1);
    expect(c.repairFirst[0]).toMatchObject({ bank: "MSB bank", step: 2, status: "degraded" });
    expectClose(c.repairFirst[0]!.restoresKvar, 5.1061, TOL.powerQuoted, "restores");
  });

  it("readings at the loads do not include a service bank: nothing is added back", () => {
    const c = installedCredit({ kW: 400, kvar: 250, basis: "sum_of_loads" }, 0.95, evaluated(), []);
    expect(c.kvarIncludedInReadings).toBe(0);
    expectClose(c.kvarRequiredTotal, 250 - 400 * TAN95, TOL.powerQuoted, "required");
    // 250 − 131.474 = 118.526 kvar required, under the 200 kvar installed: nothing to add
    expect(c.kvarAdditional).toBe(0);
  });

  it("a leading site: take out one 50 kvar step (fewest steps that land in the band) → −30 kvar, PF 0.9889 leading", () => {
    // as read: 200 kW, −80 kvar; band |Q| ≤ 200·0.328684 = 65.737 kvar; one step of 50 → −30 kvar;
    // PF = 200/√(200² + 30²) = 200/202.237 = 0.98894
    const banks = evaluated([]);
    const c = installedCredit({ kW: 200, kvar: -80, basis: "service_entrance" }, 0.95, banks, []);
    expect(c.leadingRelief?.takeOutOfService).toHaveLength(1);
    expectClose(c.leadingRelief?.kvarAfter, -30, TOL.power, "kvar after");
    expectClose(c.leadingRelief?.pfAfter, 0.988936, TOL.pf, "pf after");
    expect(c.leadingRelief).toMatchObject({ senseAfter: "leading", reachesTarget: true });
  });

  it("clamp over-reading: 5 % of 5th → √(1 + 0.25²) − 1 = 3.078 %; 4 % 5th + 3 % 7th → √(1 + 0.04 + 0.0441) − 1 = 4.120 %", () => {
    expectClose(clampOverReadPct([{ order: 5, voltagePct: 5 }]), 3.0776, TOL.pct, "5th");
    expectClose(
      clampOverReadPct([
        { order: 5, voltagePct: 4 },
        { order: 7, voltagePct: 3 },
      ]),
      4.1201,
      TOL.pct,
      "5th+7th",
    );
  });
});

describe("installed banks inside the sizing", () => {
  const input = (): SizingInput => ({
    system: sys,
    targetPF: 0.95,
    loads: [{ label: "Main", measurement: { method: "kw_kvar", kW: 400, kvar: 300 } }],
    serviceEntrance: { measurement: { method: "kw_kvar", kW: 400, kvar: 250 } },
    transformer: { kVA: 1000, impedancePct: 5.75 },
    installedBanks: [bank],
    bankReadings: [{ bank: "MSB bank", inServiceSteps: [1, 2], stepCurrents: [{ step: 2, amps: [54, 54, 54] }] }],
  });

  it("credits the bank, asks for repair first and designs only the kvar that remains", () => {
    const out = size(input());
    expect(out.ok).toBe(true);
    if (!out.ok) return;
    const r = out.result;
    expect(r.installedBanks).toHaveLength(1);
    expectClose(r.correction.kvarAdditional, 13.4203, TOL.powerQuoted, "additional");
    expect(r.correction.repairFirst?.[0]).toMatchObject({ step: 2 });
    expect(r.warnings.filter((w) => w.code === "installed_steps_need_repair")).toHaveLength(1);
    // the new bank's total is at most the additional need rounded up to one standard unit, not the 82 kvar as read
    const newKvar = r.recommendedBank?.effectiveKvar ?? 0;
    // the controller rule holds within its dead band: the need less 0.65 × the smallest step counts as met
    // (bank/controller-rule.ts; threshold common practice, no source), so 13.42 − 0.65 × 2.5 = 11.795 kvar at least
    const smallest = Math.min(...(r.recommendedBank?.physicalSteps ?? []).map((s) => s.effectiveKvar));
    expect(newKvar).toBeGreaterThan(13.42 - 0.65 * smallest - 1e-9);
    expect(newKvar).toBeLessThan(13.42 + 15);
    // a plain bank measured: the clamp caution is there
    expect(r.cautions.some((c) => c.code === "clamp_reading_plain_bank")).toBe(true);
  });

  it("rejects a reading of a bank it does not have, naming the field", () => {
    const i = input();
    i.bankReadings = [{ bank: "Other", inServiceSteps: [1] }];
    const out = size(i);
    expect(out.ok).toBe(false);
    if (!out.ok) expect(out.issues.map((x) => x.path.join("."))).toEqual(["bankReadings.0.bank"]);
  });

  it("without installed banks the result carries none of the new fields", () => {
    const i = input();
    delete i.installedBanks;
    delete i.bankReadings;
    const out = size(i);
    expect(out.ok && out.result.installedBanks).toBe(undefined);
    expect(out.ok && "kvarAdditional" in out.result.correction).toBe(false);
  });
});
