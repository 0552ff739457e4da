import { describe, expect, it } from "vitest";
import { parallelResonanceOrders, screenCombinedStages } from "../../../src/core/harmonics/combined-stages.js";
import { parallelResonanceOrder } from "../../../src/core/harmonics/resonance.js";
import type { SizingInput } from "../../../src/core/inputs.js";
import { size } from "../../../src/core/pipeline/size.js";
import { expectClose, TOL } from "../../helpers/tolerance.js";

describe("parallel resonance of mixed branches", () => {
  it("one plain branch: 200 kvar on 20 000 kVA → √(20 000/200) = 10 (IEEE Std 519 / 1036 practice)", () => {
    expect(parallelResonanceOrders([{ capacitorKvar: 200, reactorFraction: 0 }], 20_000)).toHaveLength(1);
    expectClose(parallelResonanceOrders([{ capacitorKvar: 200, reactorFraction: 0 }], 20_000)[0], 10, TOL.order, "plain");
  });

  it("one detuned branch: 300 kvar, 7 % → √(1/(0.015 + 0.07)) = 3.4300, as the closed form; none above the tuning order", () => {
    const hs = parallelResonanceOrders([{ capacitorKvar: 300, reactorFraction: 0.07 }], 20_000);
    expect(hs).toHaveLength(1);
    expectClose(hs[0], 3.43, TOL.order, "detuned");
    expectClose(hs[0], parallelResonanceOrder(300, 20_000, 0.07), TOL.oracle, "closed form");
  });

  it("200 kvar plain beside 300 kvar at 7 %: 14x² − 1900x + 20 000 = 0 (x = h²) → h = 3.3913 and 11.1451", () => {
    // hand: 200h + 300h/(1 − 0.07h²) = 20 000/h; × h(1 − 0.07h²): 200x − 14x² + 300x = 20 000 − 1400x
    // → 14x² − 1900x + 20 000 = 0 → x = (1900 ∓ √2 490 000)/28 = (1900 ∓ 1577.973)/28 = 11.50096, 124.2133
    const hs = parallelResonanceOrders(
      [
        { capacitorKvar: 200, reactorFraction: 0 },
        { capacitorKvar: 300, reactorFraction: 0.07 },
      ],
      20_000,
    );
    expect(hs).toHaveLength(2);
    expectClose(hs[0], 3.3913, TOL.order, "below tuning");
    expectClose(hs[1], 11.1451, TOL.order, "above tuning: near the 11th");
  });
});

describe("screen of every switchable combination", () => {
  it("two plain 100 kvar installed steps and a 300 kvar 7 % new stage: the 11.15 combination is flagged", () => {
    const unit = (i: number) => ({ label: `wall step ${i}`, capacitorKvar: 100, reactorFraction: 0, effectiveKvar: 100, fixed: false });
    const s = screenCombinedStages(
      [unit(1), unit(2)],
      [{ capacitorKvar: 300, effectiveKvar: 300 / 0.93, reactorFraction: 0.07 }],
      20_000,
      [5, 7, 11, 13],
    );
    // counts of identical plain steps 0, 1, 2 × new stage none or 1, less the empty one: 5 combinations
    expect(s.stagesScreened).toBe(5);
    // one step alone: √(20 000/100) = 14.14, within 10 % of the 13th (11.7–14.3)
    expect(s.hazards.some((h) => h.installed.length === 1 && h.newStage === 0 && h.nearHarmonics.includes(13))).toBe(true);
    const mixed = s.hazards.find((h) => h.installed.length === 2 && h.newStage === 1);
    expect(mixed?.nearHarmonics).toContain(11);
  });
});

describe("inside the sizing", () => {
  it("a detuned design beside a plain installed bank says what to do with the plain one", () => {
    const input: SizingInput = {
      system: { voltageV: 480, frequencyHz: 60, phases: 3 },
      targetPF: 0.95,
      loads: [
        { label: "Kiln fan drive", kind: "drive", measurement: { method: "kw_pf", kW: 250, pf: 0.95, sense: "lagging" } },
        { label: "Mixer motors", kind: "motor", measurement: { method: "kw_pf", kW: 400, pf: 0.72, sense: "lagging" } },
      ],
      transformer: { kVA: 1500, impedancePct: 5.75 },
      bankDesign: { reactorPct: 7, ratedVoltageV: 525 },
      installedBanks: [
        { label: "Old wall bank", location: "service", control: "automatic", ratedVoltageV: 480, steps: [{ kvar: 50 }, { kvar: 50 }] },
      ],
      bankReadings: [{ bank: "Old wall bank", inServiceSteps: [] }],
    };
    const out = size(input);
    expect(out.ok).toBe(true);
    if (!out.ok) return;
    expect(out.result.combinedStages?.[0]?.stagesScreened).toBeGreaterThan(2);
    const w = out.result.warnings.filter((x) => x.code === "plain_bank_beside_detuned");
    expect(w).toHaveLength(1);
    expect(w[0]!.message).toContain("Old wall bank");
  });
});
