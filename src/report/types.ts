/** The report model: renderer-neutral sections of formatted strings and chart geometry. */
import type { BankDesign } from "../core/bank/bank-design.js";
import type { PlacementPlan } from "../core/placement/placement-types.js";
import type { EconomicsResult } from "../core/economics/economics-api.js";
import type { SizingInput } from "../core/inputs.js";
import type { IntervalSummary } from "../core/interval/interval-api.js";
import type { SizingResult } from "../core/pipeline/size.js";
import type { Chart } from "./charts/geometry.js";
import type { HealthSeries } from "../application/bank-health.js";

export type Align = "left" | "right";

export type Block =
  | { kind: "paragraph"; text: string; tone?: "normal" | "note" | "alert" }
  | { kind: "subheading"; text: string }
  | { kind: "keyValues"; title?: string; items: { key: string; value: string }[] }
  | { kind: "table"; title?: string; header: string[]; rows: string[][]; align?: Align[]; note?: string }
  | { kind: "list"; items: string[] }
  | { kind: "callout"; title: string; text: string; reference?: string }
  | { kind: "chart"; chart: Chart };

export interface Section {
  id: string;
  heading: string;
  blocks: Block[];
}

export interface ReportModel {
  title: string;
  /** One line under the title: building and survey, or "sizing request". */
  subtitle: string;
  /** Short facts of the title block (site, survey, engine version). */
  facts: { key: string; value: string }[];
  /** Page 1 after the title block: the recommendation a manager signs; then the contents list, then `sections`. */
  verdict: Section;
  sections: Section[];
}

export interface BuildingInfo {
  name: string;
  address?: string | null;
  notes?: string | null;
  system?: SizingInput["system"];
  transformer?: SizingInput["transformer"] | null;
  utility?: SizingInput["utility"] | null;
  buildingVersion?: number;
}

export interface SurveyInfo {
  id: string;
  revision: number;
  surveyedAt: string;
  surveyor: string;
  notes?: string;
  engineVersion: string;
  createdAt: string;
  reason?: string | null;
}

/** |Z(h)| series of one bank, one entry per stage (as POST /v1/harmonics/scan returns them). */
export interface ScanSeriesInput {
  bank: string;
  stages: { stageNumber: number; orders: number[]; impedanceOhm: number[] }[];
}

export interface ReportInput {
  title?: string;
  building?: BuildingInfo;
  survey?: SurveyInfo;
  /** The sizing request the result was computed from (loads with their measurements). */
  inputs: SizingInput;
  result: SizingResult;
  economics?: EconomicsResult;
  design?: BankDesign;
  placement?: PlacementPlan;
  interval?: IntervalSummary;
  /** Supplied scan series; when absent they are computed from the result's network figures. */
  scanSeries?: ScanSeriesInput[];
  /** The building's installed banks across its surveys (GET /v1/buildings/{id}/bank-health), for the capacitance chart. */
  bankHistory?: HealthSeries[];
}
