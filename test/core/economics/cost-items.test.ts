import { describe, expect, it } from "vitest";
import { priceItems } from "../../../src/core/economics/cost-items.js";
import { costItemsOf } from "../../../src/core/economics/of-sizing.js";
import { economics } from "../../../src/core/economics/savings.js";
import type { PlacementPlan } from "../../../src/core/placement/placement-types.js";

// An invented plant: a 175 kvar central bank (fixed 75 + 20/40/40), one line of 3 motors with 10 kvar each at
// their terminals, and a 50 kvar group bank "press-hall"; the study proposes a 7 % detuned bank of 4 steps, 180 kvar.
const bank = {
  effectiveKvar: 175,
  reactorPct: 0,
  physicalSteps: [
    { role: "fixed" as const, effectiveKvar: 75, nameplateKvar: 75 },
    { role: "switched" as const, effectiveKvar: 20, nameplateKvar: 20 },
    { role: "switched" as const, effectiveKvar: 40, nameplateKvar: 40 },
    { role: "switched" as const, effectiveKvar: 40, nameplateKvar: 40 },
  ],
};
const placement = {
  loads: [
    {
      index: 0,
      label: "Mixer line",
      location: "terminal",
      reason: "",
      needKvar: 30,
      terminal: { perMotorKvar: 10, totalKvar: 30, selfExcitationLimitKvar: 12, lineCurrentBeforeA: 0, lineCurrentAfterA: 0, overloadNote: "" },
    },
  ],
  locations: [
    { location: "group:press-hall", kvar: 50, loads: ["Press 1"] },
    { location: "central", kvar: 175, loads: [] },
  ],
} as unknown as PlacementPlan;
const detuned = [
  {
    forBank: "recommended",
    design: { reactorPct: 7, steps: [{ effectiveKvar: 45 }, { effectiveKvar: 45 }, { effectiveKvar: 45 }, { effectiveKvar: 45 }] },
  },
];
const cost = { perKvar: 30, perStep: 400, fixed: 1500 };

describe("what is priced: the bank the answer recommends and the units placed at loads, each a line", () => {
  const items = costItemsOf(bank, placement, detuned);

  it("lists the detuned bank (counted), the plain one (for comparison), the terminal and the group units", () => {
    expect(items.map((i) => [i.item, i.kvar, i.units, i.reactorPct, i.counted])).toEqual([
      ["central_bank", 180, 4, 7, true],
      ["central_bank_plain", 175, 4, 0, false],
      ["motor_terminal", 30, 3, 0, true],
      ["group_bank", 50, 1, 0, true],
    ]);
  });

  it("without a reactor price the reactors are not priced, and the result says so", () => {
    const r = economics({ currency: "EUR", tariff: { form: "none" }, periods: [], periodsPerYear: 12, cost, items, basis: "survey_demand" });
    // hand calculation: detuned 30·180 + 400·4 = 7 000; terminal 30·30 + 400·3 = 2 100; group 30·50 + 400 = 1 900;
    // plain (not counted) 30·175 + 400·4 = 6 850; installed 7 000 + 2 100 + 1 900 + 1 500 fixed = 12 500
    expect(r.costItems.map((i) => i.cost)).toEqual([7_000, 6_850, 2_100, 1_900]);
    expect(r.costItems[0]!.reactorCost).toBeNull();
    expect(r.installedCost).toBe(12_500);
    expect(r.assumptions.join(" ")).toMatch(/reactors are not priced/);
  });

  it("with a reactor price per kvar and per step: 12·180 + 250·4 = 3 160 more", () => {
    const { items: priced, reactorsUnpriced } = priceItems(items, { ...cost, reactorPerKvar: 12, reactorPerStep: 250 });
    expect(reactorsUnpriced).toBe(false);
    expect(priced[0]!.reactorCost).toBe(3_160);
    expect(priced[0]!.cost).toBe(10_160);
    expect(priced[1]!.reactorCost).toBe(0); // the plain bank has no reactors
  });

  it("without a proposal the plain bank alone is the central line", () => {
    expect(costItemsOf(bank, undefined).map((i) => [i.item, i.kvar, i.counted])).toEqual([["central_bank", 175, true]]);
  });
});
