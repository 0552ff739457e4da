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
        ["Displacement PF", fmt.pf(site.displacementPF), fmt.pf(c.pfAfter), "-"],
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
  if (c.kvarRequired <= 0) blocks.push({ kind: "paragraph", tone: "note", text: "The site already meets the target: no capacitors are needed at this load." });
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
