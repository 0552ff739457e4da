import { Complex } from "complex.js";
import { describe, expect, it } from "vitest";
import { capacitiveReactanceOhm, inductiveReactanceOhm } from "../../src/core/bank/capacitor.js";
import { correctionFor } from "../../src/core/correction/to-target.js";
import { triangleOf } from "../../src/core/readings/triangle.js";
import { evaluateSite } from "../../src/core/readings/site-totals.js";
import { size } from "../../src/core/pipeline/size.js";
import { expectClose, TOL } from "../helpers/tolerance.js";

/**
 * The sign convention (src/core/conventions.ts): kvar > 0 lagging, < 0 leading; a capacitor supplies kvar.
 * Physics first, with complex.js as the independent calculator: V = 1∠0 across Z = −jX_C (capacitor) or
 * +jX_L (inductor); I = V/Z; complex power S = V·I* (P + jQ).
 */
const deg = (rad: number) => (rad * 180) / Math.PI;

describe("phasor physics (complex.js, textbook circuit theory)", () => {
  const V = new Complex(230, 0); // 230 V reference phasor at 0°
  const f = 50;
  const xC = 1 / (2 * Math.PI * f * 100e-6); // hand calculation: 1/(2π·50·100 µF) = 31.831 Ω
  const xL = 2 * Math.PI * f * 0.1; // hand calculation: 2π·50·0.1 H = 31.416 Ω

  it("current in a capacitor leads the voltage by 90°, and the capacitor supplies reactive power (Q < 0)", () => {
    const I = V.div(new Complex(0, -xC));
    expectClose(deg(I.arg()), 90, TOL.angleDeg, "capacitor current angle, degrees (textbook: leads by 90°)");
    const S = V.mul(I.conjugate());
    expect(S.im).toBeLessThan(0);
    // hand calculation: Q = −V²/X_C = −230²/31.831 = −1661.9 var
    expectClose(S.im, -(230 * 230) / xC, TOL.power, "capacitor Q, var");
  });

  it("current in an inductor lags the voltage by 90°, and the inductor consumes reactive power (Q > 0)", () => {
    const I = V.div(new Complex(0, xL));
    expectClose(deg(I.arg()), -90, TOL.angleDeg, "inductor current angle, degrees (textbook: lags by 90°)");
    const S = V.mul(I.conjugate());
    expect(S.im).toBeGreaterThan(0);
    expectClose(S.im, (230 * 230) / xL, TOL.power, "inductor Q, var");
  });

  it("the engine's reactance helpers give the same X_C and X_L", () => {
    expectClose(capacitiveReactanceOhm(100e-6, 50), 31.830988618, TOL.ohm, "X_C of 100 µF at 50 Hz (hand: 1/(2π·50·1e-4))");
    expectClose(inductiveReactanceOhm(0.1, 50), 31.415926536, TOL.ohm, "X_L of 0.1 H at 50 Hz (hand: 2π·50·0.1)");
  });
});

describe("the engine follows the same convention", () => {
  it("a kw_kvar reading with negative kvar is leading, positive is lagging", () => {
    const lead = triangleOf({ method: "kw_kvar", kW: 100, kvar: -30 }, 3, ["m"]);
    expect(lead.triangle?.sense).toBe("leading");
    expectClose(lead.triangle?.kvar, -30, TOL.power, "leading kvar keeps its sign");
    const lag = triangleOf({ method: "kw_kvar", kW: 100, kvar: 30 }, 3, ["m"]);
    expect(lag.triangle?.sense).toBe("lagging");
    expectClose(lag.triangle?.kvar, 30, TOL.power, "lagging kvar keeps its sign");
    const unity = triangleOf({ method: "kw_kvar", kW: 100, kvar: 0 }, 3, ["m"]);
    expect(unity.triangle?.sense).toBe("unity");
  });

  it("a leading kw_pf reading gets negative kvar", () => {
    const t = triangleOf({ method: "kw_pf", kW: 80, pf: 0.8, sense: "leading" }, 3, ["m"]).triangle;
    // hand calculation: Q = −P·tan(acos 0.8) = −80·0.75 = −60 kvar
    expectClose(t?.kvar, -60, TOL.power, "kvar of 80 kW at 0.8 leading");
  });

  it("a capacitor (leading load) subtracts from a lagging load in the site sum, as the phasors add", () => {
    const site = evaluateSite({ voltageV: 400, frequencyHz: 50, phases: 3 }, [
      { label: "motor", measurement: { method: "kw_kvar", kW: 100, kvar: 75 } },
      { label: "existing capacitor", measurement: { method: "kw_kvar", kW: 0.5, kvar: -40 } },
    ]).site;
    // phasor sum with complex.js: (100 + j75) + (0.5 − j40) = 100.5 + j35
    const S = new Complex(100, 75).add(new Complex(0.5, -40));
    expectClose(site?.kvar, S.im, TOL.power, "site kvar = 75 − 40 = 35");
    expectClose(site?.kW, S.re, TOL.power, "site kW = 100.5");
    expect(site?.sense).toBe("lagging");
  });

  it("the capacitor kvar to add is subtracted from a lagging site's kvar", () => {
    // site 100 kW at 0.80 lagging: Q = 75 kvar (hand: 100·0.6/0.8)
    const site = { kW: 100, kvar: 75, kVA: 125, displacementPF: 0.8, sense: "lagging" as const };
    const { correction } = correctionFor(site, 0.95, 480, 3);
    // hand calculation: required = 75 − 100·tan(acos 0.95) = 75 − 32.868 = 42.132; after = 75 − 42.132 = 32.868
    expectClose(correction.kvarRequired, 75 - (100 * Math.sqrt(1 - 0.95 ** 2)) / 0.95, TOL.power, "kvar required");
    expectClose(correction.kvarAfter, site.kvar - correction.kvarRequired, TOL.power, "kvar after = site − bank");
    expect(correction.kvarRequired).toBeGreaterThan(0);
  });

  it("a proposed bank delivering more kvar than a lagging site has is flagged as making it lead", () => {
    const out = size({
      system: { voltageV: 480, frequencyHz: 60, phases: 3 },
      loads: [{ label: "m", measurement: { method: "kw_kvar", kW: 100, kvar: 50 } }],
      proposedBank: { ratedVoltageV: 480, steps: [{ kvar: 60 }] },
    });
    expect(out.ok).toBe(true);
    if (!out.ok) return;
    // 60 kvar supplied > 50 kvar consumed: the site would end at −10 kvar, leading
    expect(out.result.warnings.map((w) => w.code)).toContain("proposed_bank_leads");
  });
});
