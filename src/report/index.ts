/** Reports of a sizing: the renderer-neutral model, its HTML and its PDF. */
import type { SizingInput } from "../core/inputs.js";
import type { SizingResult } from "../core/pipeline/size.js";
import { renderReportHtml } from "./html.js";
import { buildReportModel } from "./model.js";
import type { ReportInput, ReportModel } from "./types.js";

export { buildReportModel, SECTION_ORDER } from "./model.js";
export { renderReportHtml, escapeHtml } from "./html.js";
export { renderReportPdf, renderReportPdfWithStats, type PdfOptions, type PdfStats } from "./pdf.js";
export { reportCautions, REQUIRED_CAUTIONS } from "./sections/cautions.js";
export { fmt } from "./format.js";
export { surveyReportInput } from "./survey-input.js";
export type * from "./types.js";

export type ReportExtras = Omit<ReportInput, "result" | "inputs">;

/** The model and its HTML for a result and the request it came from: what a route needs. */
export function reportForSizing(result: SizingResult, inputs: SizingInput, extras: ReportExtras = {}): { model: ReportModel; html: string } {
  const model = buildReportModel({ ...extras, result, inputs });
  return { model, html: renderReportHtml(model) };
}
