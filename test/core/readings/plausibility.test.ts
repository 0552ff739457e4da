import { describe, expect, it } from "vitest";
import type { LoadInput, SystemInput } from "../../../src/core/inputs.js";
import { checkReadingVolts } from "../../../src/core/readings/plausibility.js";
import { evaluateSite } from "../../../src/core/readings/site-totals.js";
import { size } from "../../../src/core/pipeline/size.js";
import { expectClose, TOL } from "../../helpers/tolerance.js";

const SYS480: SystemInput = { voltageV: 480, frequencyHz: 60, phases: 3 };
const codes = (w: { code: string }[]) => w.map((x) => x.code);

describe("a reading's volts against the system (issue rule: ±10 % warns, beyond 2× or 0.4× is a 400)", () => {
  it.each([
    // 480Y/277 V: 480/√3 = 277.1 V line-to-neutral (hand calculation)
    { v: 480, ph: 3, code: null, note: "line-to-line, as expected" },
    { v: 460, ph: 3, code: null, note: "460/480 = 0.958: within 10 %" },
    { v: 528, ph: 3, code: null, note: "528 = 1.10 × 480: the edge of the band" },
    { v: 277, ph: 3, code: "reading_line_to_neutral", note: "a 3φ load read line-to-neutral" },
    { v: 277, ph: 1, code: null, note: "a 1φ load on 480Y/277 is read line-to-neutral" },
    { v: 400, ph: 3, code: "reading_voltage_mismatch", note: "400/480 = 0.833: −16.7 %" },
    { v: 208, ph: 3, code: "reading_voltage_mismatch", note: "208/480 = 0.433: not near 277 (−24.9 %) nor 480" },
  ] as const)("$v V, $ph-phase load on 480 V: $note", ({ v, ph, code }) => {
    const out = checkReadingVolts(v, ph, SYS480, ["loads", 0, "measurement"]);
    expect(out.issues).toEqual([]);
    expect(codes(out.warnings)).toEqual(code === null ? [] : [code]);
    if (code !== null) expect(out.warnings[0]?.path).toBe("loads.0.measurement.volts");
  });

  it("the mismatch warning names both voltages; the line-to-neutral one gives the hint", () => {
    expect(checkReadingVolts(400, 3, SYS480, ["loads", 2, "measurement"]).warnings[0]?.message).toMatch(/400 V.*480 V.*-16\.7 %/);
    const ln = checkReadingVolts(277, 3, SYS480, ["loads", 0, "measurement"]).warnings[0]?.message ?? "";
    expect(ln).toMatch(/277 V line-to-neutral/);
    expect(ln).toMatch(/line-to-line volts.*phases: 1/);
  });

  it.each([
    // 4160 V system: 480/4160 = 0.115 < 0.4; 120/480 = 0.25 < 0.4; 1000/480 = 2.08 > 2 (hand calculation)
    { v: 480, sys: { voltageV: 4160, frequencyHz: 60, phases: 3 } as SystemInput, why: "a 480 V reading on a 4160 V system" },
    { v: 120, sys: SYS480, why: "120 V on 480 V" },
    { v: 1000, sys: SYS480, why: "1000 V on 480 V" },
  ])("$why is rejected naming the volts field", ({ v, sys }) => {
    const out = checkReadingVolts(v, 3, sys, ["loads", 4, "measurement"]);
    expect(out.issues.map((i) => i.path.join("."))).toEqual(["loads.4.measurement.volts"]);
    expect(out.issues[0]?.message).toMatch(new RegExp(`${v} V .*${sys.voltageV} V line voltage`));
  });

  it("accepts 0.4× and 2× exactly (the bounds are exclusive), and half the voltage of a single-phase system", () => {
    // 192 = 0.4·480, 960 = 2·480; 120 V on a 120/240 V single-phase three-wire service is hot-to-neutral
    expect(checkReadingVolts(192, 3, SYS480, ["x"]).issues).toEqual([]);
    expect(checkReadingVolts(960, 3, SYS480, ["x"]).issues).toEqual([]);
    expect(checkReadingVolts(120, 1, { voltageV: 240, frequencyHz: 60, phases: 1 }, ["x"]).warnings).toEqual([]);
  });
});

describe("the load's current from the reading (issue 11 point 3)", () => {
  it("a motor read at 460 V / 125 A on a 480 V bus is 125 A, worked at 460 V", () => {
    // hand: kVA = √3·460·125/1000 = 99.593 kVA; at 480 V it would be 99 593/(√3·480) = 119.79 A (the old figure)
    const out = evaluateSite(SYS480, [
      { label: "M", kind: "motor", measurement: { method: "v_i_pf", volts: 460, amps: 125, pf: 0.85, sense: "lagging" } },
    ]);
    expectClose(out.loads[0]?.lineCurrentA, 125, TOL.currentA, "motor current");
    expect(out.loads[0]?.currentVoltageV).toBe(460);
    expect(out.loads[0]?.currentBasis).toBe("reading");
    expect(codes(out.warnings)).toEqual([]);
  });

  it("a 277 V single-phase reading on 480Y/277 is 40 A, not 23 A", () => {
    // hand: 277·40 = 11.08 kVA; over 480 V it would read 11 080/480 = 23.08 A
    const out = evaluateSite(SYS480, [{ label: "heater", phases: 1, measurement: { method: "v_i_kw", volts: 277, amps: 40, kW: 10 } }]);
    expectClose(out.loads[0]?.lineCurrentA, 40, TOL.currentA, "1φ current");
    expectClose(out.loads[0]?.kVA, 11.08, TOL.power, "1φ kVA");
  });

  it("a reading without volts uses the system voltage and says so", () => {
    // hand: 90 kW at 0.9 → 100 kVA; 100 000/(√3·480) = 120.28 A
    const out = evaluateSite(SYS480, [{ label: "F", measurement: { method: "kw_pf", kW: 90, pf: 0.9, sense: "lagging" } }]);
    expectClose(out.loads[0]?.lineCurrentA, 100_000 / (Math.sqrt(3) * 480), TOL.currentA, "current at 480 V");
    expect([out.loads[0]?.currentVoltageV, out.loads[0]?.currentBasis]).toEqual([480, "system_voltage"]);
  });

  it("quantity multiplies the current read: 3 × 20 A at 470 V = 60 A", () => {
    const out = evaluateSite(SYS480, [
      { label: "pumps", quantity: 3, measurement: { method: "v_i_pf", volts: 470, amps: 20, pf: 0.8, sense: "lagging" } },
    ]);
    expectClose(out.loads[0]?.lineCurrentA, 60, TOL.currentA, "3 pumps");
  });
});

describe("plausibility in the sizing", () => {
  const motor = (over: Partial<LoadInput> = {}): LoadInput => ({
    label: "press",
    kind: "motor",
    measurement: { method: "kw_pf", kW: 60, pf: 0.8, sense: "lagging" },
    ...over,
  });

  it("a 277 V reading of a three-phase load on 480 V warns reading_line_to_neutral", () => {
    const out = size({ system: SYS480, loads: [motor({ measurement: { method: "v_i_pf", volts: 277, amps: 100, pf: 0.8, sense: "lagging" } })] });
    expect(out.ok && codes(out.result.warnings)).toContain("reading_line_to_neutral");
  });

  it("a 480 V reading on a 4160 V system is rejected at loads.0.measurement.volts", () => {
    const out = size({
      system: { voltageV: 4160, frequencyHz: 60, phases: 3 },
      loads: [motor({ measurement: { method: "v_i_pf", volts: 480, amps: 100, pf: 0.8, sense: "lagging" } })],
    });
    expect(out.ok).toBe(false);
    if (!out.ok) expect(out.issues.map((i) => i.path.join("."))).toEqual(["loads.0.measurement.volts"]);
  });

  it("the service entrance and the light-load reading are checked too", () => {
    const main = size({
      system: SYS480,
      loads: [motor()],
      serviceEntrance: { measurement: { method: "v_i_pf", volts: 100, amps: 900, pf: 0.8, sense: "lagging" } },
    });
    expect(!main.ok && main.issues.map((i) => i.path.join("."))).toEqual(["serviceEntrance.measurement.volts"]);
    const light = size({
      system: SYS480,
      loads: [motor()],
      lightLoad: { measurement: { method: "v_i_pf", volts: 2400, amps: 10, pf: 0.8, sense: "lagging" } },
    });
    expect(!light.ok && light.issues.map((i) => i.path.join("."))).toEqual(["lightLoad.measurement.volts"]);
  });

  it("a 5000 kW load on a 500 kVA transformer warns once for the load and once for the site", () => {
    // hand: 5000 kW at 0.8 → 6250 kVA > 500 kVA; the site (sum of loads) 6250 + 75 kVA > 500 kVA
    const out = size({
      system: SYS480,
      transformer: { kVA: 500, impedancePct: 5.75 },
      loads: [motor({ label: "huge", measurement: { method: "kw_pf", kW: 5000, pf: 0.8, sense: "lagging" } }), motor()],
    });
    if (!out.ok) throw new Error("expected a result");
    const w = out.result.warnings.filter((x) => x.code === "load_above_transformer" || x.code === "site_above_transformer");
    expect(codes(w)).toEqual(["load_above_transformer", "site_above_transformer"]);
    expect(w[0]?.message).toMatch(/500 kVA transformer \(huge 6250\.0 kVA\)/);
    expect(w[0]?.message).not.toMatch(/press/);
    expect(w[1]?.message).toMatch(/6325\.0 kVA.*500 kVA/);
  });

  it("loads within the transformer give no such warning", () => {
    const out = size({ system: SYS480, transformer: { kVA: 500, impedancePct: 5.75 }, loads: [motor()] });
    expect(out.ok && codes(out.result.warnings).filter((c) => c.endsWith("_above_transformer"))).toEqual([]);
  });
});
