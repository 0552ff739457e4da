import type { Knobs } from "./http.js";

/** One line of the summary table. */
export interface SummaryRow {
  section: string;
  metric: string;
  value: string;
  goal?: string;
  pass?: boolean;
  detail?: string;
}

export interface SectionResult {
  rows: SummaryRow[];
  notes?: string[];
}

/** A benchmark section: bench/run.ts runs each in turn and prints one summary table. */
export interface BenchSection {
  name: string;
  run(knobs: Knobs): Promise<SectionResult>;
}
