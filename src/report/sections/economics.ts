/** Economics: tariff, savings, installed cost and simple payback, or a sentence saying they were not evaluated. */
import type { EconomicsResult, Tariff } from "../../core/economics/economics-api.js";
import { fmt } from "../format.js";
import type { Block, ReportInput, Section } from "../types.js";

export function tariffText(t: Tariff, currency: string): string {
  switch (t.form) {
    case "kva_demand":
      return `kVA demand charge: ${fmt.money(t.chargePerKVA, currency)} per kVA of the period's peak`;
    case "kw_demand_pf_adjusted":
      return `kW demand charge ${fmt.money(t.chargePerKW, currency)} per kW, raised by base PF / PF below a base PF of ${fmt.pf(t.basePF)} (PF ${t.pfBasis === "at_peak" ? "of the interval with the peak kW" : "averaged over the period"})`;
    case "kvarh_excess":
      return `${fmt.money(t.chargePerKvarh, currency)} per kvarh above ${fmt.num(t.allowanceRatio, 3)} × kWh`;
    case "none":
      return "no reactive-power charge in the tariff";
  }
}

function economicsBlocks(e: EconomicsResult): Block[] {
  const c = e.currency;
  const blocks: Block[] = [
    {
      kind: "keyValues",
      items: [
        { key: "Tariff", value: tariffText(e.tariff, c) },
        { key: "Basis", value: e.basis === "interval_data" ? "interval data" : "survey demand" },
        ...(e.intervalMethod
          ? [
              {
                key: "Interval method",
                value: e.intervalMethod.estimate
                  ? `estimate: ${e.intervalMethod.method.replace(/_/g, " ")}`
                  : e.intervalMethod.method.replace(/_/g, " "),
              },
            ]
          : []),
        { key: "Saving per month", value: fmt.money(e.savingPerMonth, c) },
        { key: "Saving per year", value: fmt.money(e.savingPerYear, c) },
        { key: "Installed cost", value: e.installedCost === null ? "not given" : fmt.money(e.installedCost, c) },
        {
          key: "Simple payback",
          value: e.simplePaybackYears === null ? "n/a (no cost given, or no saving)" : `${fmt.years(e.simplePaybackYears)} years`,
        },
      ],
    },
  ];
  if (e.costBreakdown) {
    blocks.push({
      kind: "keyValues",
      title: "Cost breakdown",
      items: [
        { key: "Per kvar", value: fmt.money(e.costBreakdown.perKvar, c) },
        { key: "Per step", value: fmt.money(e.costBreakdown.perStep, c) },
        { key: "Fixed", value: fmt.money(e.costBreakdown.fixed, c) },
      ],
    });
  }
  if (e.costItems.length > 0) {
    blocks.push({
      kind: "table",
      title: "What is priced",
      header: ["Item", "kvar", "Units", `Capacitors (${c})`, `Reactors (${c})`, `Cost (${c})`],
      align: ["left", "right", "right", "right", "right", "right"],
      rows: e.costItems.map((i) => [
        i.counted ? i.label : `${i.label} (not counted)`,
        fmt.num(i.kvar, 1),
        String(i.units),
        fmt.num(i.capacitorCost, 2),
        i.reactorCost === null ? "not priced" : fmt.num(i.reactorCost, 2),
        fmt.num(i.cost, 2),
      ]),
    });
  }
  if (e.periods.length > 0) {
    blocks.push({
      kind: "table",
      title: "Billing periods",
      header: ["Period", "Billed before", "Billed after", `Tariff saving (${c})`, "Loss saving (kWh)", `Loss saving (${c})`, `Saving (${c})`],
      align: ["left", "right", "right", "right", "right", "right", "right"],
      rows: e.periods.map((p) => [
        p.label,
        `${fmt.num(p.before.billedQuantity, 1)} ${p.before.billedUnit}`,
        `${fmt.num(p.after.billedQuantity, 1)} ${p.after.billedUnit}`,
        fmt.num(p.tariffSaving, 2),
        fmt.num(p.lossSavingKWh, 1),
        fmt.num(p.lossSaving, 2),
        fmt.num(p.saving, 2),
      ]),
    });
  }
  if (e.assumptions.length > 0) blocks.push({ kind: "subheading", text: "Assumptions" }, { kind: "list", items: e.assumptions });
  return blocks;
}

export function economicsSection(input: ReportInput): Section {
  const economics = input.economics ?? input.result.economics;
  const blocks: Block[] = economics
    ? economicsBlocks(economics)
    : [{ kind: "paragraph", text: "Economics not evaluated: no tariff or cost was given for this report." }];
  return { id: "economics", heading: "Economics", blocks };
}
