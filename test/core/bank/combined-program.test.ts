import { describe, expect, it } from "vitest";
import { plantWithInstalledAutomaticBank } from "../../helpers/sites.js";
import { combinedProgram } from "../../../src/core/bank/combined-program.js";
import { size } from "../../../src/core/pipeline/size.js";

describe("installed and new steps under one controller", () => {
  it("holds a constant need the pair covers in every sample (hand-worked)", () => {
    // 400 kW / 300 kvar each sample, target 0.95: need 300 − 400·0.328684 = 168.53 kvar (hand). Installed 2 × 50
    // automatic + new 50 fixed + 2 × 25 switched = 200 kvar ≥ 168.53, and 200 − 168.53 = 31.5 kvar over the target is
    // inside the leading room of 400·tan(acos 0.98) = 81.2 kvar: every sample met.
    const samples = { kW: new Float64Array(24).fill(400), kvar: new Float64Array(24).fill(300) };
    const c = combinedProgram(samples, 0.95, [50, 50], 0, 50, [25, 25], 0.5);
    expect(c?.steps).toEqual([
      { source: "installed", kvar: 50 },
      { source: "installed", kvar: 50 },
      { source: "new", kvar: 25 },
      { source: "new", kvar: 25 },
    ]);
    expect(c?.metShare).toBe(1);
    // a pair too small: 50 fixed + 25 = 75 kvar leaves 93.5 kvar, above 131.47 + threshold? no: 300 − 75 = 225 > 131.5 + 16.3
    const small = combinedProgram(samples, 0.95, [25], 0, 50, [], 0);
    expect(small?.metShare).toBe(0);
    expect(combinedProgram(samples, 0.95, [], 0, 50, [25], 0)).toBeNull();
  });

  it("a new bank beside an installed 5 × 50 kvar automatic bank reports the combined program, installed steps first", () => {
    const input = plantWithInstalledAutomaticBank();
    const out = size(input);
    if (!out.ok) throw new Error(JSON.stringify(out.issues));
    const rec = out.result.recommendedBank;
    const c = rec?.combinedProgram;
    expect(c).toBeDefined();
    expect(c?.steps.slice(0, 5).every((s) => s.source === "installed" && Math.abs(s.kvar - 50) < 1e-9)).toBe(true);
    expect(c?.steps.filter((s) => s.source === "new").length).toBe(rec?.physicalSteps.filter((s) => s.role !== "fixed").length);
    expect(c?.metShare).toBeGreaterThanOrEqual(0);
    expect(c?.metShare).toBeLessThanOrEqual(1);
  });
});
