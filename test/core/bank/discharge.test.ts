import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  DISCHARGE_K,
  dischargeDesign,
  dischargeRequirements,
  maxDischargeResistanceOhm,
  type DischargeConnection,
} from "../../../src/core/bank/discharge.js";
import { expectClose } from "../../helpers/tolerance.js";
import { DTOL } from "./tolerances.js";
import { timeToResidual, type Element } from "./rc-network.js";

describe("discharge requirement by voltage class", () => {
  // source per row: NFPA 70 460.6(A) and IEC 60831-1 (≤ 1000 V); above 1000 V NFPA 70 460.28(A) and IEC 60871-1, from memory
  it.each([
    { v: 480, nfpa: [60, 50], iec: [180, 75], src: "NFPA 70 460.6(A); IEC 60831-1" },
    { v: 1000, nfpa: [60, 50], iec: [180, 75], src: "NFPA 70 460.6(A) applies up to and including 1000 V" },
    { v: 4160, nfpa: [300, 50], iec: [600, 75], src: "NFPA 70 460.28(A), IEC 60871-1 (from memory)" },
  ])("$v V → $src", ({ v, nfpa, iec }) => {
    const r = dischargeRequirements(v);
    expect(r.map((x) => [x.timeS, x.residualV])).toEqual([nfpa, iec]);
    if (v > 1000) expect(r.every((x) => x.basis.includes("from memory"))).toBe(true);
  });

  it("keeps only the standards asked for", () => {
    expect(dischargeRequirements(400, ["iec"]).map((r) => r.citation)).toEqual(["IEC 60831-1"]);
  });
});

describe("largest discharge resistor R ≤ t/(k·C·ln(√2·U_N/U_R))", () => {
  it("25 kvar, 400 V, 50 Hz delta, resistor across each capacitor (k = 1)", () => {
    // hand calculation: C = 25000/3/(2π·50·400²) = 8333.33/50 265 482 = 165.786 µF per delta capacitor
    // NFPA: ln(√2·400/50) = ln 11.3137 = 2.426015; R = 60/(165.786e-6·2.426015) = 149 179.4 Ω
    // IEC:  ln(√2·400/75) = ln 7.54247 = 2.020550; R = 180/(165.786e-6·2.020550) = 537 346.0 Ω
    // P = 400²/149 179.4 = 1.07253 W per resistor, 3.21760 W for three; time to 10 %: R·C·ln(14.1421) = 65.519 s
    const { discharge: d, warnings } = dischargeDesign(25, 400, 50, 3);
    expect(warnings).toEqual([]);
    expectClose(d.capacitanceF, 165.78639905405764e-6, DTOL.farad, "C");
    expectClose(d.requirements[0]?.maxResistanceOhm, 149179.3966681408, DTOL.resistanceOhm, "R NFPA");
    expectClose(d.requirements[1]?.maxResistanceOhm, 537345.9742466395, DTOL.resistanceOhm, "R IEC");
    expect(d.governingCitation).toBe("NFPA 70 460.6(A)");
    expectClose(d.maxResistanceOhm, 149179.3966681408, DTOL.resistanceOhm, "R governing");
    expectClose(d.dissipationPerResistorW, 1.0725341674087228, DTOL.powerW, "P per resistor");
    expectClose(d.dissipationTotalW, 3.2176025022261685, DTOL.powerW, "P total");
    expectClose(d.timeTo10PctS, 65.51876734092622, DTOL.timeS, "t to 10 %");
    expect(d.resistorCount).toBe(3);
  });

  it("the same step with resistors in star across the delta (k = 3): R a third, resistors at V/√3", () => {
    // hand calculation: R = 60/(3·165.786e-6·2.426015) = 49 726.47 Ω; P = (400/√3)²/49 726.47 = 53 333.3/49 726.47 = 1.07253 W
    const { discharge: d } = dischargeDesign(25, 400, 50, 3, { resistorConnection: "star_across_delta" });
    expectClose(d.maxResistanceOhm, 49726.465556046925, DTOL.resistanceOhm, "R");
    expectClose(d.resistorVoltageV, 400 / Math.sqrt(3), { rel: 1e-12 }, "U across resistor");
    expectClose(d.dissipationPerResistorW, 1.0725341674087232, DTOL.powerW, "P");
  });

  it("two resistors in V across the delta (k = 3): two resistors at the line voltage", () => {
    // hand calculation: R = 49 726.47 Ω as above; P = 400²/49 726.47 = 3.21760 W each, 6.43521 W for two
    const { discharge: d } = dischargeDesign(25, 400, 50, 3, { resistorConnection: "two_across_delta" });
    expect(d.resistorCount).toBe(2);
    expectClose(d.dissipationPerResistorW, 3.217602502226169, DTOL.powerW, "P");
    expectClose(d.dissipationTotalW, 2 * 3.217602502226169, DTOL.powerW, "P total");
  });

  it("50 kvar, 480 V, 60 Hz wye bank with resistors in delta between the lines (k = 1/3)", () => {
    // hand calculation: U_N = 480/√3 = 277.128 V; C = 50000/3/(2π·60·277.128²) = 575.647 µF
    // R = 60/((1/3)·575.647e-6·ln(√2·277.128/50)) = 60/(1.91882e-4·2.059098) = 151 863.5 Ω; P = 480²/151 863.5 = 1.51715 W
    const { discharge: d } = dischargeDesign(50, 480, 60, 3, { capacitorConnection: "wye", resistorConnection: "delta_across_wye" });
    expectClose(d.elementVoltageV, 277.1281292110204, { rel: 1e-12 }, "U_N");
    expectClose(d.capacitanceF, 575.6472189377001e-6, DTOL.farad, "C");
    expectClose(d.maxResistanceOhm, 151863.46512375187, DTOL.resistanceOhm, "R");
    expectClose(d.dissipationPerResistorW, 1.5171522644518192, DTOL.powerW, "P");
  });

  it("single phase 10 kvar 240 V 60 Hz", () => {
    // hand calculation: C = 10000/(2π·60·240²) = 460.518 µF; R = 60/(460.518e-6·ln(√2·240/50)) = 60/(460.518e-6·1.915193) = 68 028.8 Ω
    const { discharge: d } = dischargeDesign(10, 240, 60, 1);
    expect(d.capacitorConnection).toBe("single_phase");
    expect(d.resistorCount).toBe(1);
    expectClose(d.maxResistanceOhm, 68028.845172898, DTOL.resistanceOhm, "R");
  });

  it("4160 V, 300 kvar delta: over 1000 V the 5 min / 50 V rule governs", () => {
    // hand calculation: C = 300000/3/(2π·60·4160²) = 15.3279 µF; NFPA 460.28 (from memory): R = 300/(15.3279e-6·ln(117.66)) = 4.10506 MΩ
    // IEC 60871-1 (from memory): R = 600/(15.3279e-6·ln(78.44)) = 8.97321 MΩ
    const { discharge: d } = dischargeDesign(300, 4160, 60, 3);
    expectClose(d.maxResistanceOhm, 4105056.1150304405, DTOL.resistanceOhm, "R");
    expectClose(d.requirements[1]?.maxResistanceOhm, 8973212.300910119, DTOL.resistanceOhm, "R IEC");
  });

  it("no resistance limit when the peak voltage is already below the residual", () => {
    // hand calculation: √2·30 = 42.4 V < 50 V
    expect(maxDischargeResistanceOhm(60, 1, 1e-4, 30, 50)).toBe(Number.POSITIVE_INFINITY);
  });

  it("a resistor connection that does not fit the bank falls back to across each capacitor, with a warning", () => {
    const { discharge: d, warnings } = dischargeDesign(25, 400, 50, 3, { capacitorConnection: "wye", resistorConnection: "star_across_delta" });
    expect(d.resistorConnection).toBe("across_each_capacitor");
    expect(warnings.map((w) => w.code)).toEqual(["discharge_connection_invalid"]);
  });
});

/** Circuits of each connection: nodes 0–2 the lines (3 the capacitor or resistor star point). */
function circuit(conn: DischargeConnection, cF: number, rOhm: number): { nodes: number; caps: Element[]; res: Element[]; wye: boolean } {
  const delta: Element[] = [
    { a: 0, b: 1, value: cF },
    { a: 1, b: 2, value: cF },
    { a: 2, b: 0, value: cF },
  ];
  const wye: Element[] = [
    { a: 0, b: 3, value: cF },
    { a: 1, b: 3, value: cF },
    { a: 2, b: 3, value: cF },
  ];
  const onEdges = (edges: [number, number][]) => edges.map(([a, b]) => ({ a, b, value: rOhm }));
  switch (conn) {
    case "across_each_capacitor":
      return {
        nodes: 3,
        caps: delta,
        res: onEdges([
          [0, 1],
          [1, 2],
          [2, 0],
        ]),
        wye: false,
      };
    case "star_across_delta":
      return {
        nodes: 4,
        caps: delta,
        res: onEdges([
          [0, 3],
          [1, 3],
          [2, 3],
        ]),
        wye: false,
      };
    case "two_across_delta":
      return {
        nodes: 3,
        caps: delta,
        res: onEdges([
          [0, 1],
          [1, 2],
        ]),
        wye: false,
      };
    case "delta_across_wye":
      return {
        nodes: 4,
        caps: wye,
        res: onEdges([
          [0, 1],
          [1, 2],
          [2, 0],
        ]),
        wye: true,
      };
  }
}

describe("the factor k against an RK4 simulation of the disconnected bank (independent oracle)", () => {
  const cases: { conn: DischargeConnection; worst: number[] }[] = [
    { conn: "across_each_capacitor", worst: [1, 0, 0.5] },
    { conn: "star_across_delta", worst: [1, 0, 0.5, 0] },
    // slow mode of the V connection: element voltages ab, bc, ca = 1, 1, −2 (node voltages 2, 1, 0)
    { conn: "two_across_delta", worst: [2, 1, 0] },
    { conn: "delta_across_wye", worst: [1, -0.5, -0.5, 0] },
  ];
  const uN = 400;
  const peak = Math.SQRT2 * uN;
  const scaleTo = (v: number[], caps: Element[]) => {
    const m = Math.max(...caps.map((c) => Math.abs((v[c.a] ?? 0) - (v[c.b] ?? 0))));
    return v.map((x) => (x * peak) / m);
  };

  it.each(cases)("$conn: the governing resistor reaches 50 V in 60 s from the worst trapped charge", ({ conn, worst }) => {
    const cF = 100e-6;
    const k = DISCHARGE_K[conn];
    const r = maxDischargeResistanceOhm(60, k, cF, uN, 50);
    const c = circuit(conn, cF, r);
    const t = timeToResidual(c.nodes, c.caps, c.res, scaleTo(worst, c.caps), 50, 60 / 20000, 600);
    expectClose(t, 60, DTOL.oracleTimeS, `${conn} time to 50 V`);
  });

  it.each(cases)("$conn: from any trapped charge it is down to 50 V within 60 s", ({ conn }) => {
    const cF = 100e-6;
    const r = maxDischargeResistanceOhm(60, DISCHARGE_K[conn], cF, uN, 50);
    const c = circuit(conn, cF, r);
    fc.assert(
      fc.property(
        fc.tuple(
          fc.double({ min: -1, max: 1, noNaN: true }),
          fc.double({ min: -1, max: 1, noNaN: true }),
          fc.double({ min: -1, max: 1, noNaN: true }),
        ),
        ([x, y, z]) => {
          // wye: element voltages summing to zero (no charge on the floating star point); delta: any node voltages
          const v = c.wye ? [x, y, -(x + y), 0] : [x, y, z, 0].slice(0, c.nodes);
          fc.pre(Math.max(...c.caps.map((e) => Math.abs((v[e.a] ?? 0) - (v[e.b] ?? 0)))) > 1e-3);
          const t = timeToResidual(c.nodes, c.caps, c.res, scaleTo(v, c.caps), 50, 60 / 4000, 600);
          return t <= 60 * (1 + DTOL.oracleTimeS.rel);
        },
      ),
      { numRuns: 25, seed: 20240601 },
    );
  });
});
