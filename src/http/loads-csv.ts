import type { Measurement } from "../core/inputs.js";
import type { RevisionRecord } from "../store/types.js";
import { toCsv, type CsvValue } from "./csv.js";

/** One row per load of a stored revision: what was measured, then what the engine computed then. Text cells are defused by csvField. */

export const LOADS_CSV_HEADER = [
  "load",
  "label",
  "kind",
  "quantity",
  "phases",
  "method",
  "measured kW (kW)",
  "measured kVA (kVA)",
  "measured kvar (kvar)",
  "measured PF",
  "measured sense",
  "voltage (V)",
  "current (A)",
  "PF type",
  "current THD (%)",
  "kW (kW)",
  "kvar (kvar)",
  "kVA (kVA)",
  "displacement PF",
  "sense",
  "line current (A)",
] as const;

const round = (x: number, digits: number) => Number(x.toFixed(digits));

function measuredCells(m: Measurement): CsvValue[] {
  const f = m as Partial<Record<"kW" | "kVA" | "kvar" | "pf" | "volts" | "amps", number>> & { sense?: string };
  return [m.method, f.kW, f.kVA, f.kvar, f.pf, f.sense, f.volts, f.amps, m.pfType, m.currentTHDPct];
}

export function loadsCsv(r: RevisionRecord): string {
  const rows: CsvValue[][] = [[...LOADS_CSV_HEADER]];
  r.inputs.loads.forEach((load, i) => {
    const c = r.result.loads[i];
    rows.push([
      i + 1,
      load.label, // free text: csvField defuses formulas
      c?.kind ?? load.kind,
      c?.quantity ?? load.quantity ?? 1,
      c?.phases ?? load.phases,
      ...measuredCells(load.measurement),
      c && round(c.kW, 3),
      c && round(c.kvar, 3),
      c && round(c.kVA, 3),
      c && round(c.displacementPF, 4),
      c?.sense,
      c && round(c.lineCurrentA, 2),
    ]);
  });
  return toCsv(rows);
}
