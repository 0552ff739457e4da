/** Readings per load: what was measured and the power triangle computed from it. */
import type { Measurement, SizingInput } from "../../core/inputs.js";
import type { LoadResult } from "../../core/readings/site-totals.js";
import { fmt } from "../format.js";
import type { Align, Block, ReportInput, Section } from "../types.js";

const METHOD_NAMES: Record<Measurement["method"], string> = {
  kw_kva: "kW and kVA",
  kw_kvar: "kW and kvar",
  kw_pf: "kW and PF",
  v_i_kw: "V, I and kW",
  v_i_pf: "V, I and PF",
};

/** The fields the electrician read, in the meter's own terms. */
export function measuredText(m: Measurement): string {
  const parts: string[] = [];
  switch (m.method) {
    case "kw_kva":
      parts.push(`${fmt.power(m.kW)} kW`, `${fmt.power(m.kVA)} kVA`);
      if (m.sense) parts.push(m.sense);
      break;
    case "kw_kvar":
      parts.push(`${fmt.power(m.kW)} kW`, `${fmt.power(m.kvar)} kvar`);
      break;
    case "kw_pf":
      parts.push(`${fmt.power(m.kW)} kW`, `PF ${fmt.pf(m.pf)} ${m.sense}`);
      break;
    case "v_i_kw":
      parts.push(`${fmt.volts(m.volts)} V`, `${fmt.amps(m.amps)} A`, `${fmt.power(m.kW)} kW`);
      if (m.sense) parts.push(m.sense);
      break;
    case "v_i_pf":
      parts.push(`${fmt.volts(m.volts)} V`, `${fmt.amps(m.amps)} A`, `PF ${fmt.pf(m.pf)} ${m.sense}`);
      break;
  }
  if (m.pfType === "true") parts.push(`true PF${m.currentTHDPct !== undefined ? `, THD_i ${fmt.pct(m.currentTHDPct)} %` : ""}`);
  return parts.join(", ");
}

const HEADER = ["Load", "Kind", "Qty", "Method", "Measured", "kW", "kvar", "kVA", "PF", "Sense", "Line current (A)"];
const ALIGN: Align[] = ["left", "left", "right", "left", "left", "right", "right", "right", "right", "left", "right"];

function row(load: LoadResult, m: Measurement | undefined): string[] {
  return [
    load.label,
    load.kind ?? "other",
    String(load.quantity),
    METHOD_NAMES[load.method],
    m ? measuredText(m) : "not recorded",
    fmt.power(load.kW),
    fmt.power(load.kvar),
    fmt.power(load.kVA),
    fmt.pf(load.displacementPF),
    load.sense,
    fmt.amps(load.lineCurrentA),
  ];
}

export function readingsSection(input: ReportInput): Section {
  const { result } = input;
  const loads: SizingInput["loads"] = input.inputs.loads;
  const blocks: Block[] = [];
  if (result.loads.length === 0) {
    blocks.push({ kind: "paragraph", text: "No load readings were recorded." });
  } else {
    blocks.push({
      kind: "table",
      header: HEADER,
      align: ALIGN,
      rows: result.loads.map((l, i) => row(l, loads[i]?.measurement)),
      note: "kW, kvar and kVA are for all units of an entry (quantity × one unit); kvar > 0 is lagging. PF is the displacement PF of the fundamental; line current at the volts read, or at the system voltage for a reading without volts.",
    });
    const s = result.site.sumOfLoads;
    blocks.push({
      kind: "keyValues",
      items: [
        {
          key: "Sum of the loads",
          value: `${fmt.power(s.kW)} kW, ${fmt.power(s.kvar)} kvar, ${fmt.power(s.kVA)} kVA, PF ${fmt.pf(s.displacementPF)}`,
        },
      ],
    });
  }
  const se = input.inputs.serviceEntrance;
  if (se) {
    const u = result.site.unmetered;
    blocks.push({
      kind: "keyValues",
      title: "Service entrance reading",
      items: [
        { key: se.label ?? "Main", value: measuredText(se.measurement) },
        ...(u ? [{ key: "Unmetered (main less loads)", value: `${fmt.power(u.kW)} kW, ${fmt.power(u.kvar)} kvar` }] : []),
      ],
    });
  }
  return { id: "readings", heading: "Readings and power triangle per load", blocks };
}
