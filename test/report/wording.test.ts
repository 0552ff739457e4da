import { describe, expect, it } from "vitest";
import type { SizingInput } from "../../src/core/inputs.js";
import { size } from "../../src/core/pipeline/size.js";
import { noBankText } from "../../src/report/sections/bank.js";

/** Each sentence the report can say about "no bank" is tried against the engine case it is for (invented sites). */
const system = { voltageV: 400, frequencyHz: 50, phases: 3 } as const;
const run = (input: Omit<SizingInput, "system">) => {
  const out = size({ system, ...input });
  if (!out.ok) throw new Error("sizing failed");
  return out.result;
};

describe("no-bank wording is true in each case", () => {
  it("leading site: take capacitors out, never 'needs no capacitors'", () => {
    const r = run({ loads: [{ label: "Old capacitors", kind: "other", measurement: { method: "kw_kvar", kW: 50, kvar: -80 } }] });
    expect(r.recommendedBank).toBeNull();
    expect(noBankText(r)).toMatch(/^No bank is recommended: the site leads, and about 63\.6 kvar/); // 80 − 50·0.328684 (hand)
  });

  it("site within the target: no capacitors needed", () => {
    const r = run({ loads: [{ label: "Offices", kind: "other", measurement: { method: "kw_pf", kW: 50, pf: 0.98, sense: "lagging" } }] });
    expect(r.recommendedBank).toBeNull();
    expect(noBankText(r)).toBe("No bank is recommended: the site needs no capacitors to reach the target at the surveyed load.");
  });

  it("a need below the smallest unit: no central bank, and says why", () => {
    // 20 kW at 0.93: 20·(0.395 − 0.329) = 1.33 kvar (hand), below the 2.5 kvar unit
    const r = run({ loads: [{ label: "Workshop", kind: "other", measurement: { method: "kw_pf", kW: 20, pf: 0.93, sense: "lagging" } }] });
    expect(r.correction.kvarRequired).toBeGreaterThan(0);
    if (r.recommendedBank === null) expect(noBankText(r)).toMatch(/below the smallest standard unit/);
  });
});
