import { describe, expect, it } from "vitest";
import { planPlacement, type PlacementLoad } from "../../../src/core/placement/placement.js";
import { size } from "../../../src/core/pipeline/size.js";
import { expectClose, TOL } from "../../helpers/tolerance.js";

const SQ3 = Math.sqrt(3);
const TAN95 = 0.3286841051788632; // tan(acos 0.95), hand calculation: √(1 − 0.9025)/0.95

// A motor read at 460 V / 125 A, PF 0.85 lagging, on a 480 V bus (an invented press shop).
// hand calculation: S = √3·460·125/1000 = 99.593 kVA; P = 0.85·S = 84.654 kW; Q = S·√(1 − 0.85²) = 52.464 kvar
const S = (SQ3 * 460 * 125) / 1000;
const P = 0.85 * S;
const Q = S * Math.sqrt(1 - 0.85 ** 2);
const press: PlacementLoad = { label: "press", kind: "motor", kW: P, kvar: Q, voltageV: 460, phases: 3, starting: "across_the_line", noLoadAmps: 40 };

describe("terminal units at the voltage read, chosen among standard nameplates (issue 11 points 3, 4, 5)", () => {
  const plan = planPlacement({ loads: [press], targetPF: 0.95, siteRequiredKvar: 100, unitRatedVoltageV: 480 });
  const t = plan.loads[0]?.terminal;

  it("self-excitation limit at 460 V, a 25 kvar 480 V unit delivering 22.96 kvar", () => {
    // hand: Q_max = √3·460·40/1000 = 31.870 kvar (not √3·480·40/1000 = 33.255); 90 % = 28.683;
    // need = 52.464 − 84.654·0.328684 = 24.640 kvar → the cap is 24.640 kvar delivered;
    // a 480 V unit delivers (460/480)² = 0.918403 of its nameplate: 25 → 22.960 ≤ 24.640, 30 → 27.552 > 24.640
    expectClose(t?.selfExcitationLimitKvar, 31.87, TOL.powerQuoted, "Q_max at 460 V");
    expect([t?.perMotorNameplateKvar, t?.ratedVoltageV, t?.voltageV]).toEqual([25, 480, 460]);
    expectClose(t?.perMotorKvar, 25 * (460 / 480) ** 2, TOL.power, "delivered per motor");
    expectClose(t?.perMotorKvar, 22.96, TOL.powerQuoted, "delivered (hand: 22.960)");
    expectClose(plan.loads[0]?.needKvar, Q - P * TAN95, TOL.power, "need");
    expectClose(plan.locations[0]?.kvar, t?.perMotorKvar ?? NaN, TOL.power, "the balance counts what the unit delivers");
  });

  it("currents before and after from the reading: 125 A → 112.52 A, and the overload note at 460 V", () => {
    // hand: after = √(84.654² + (52.464 − 22.960)²) = √(7166.3 + 870.5) = 89.648 kVA → 89 648/(√3·460) = 112.52 A
    expectClose(t?.lineCurrentBeforeA, 125, TOL.currentA, "before = amps read");
    expectClose(t?.lineCurrentAfterA, (Math.hypot(P, Q - 25 * (460 / 480) ** 2) * 1000) / (SQ3 * 460), TOL.currentA, "after");
    expectClose(t?.lineCurrentAfterA, 112.52, { abs: 0.01 }, "after (hand: 112.52 A)");
    expect(t?.overloadNote).toMatch(/\(460 V\) falls from 125\.0 A to 112\.5 A.*NFPA 70 460\.9/);
  });

  it("cites the self-excitation limit as motor guidance, not NFPA 70 460.7; conductors per NFPA 70 460.8(A)", () => {
    const reason = plan.loads[0]?.reason ?? "";
    expect(reason).toMatch(/IEEE Std 141/);
    expect(reason).toMatch(/from memory/);
    expect(reason).not.toMatch(/460\.7/);
    expect(reason).toMatch(/NFPA 70 460\.8\(A\)/);
    // hand: I_r = 25 000/(√3·480) = 30.070 A; 135 % = 40.595 A
    expectClose(t?.capacitorRatedCurrentA, 25_000 / (SQ3 * 480), TOL.currentA, "rated current at nameplate");
    expectClose(t?.conductorMinAmpacityA, 40.595, { abs: 0.001 }, "135 % of 30.070 A");
    expect(t?.conductorNote).toMatch(/one third of the motor-circuit conductors.*motorConductorAmpacityA/);
  });

  it("with the motor-circuit conductors' ampacity, the one-third floor governs when larger (NFPA 70 460.8(A))", () => {
    // hand: 175 A / 3 = 58.33 A > 40.595 A; with 95 A conductors 31.67 A < 40.595 A, so 135 % governs
    const big = planPlacement({ loads: [{ ...press, motorConductorAmpacityA: 175 }], targetPF: 0.95, siteRequiredKvar: 100, unitRatedVoltageV: 480 });
    expectClose(big.loads[0]?.terminal?.conductorMinAmpacityA, 175 / 3, TOL.currentA, "one third of 175 A");
    expect(big.loads[0]?.terminal?.conductorNote).toMatch(/175 A motor-circuit conductors = 58\.3 A/);
    const small = planPlacement({
      loads: [{ ...press, motorConductorAmpacityA: 95 }],
      targetPF: 0.95,
      siteRequiredKvar: 100,
      unitRatedVoltageV: 480,
    });
    expectClose(small.loads[0]?.terminal?.conductorMinAmpacityA, 1.35 * (25_000 / (SQ3 * 480)), TOL.currentA, "135 % governs");
  });

  it("unit rated at the motor's voltage (default) delivers its nameplate", () => {
    // hand: at 460 V rating the units deliver their nameplate: 20 ≤ 24.640 < 25 → 20 kvar
    const own = planPlacement({ loads: [press], targetPF: 0.95, siteRequiredKvar: 100 });
    expect([own.loads[0]?.terminal?.perMotorNameplateKvar, own.loads[0]?.terminal?.perMotorKvar]).toEqual([20, 20]);
  });

  it("the no-load-current warning path cites motor guidance too", () => {
    const { noLoadAmps: _n, ...noI0 } = press;
    const p = planPlacement({ loads: [noI0], targetPF: 0.95, siteRequiredKvar: 100 });
    expect(p.loads[0]?.reason).toMatch(/self-excitation limit is unknown \(motor-application guidance: IEEE Std 141/);
  });
});

describe("through the sizing: the reading's volts reach the placement", () => {
  it("a 460 V / 125 A reading on a 480 V bus: limit, unit and currents at 460 V", () => {
    const out = size({
      system: { voltageV: 480, frequencyHz: 60, phases: 3 },
      loads: [
        {
          label: "press",
          kind: "motor",
          starting: "across_the_line",
          noLoadAmps: 40,
          measurement: { method: "v_i_pf", volts: 460, amps: 125, pf: 0.85, sense: "lagging" },
        },
      ],
    });
    if (!out.ok) throw new Error(JSON.stringify(out.issues));
    const t = out.result.placement?.loads[0]?.terminal;
    // as above: the unit is rated at the system voltage (no bankDesign.ratedVoltageV): 25 kvar 480 V → 22.960 kvar
    expect([t?.perMotorNameplateKvar, t?.ratedVoltageV, t?.voltageV]).toEqual([25, 480, 460]);
    expectClose(t?.lineCurrentBeforeA, 125, TOL.currentA, "before");
    expectClose(out.result.loads[0]?.lineCurrentA, 125, TOL.currentA, "load current");
  });

  it("terminal units follow bankDesign.ratedVoltageV when the bank has no reactor: 440 V units on 400 V", () => {
    // hand: 75 kW at 0.8 → 56.25 kvar; need 56.25 − 75·0.328684 = 31.599; I₀ 45 A → Q_max = √3·400·45/1000 = 31.177,
    // 90 % = 28.059 kvar cap; a 440 V unit delivers (400/440)² = 0.826446: 30 → 24.793 ≤ 28.059, 40 → 33.06 > cap
    const out = size({
      system: { voltageV: 400, frequencyHz: 50, phases: 3 },
      bankDesign: { ratedVoltageV: 440 },
      loads: [
        {
          label: "mixer",
          kind: "motor",
          starting: "across_the_line",
          noLoadAmps: 45,
          measurement: { method: "kw_pf", kW: 75, pf: 0.8, sense: "lagging" },
        },
      ],
    });
    if (!out.ok) throw new Error(JSON.stringify(out.issues));
    const t = out.result.placement?.loads[0]?.terminal;
    expect([t?.perMotorNameplateKvar, t?.ratedVoltageV, t?.voltageV]).toEqual([30, 440, 400]);
    expectClose(t?.perMotorKvar, 30 * (400 / 440) ** 2, TOL.power, "delivered");
    expect(out.result.loads[0]?.currentBasis).toBe("system_voltage");
  });
});

describe("single-phase loads on a balanced three-phase bank (issue 11 point 9)", () => {
  const oven: PlacementLoad = { label: "oven", kind: "other", kW: 30, kvar: 30, voltageV: 277, phases: 1 };
  const fan: PlacementLoad = { label: "fan", kind: "other", kW: 40, kvar: 35, voltageV: 480, phases: 3 };
  // hand: oven needs 30 − 30·0.328684 = 20.14 kvar; fan 35 − 13.15 = 21.85 kvar; both central

  it("one warning listing the single-phase loads corrected upstream", () => {
    const plan = planPlacement({ loads: [oven, fan], targetPF: 0.95, siteRequiredKvar: 41.99, systemPhases: 3 });
    const w = plan.warnings.filter((x) => x.code === "single_phase_on_three_phase_bank");
    expect(w.length).toBe(1);
    expect(w[0]?.message).toMatch(/oven \(20\.1 kvar\)/);
    expect(w[0]?.message).not.toMatch(/fan/);
  });

  it("none on a single-phase system, nor when nothing is placed upstream", () => {
    const single = planPlacement({ loads: [oven], targetPF: 0.95, siteRequiredKvar: 20.14, systemPhases: 1 });
    expect(single.warnings.map((x) => x.code)).not.toContain("single_phase_on_three_phase_bank");
    const none = planPlacement({ loads: [oven], targetPF: 0.95, siteRequiredKvar: 0, systemPhases: 3 });
    expect(none.warnings.map((x) => x.code)).not.toContain("single_phase_on_three_phase_bank");
  });
});
