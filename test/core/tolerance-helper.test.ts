import { describe, expect, it } from "vitest";
import { expectClose, isClose, TOL } from "../helpers/tolerance.js";

/** The comparison helper every reference test relies on must itself reject what it should. */
describe("expectClose / isClose", () => {
  it("accepts values within the absolute or relative tolerance", () => {
    expect(isClose(0.6925, 0.692, TOL.kvarPerKW)).toBe(true);
    expect(isClose(1_000_000.5, 1_000_000, TOL.power)).toBe(true); // 0.5 ≤ 1e-6 × 1e6 = 1
    expect(() => expectClose(3.785, 3.78, TOL.order, "h")).not.toThrow();
  });

  it("rejects values outside it, non-finite values and non-numbers", () => {
    expect(isClose(0.6935, 0.692, TOL.kvarPerKW)).toBe(false);
    expect(isClose(1_000_002, 1_000_000, TOL.power)).toBe(false);
    expect(isClose(Number.NaN, 1, { abs: 1 })).toBe(false);
    expect(isClose(Number.POSITIVE_INFINITY, 1, { rel: 1 })).toBe(false);
    expect(() => expectClose(3.8, 3.78, TOL.order, "h")).toThrow(/h: got 3.8, expected 3.78/);
    expect(() => expectClose(null, 0, TOL.power, "kW")).toThrow(/kW: got null/);
    expect(() => expectClose(undefined, 0, TOL.power, "kW")).toThrow(/kW/);
  });
});
