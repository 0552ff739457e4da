import { describe, expect, it } from "vitest";
import { checkIeee519, ieee519VoltageLimits } from "../../../src/core/harmonics/harmonics-api.js";

describe("IEEE 519 voltage limits", () => {
  it.each([
    // IEEE Std 519-2014 Table 1 (boundary values of each class)
    [480, 5.0, 8.0],
    [1000, 5.0, 8.0],
    [1001, 3.0, 5.0],
    [13_800, 3.0, 5.0],
    [69_000, 3.0, 5.0],
    [69_001, 1.5, 2.5],
    [161_000, 1.5, 2.5],
    [161_001, 1.0, 1.5],
  ])("%d V → %d %% individual, %d %% THD", (v, ind, thd) => {
    const l = ieee519VoltageLimits(v);
    expect(l.individualPct).toBe(ind);
    expect(l.thdPct).toBe(thd);
  });

  it("reports pass/fail with margins", () => {
    // hand calculation at 480 V: THD 6.0 vs 8.0 → margin +2.0, pass; worst 5.5 vs 5.0 → margin −0.5, fail
    const c = checkIeee519({ lines: [], thdVPct: 6.0, worstIndividual: { order: 5, pct: 5.5 } }, 480);
    expect(c.thd.pass).toBe(true);
    expect(c.thd.marginPct).toBeCloseTo(2.0, 12);
    expect(c.individual.pass).toBe(false);
    expect(c.individual.marginPct).toBeCloseTo(-0.5, 12);
    expect(c.individual.order).toBe(5);
    expect(c.pass).toBe(false);
  });
});
