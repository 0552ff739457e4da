import { describe, expect, it } from "vitest";
import type { SizingInput } from "../../src/core/inputs.js";
import { size } from "../../src/core/pipeline/size.js";
import { buildReportModel } from "../../src/report/model.js";
import { verdictOf } from "../../src/report/sections/verdict.js";

/** Page 1 read against the result it summarises, on three invented sites. */
const run = (input: SizingInput) => {
  const out = size(input);
  if (!out.ok) throw new Error(JSON.stringify(out.issues));
  return out.result;
};
const f1 = (x: number) => x.toLocaleString("en-US", { minimumFractionDigits: 1, maximumFractionDigits: 1 });

const plain: SizingInput = {
  system: { voltageV: 400, frequencyHz: 50, phases: 3 },
  targetPF: 0.95,
  scope: "whole_site",
  loads: [
    { label: "Kiln fans", kind: "motor", measurement: { method: "kw_pf", kW: 120, pf: 0.78, sense: "lagging" } },
    { label: "Workshop", kind: "other", measurement: { method: "kw_pf", kW: 60, pf: 0.85, sense: "lagging" } },
  ],
  lightLoad: { measurement: { method: "kw_pf", kW: 40, pf: 0.8, sense: "lagging" } },
  transformer: { kVA: 800, impedancePct: 5 },
  economics: { currency: "EUR", tariff: { form: "kva_demand", chargePerKVA: 6 }, cost: { perKvar: 30, perStep: 150, fixed: 900 } },
} as SizingInput;

const drives: SizingInput = {
  system: { voltageV: 480, frequencyHz: 60, phases: 3 },
  targetPF: 0.95,
  loads: [
    { label: "Extruder drives", kind: "drive", quantity: 4, measurement: { method: "kw_pf", kW: 90, pf: 0.95, sense: "lagging" } },
    { label: "Chillers", kind: "motor", measurement: { method: "kw_pf", kW: 300, pf: 0.76, sense: "lagging" } },
  ],
  transformer: { kVA: 1000, impedancePct: 5.75 },
} as SizingInput;

describe("page 1 verdict", () => {
  it("plain site: the bank total, PF and kVA after, cost, saving and payback are the result's", () => {
    const r = run(plain);
    const v = verdictOf(r);
    const rec = r.recommendedBank!;
    expect(v.install[0]).toContain(`of ${f1(rec.fixedKvar + rec.switchedKvar)} kvar`);
    expect(v.install[0]).toContain("plain (no reactors)");
    expect(v.after).toBe(
      `PF ${r.correction.pfAfter.toFixed(3)} lagging and ${f1(r.correction.kVAAfter)} kVA, from PF ${r.site.displacementPF.toFixed(3)} lagging, ${f1(r.correction.kVABefore)} kVA (${f1(r.correction.kVAReleased)} kVA released).`,
    );
    const e = r.economics!;
    const money = (x: number) => x.toLocaleString("en-US", { minimumFractionDigits: 2, maximumFractionDigits: 2 });
    expect(v.money?.cost).toBe(`${money(e.installedCost!)} EUR`);
    expect(v.money?.savingPerYear).toBe(`${money(e.savingPerYear)} EUR a year`);
    expect(v.money?.payback).toContain(`${e.simplePaybackYears!.toFixed(1)} years`);
  });

  it("drive-heavy site: the detuned design the study proposes is what page 1 says to install", () => {
    const r = run(drives);
    const v = verdictOf(r);
    const proposal = r.harmonics?.proposals.find((p) => p.forBank === "recommended");
    if (proposal) {
      expect(v.install[0]).toContain(`detuned with ${proposal.design.reactorPct.toFixed(2)} % reactors`);
      expect(v.risks.join(" ")).toMatch(/detuned design/);
    } else {
      expect(v.install[0]).not.toMatch(/detuned/);
    }
    expect(v.risks.length).toBeLessThanOrEqual(2);
  });

  it("leading site: nothing to install, the excess to take out, the PF after leading", () => {
    const r = run({
      system: { voltageV: 400, frequencyHz: 50, phases: 3 },
      loads: [{ label: "Old bank", kind: "other", measurement: { method: "kw_kvar", kW: 50, kvar: -80 } }],
    });
    const v = verdictOf(r);
    expect(v.install).toEqual([]);
    expect(v.instead).toMatch(/site leads, and about 63\.6 kvar/);
    expect(v.after).toMatch(/^PF 0\.950 leading/);
    expect(v.risks[0]).toMatch(/Leading operation/);
  });

  it("the model carries the verdict apart from the numbered detail", () => {
    const r = run(plain);
    const m = buildReportModel({ inputs: plain, result: r });
    expect(m.verdict.id).toBe("verdict");
    expect(m.sections.map((s) => s.id)).not.toContain("verdict");
  });
});
