/** The site before and after correction, with the power triangles drawn to scale. */
import { powerTriangleChart } from "../charts/index.js";
import { fmt } from "../format.js";
import type { Block, ReportInput, Section } from "../types.js";

export function siteSection(input: ReportInput): Section {
  const { site, correction: c } = input.result;
  const basis = site.basis === "service_entrance" ? "the service-entrance reading" : "the sum of the load readings";
  const blocks: Block[] = [
    { kind: "paragraph", text: `Site basis: ${basis}. Correction to a target displacement PF of ${fmt.pf(c.targetPF)} at constant kW.` },
    {
      kind: "table",
      header: ["Quantity", "Before", "After", "Unit"],
      align: ["left", "right", "right", "left"],
      rows: [
        ["Real power", fmt.power(site.kW), fmt.power(site.kW), "kW"],
        ["Reactive power", fmt.power(site.kvar), fmt.power(c.kvarAfter), "kvar"],
        ["Apparent power", fmt.power(c.kVABefore), fmt.power(c.kVAAfter), "kVA"],
        ["Displacement PF", `${fmt.pf(site.displacementPF)} ${site.sense}`, `${fmt.pf(c.pfAfter)} ${c.pfAfterSense ?? ""}`.trim(), "-"],
        ["Line current", fmt.amps(c.lineCurrentBeforeA), fmt.amps(c.lineCurrentAfterA), "A"],
      ],
    },
    {
      kind: "keyValues",
      items: [
        { key: "kvar required to the target", value: `${fmt.power(c.kvarRequired)} kvar` },
        { key: "Multiplier (kvar per kW)", value: fmt.num(c.kvarPerKW, 3) },
        { key: "kVA released", value: `${fmt.power(c.kVAReleased)} kVA` },
        { key: "I²R loss reduction in the supply", value: `${fmt.pct(c.lossReductionPct)} %` },
        ...(c.leadingExcessKvar > 0 ? [{ key: "Leading excess to remove", value: `${fmt.power(c.leadingExcessKvar)} kvar` }] : []),
      ],
    },
  ];
  const note = correctionNote(c);
  if (note) blocks.push({ kind: "paragraph", tone: "note", text: note });
  blocks.push({
    kind: "chart",
    chart: powerTriangleChart({
      before: { kW: site.kW, kvar: site.kvar, kVA: c.kVABefore, pf: site.displacementPF },
      after: { kW: site.kW, kvar: c.kvarAfter, kVA: c.kVAAfter, pf: c.pfAfter },
      bankKvar: site.kvar - c.kvarAfter,
    }),
  });
  return { id: "site", heading: "Site before and after correction", blocks };
}

/** The one sentence on what the site needs when it needs no added capacitors; null when it does (the bank says it). */
export function correctionNote(c: ReportInput["result"]["correction"]): string | null {
  if (c.kvarRequired > 0) return null;
  if (c.leadingExcessKvar > 0) {
    return `The site leads beyond the target: take about ${fmt.power(c.leadingExcessKvar)} kvar of capacitors out of service and add none; the PF becomes ${fmt.pf(c.pfAfter)} leading and the demand ${fmt.power(c.kVAAfter)} kVA.`;
  }
  return "The site already meets the target at this load: no capacitors are needed.";
}
