import { describe, expect, it } from "vitest";
import type { SizingInput } from "../../../src/core/inputs.js";
import { size } from "../../../src/core/pipeline/size.js";
import { expectClose, TOL } from "../../helpers/tolerance.js";

const system = { voltageV: 480, frequencyHz: 60, phases: 3 } as const;
const motor = {
  label: "Chiller pump",
  kind: "motor" as const,
  measurement: { method: "kw_pf" as const, kW: 40, pf: 0.8, sense: "lagging" as const },
};

/** A year of hourly intervals of a whole site: 600 kW / 450 kvar by day (12 h), 200 kW / 120 kvar by night (invented). */
function siteIntervals(): SizingInput["intervalDemand"] {
  const kW: number[] = [];
  const kvar: number[] = [];
  for (let h = 0; h < 8760; h++) {
    const day = h % 24 >= 7 && h % 24 < 19;
    kW.push(day ? 600 : 200);
    kvar.push(day ? 450 : 120);
  }
  return { kW, kvar, intervalMinutes: 60 };
}

function ok(input: SizingInput) {
  const out = size(input);
  if (!out.ok) throw new Error(JSON.stringify(out.issues));
  return out.result;
}

describe("survey scope", () => {
  it("one 40 kW motor with the building's interval data: partial by default, sized for what was read", () => {
    const r = ok({ system, targetPF: 0.95, loads: [motor], intervalDemand: siteIntervals() });
    expect(r.scope.scope).toBe("partial");
    expect(r.scope.defaulted).toBe(true);
    // hand: 40 kW at 0.80 → 30 kvar; allowed at 0.95: 40·0.328684 = 13.147 → 16.853 kvar needed
    expectClose(r.correction.kvarRequired, 30 - 40 * 0.328684, TOL.powerQuoted, "kvar required");
    // the bank rests on the readings, not on the whole site's 450 kvar days
    expect(r.recommendedBank?.stepPlan.source).not.toBe("intervals");
    const total = (r.recommendedBank?.fixedKvar ?? 0) + (r.recommendedBank?.switchedKvar ?? 0);
    expect(total).toBeLessThanOrEqual(r.correction.kvarRequired + 5); // never the 225-kvar whole-site bank
    const w = r.warnings.find((x) => x.code === "partial_survey");
    expect(w?.message).toMatch(/rest of the site was not read/);
    expect(w?.message).toMatch(/interval data .* was not used/);
  });

  it("a whole-site survey designs from the interval data", () => {
    const r = ok({
      system,
      targetPF: 0.95,
      scope: "whole_site",
      loads: [motor],
      serviceEntrance: { measurement: { method: "kw_kvar", kW: 580, kvar: 430 } },
      intervalDemand: siteIntervals(),
    });
    expect(r.scope).toMatchObject({ scope: "whole_site", defaulted: false });
    expect(r.recommendedBank?.stepPlan.source).toBe("intervals");
    expect(r.warnings.map((w) => w.code)).not.toContain("partial_survey");
    expect(r.warnings.map((w) => w.code)).not.toContain("survey_outside_interval_range");
  });

  it("a service-entrance reading defaults the scope to whole_site", () => {
    const r = ok({ system, loads: [motor], serviceEntrance: { measurement: { method: "kw_kvar", kW: 100, kvar: 80 } } });
    expect(r.scope).toMatchObject({ scope: "whole_site", defaulted: true });
  });

  it.each([
    // the interval data spans 200–600 kW and 120–450 kvar; ±10 % margins: 180 kW, 660 kW, 108 kvar, 495 kvar (hand)
    { kW: 700, kvar: 300, flagged: /700\.0 kW is more than 10 % above the interval data's maximum of 600\.0 kW/ },
    { kW: 400, kvar: 90, flagged: /90\.0 kvar is more than 10 % below the interval data's 1st percentile of 120\.0 kvar/ },
    { kW: 170, kvar: 500, flagged: /170\.0 kW .* and its 500\.0 kvar/ },
    { kW: 650, kvar: 480, flagged: null }, // within 10 % of the maximum on both
  ])("whole-site readings of $kW kW / $kvar kvar against the interval range", ({ kW, kvar, flagged }) => {
    const r = ok({
      system,
      scope: "whole_site",
      loads: [motor],
      serviceEntrance: { measurement: { method: "kw_kvar", kW, kvar } },
      intervalDemand: siteIntervals(),
    });
    const w = r.warnings.find((x) => x.code === "survey_outside_interval_range");
    if (flagged === null) expect(w).toBeUndefined();
    else expect(w?.message).toMatch(flagged);
  });
});

describe("a leading site tells one story", () => {
  // A small office whose old fixed capacitor (285 kvar) outweighs its lagging load (invented).
  const input: SizingInput = {
    system,
    targetPF: 0.95,
    loads: [
      { label: "Air handlers", kind: "motor", measurement: { method: "kw_kvar", kW: 250, kvar: 150 } },
      { label: "Old fixed capacitor", kind: "other", measurement: { method: "kw_kvar", kW: 0.5, kvar: -285 } },
    ],
  };

  it("removes the excess, gives the PF and kVA after, and places nothing", () => {
    const r = ok(input);
    // hand: site 250.5 kW, −135 kvar (leading); allowed at 0.95: 250.5·0.328684 = 82.335 kvar → excess 52.665 kvar
    expect(r.correction.action).toBe("remove");
    expectClose(r.correction.leadingExcessKvar, 135 - 250.5 * 0.328684, TOL.powerQuoted, "excess to take out");
    expectClose(r.correction.pfAfter, 0.95, TOL.pf, "PF after");
    expect(r.correction.pfAfterSense).toBe("leading");
    // kVA before √(250.5² + 135²) = 284.56; after √(250.5² + 82.335²) = 263.68 (hand)
    expectClose(r.correction.kVABefore, 284.56, TOL.powerQuoted2, "kVA before");
    expectClose(r.correction.kVAAfter, 263.68, TOL.powerQuoted2, "kVA after");
    expect(r.recommendedBank).toBeNull();
    const cap = r.placement?.loads.find((l) => l.label === "Old fixed capacitor");
    expect(cap?.reason).toBe("leading: adds no need, offsets 285.0 kvar of the site's lagging demand");
    expect(r.placement?.balanceNote).not.toMatch(/central bank/);
    expect(r.placement?.totalKvar).toBe(0);
  });
});

describe("the report's correction sentence", () => {
  it("is true for each action the engine can give", async () => {
    const { correctionNote } = await import("../../../src/report/sections/site.js");
    const lagging = ok({ system, loads: [motor] });
    expect(lagging.correction.action).toBe("add");
    expect(correctionNote(lagging.correction)).toBeNull();
    const within = ok({ system, loads: [{ ...motor, measurement: { method: "kw_pf", kW: 40, pf: 0.97, sense: "lagging" } }] });
    expect(within.correction.action).toBe("none");
    expect(correctionNote(within.correction)).toBe("The site already meets the target at this load: no capacitors are needed.");
    const leading = ok({ system, loads: [{ ...motor, measurement: { method: "kw_kvar", kW: 100, kvar: -60 } }] });
    expect(leading.correction.action).toBe("remove");
    const note = correctionNote(leading.correction) ?? "";
    // hand: excess 60 − 32.868 = 27.1 kvar; after: PF 0.950 leading, √(100² + 32.868²) = 105.3 kVA
    expect(note).toMatch(/take about 27\.1 kvar of capacitors out of service and add none/);
    expect(note).toMatch(/PF becomes 0\.950 leading and the demand 105\.3 kVA/);
    expect(note).not.toMatch(/no capacitors are needed/);
  });
});

describe("a leading site's saving", () => {
  it("is the kVA the excess's removal releases, on a kVA tariff (hand-worked)", () => {
    const r = ok({
      system: { voltageV: 400, frequencyHz: 50, phases: 3 },
      loads: [{ label: "Old bank", kind: "other", measurement: { method: "kw_kvar", kW: 200, kvar: -150 } }],
      economics: { currency: "EUR", tariff: { form: "kva_demand", chargePerKVA: 8 } },
    });
    // hand: before √(200² + 150²) = 250 kVA; after PF 0.95 leading: 200/0.95 = 210.526 kVA;
    // 39.474 kVA × 8 EUR × 12 months = 3789.47 EUR a year, with nothing bought
    expect(r.correction.action).toBe("remove");
    expectClose(r.economics?.savingPerYear ?? 0, (250 - 200 / 0.95) * 8 * 12, TOL.powerQuoted2, "saving a year");
    expect(r.economics?.assumptions.join(" ")).toMatch(/taken out of service: no purchase/);
  });
});
