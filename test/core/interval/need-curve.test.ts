import { describe, expect, it } from "vitest";
import { coveredSharePct, neededKvarCurve } from "../../../src/core/interval/need-curve.js";
import { expectClose, TOL } from "../../helpers/tolerance.js";

// Three load points (invented): 80 intervals at 100 kW / 80 kvar, 15 at 200 kW / 150 kvar, 5 at 300 kW / 60 kvar.
// Needs at PF 0.95 (tan φ = 0.328684, hand): 80 − 32.868 = 47.132; 150 − 65.737 = 84.263; 60 − 98.605 < 0 → 0.
const points = { kW: [100, 200, 300], kvar: [80, 150, 60], count: [80, 15, 5] };

describe("needed-kvar duration curve", () => {
  it("is the weighted nearest-rank need at each exceedance (hand-worked)", () => {
    const c = neededKvarCurve(points, 0.95);
    const at = (e: number) => c.neededKvar[c.exceedancePct.indexOf(e)] as number;
    // the worst 15 % of intervals need 84.263 kvar; from 16 % to 95 % 47.132; the last 5 % need nothing
    expectClose(at(0), 150 - 200 * 0.328684, TOL.powerQuoted, "e = 0");
    expectClose(at(15), 150 - 200 * 0.328684, TOL.powerQuoted, "e = 15");
    expectClose(at(16), 80 - 100 * 0.328684, TOL.powerQuoted, "e = 16");
    expectClose(at(95), 80 - 100 * 0.328684, TOL.powerQuoted, "e = 95");
    expect(at(96)).toBe(0);
    expect(at(100)).toBe(0);
    // never rising from left to right
    c.neededKvar.forEach((v, i) => i > 0 && expect(v).toBeLessThanOrEqual(c.neededKvar[i - 1] as number));
  });

  it("coverage: 60 kvar covers the 80 + 5 intervals needing 47.1 or 0 kvar = 85 %", () => {
    expect(coveredSharePct(points, 0.95, 60)).toBeCloseTo(85, 12);
    expect(coveredSharePct(points, 0.95, 90)).toBeCloseTo(100, 12);
    expect(coveredSharePct(points, 0.95, 0)).toBeCloseTo(5, 12);
  });
});
