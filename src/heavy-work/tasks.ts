/**
 * The work that may take long enough to stall other requests, as plain functions of structured-cloneable data:
 * the pool (./pool.ts) runs them on a worker thread (./worker.ts), or inline when no threads are configured.
 * No fastify, no store: the route reads and validates, the task computes.
 */
import { Piscina } from "piscina";
import type { SizingInput } from "../core/inputs.js";
import type { SizingOptions, SizingOutcome } from "../core/pipeline/size.js";
import type { InputIssue } from "../core/warnings.js";
import type { ReportInput } from "../report/types.js";
import type { IntervalAnalysisTask, IntervalResult } from "./interval-task.js";

// Each task loads its modules on first use: a thread that only analyses interval data never loads the PDF
// renderer and its fonts, and the event loop's thread (which needs none of them when threads run the work) neither.
const engine = () => import("../core/pipeline/size.js");
const interval = () => import("./interval-task.js");

export interface ReportTask {
  input: ReportInput;
  format: "html" | "pdf";
  paper: "A4" | "LETTER";
}

/** A PDF crosses the thread boundary as bytes (a Buffer arrives as a plain Uint8Array). */
export type ReportOutput = { html: string } | { pdf: Uint8Array };

async function renderReport(p: ReportTask): Promise<ReportOutput> {
  const { buildReportModel } = await import("../report/model.js");
  const model = buildReportModel(p.input);
  if (p.format === "html") return { html: (await import("../report/html.js")).renderReportHtml(model) };
  return { pdf: await (await import("../report/pdf.js")).renderReportPdf(model, { size: p.paper }) };
}

/** The scan's answer: the sizing's headline parts and the study with its series. */
function scanAnswer(outcome: Extract<SizingOutcome, { ok: true }>) {
  const r = outcome.result;
  return {
    engineVersion: r.engineVersion,
    system: r.system,
    site: r.site,
    correction: r.correction,
    resonance: r.resonance,
    recommendedBank: r.recommendedBank,
    ...(r.proposedBank ? { proposedBank: r.proposedBank } : {}),
    study: outcome.study,
    warnings: r.warnings,
    cautions: r.cautions,
  };
}

export const HEAVY_TASKS = {
  /**
   * POST /v1/harmonics/scan: the sizing with its dense |Z(h)| series, answered as UTF-8 JSON bytes. Serialising
   * megabytes of series is itself long work, and bytes cross the thread boundary moved, not copied.
   */
  harmonicScan: async (p: { input: SizingInput; options: SizingOptions }): Promise<Uint8Array | { issues: InputIssue[] }> => {
    const outcome = (await engine()).size(p.input, p.options);
    if (!outcome.ok) return { issues: outcome.issues };
    const json = new TextEncoder().encode(JSON.stringify(scanAnswer(outcome)));
    return Piscina.isWorkerThread ? (Piscina.move(json) as Uint8Array) : json;
  },
  /** Report model and its rendering (the model computes scan series when none are supplied). */
  report: (p: ReportTask): Promise<ReportOutput> => renderReport(p),
  /** A sizing and its report in one task: POST /v1/sizing/report (the engine's issues come back for a 400). */
  sizingReport: async (p: {
    inputs: SizingInput;
    format: "html" | "pdf";
    paper: "A4" | "LETTER";
  }): Promise<ReportOutput | { issues: InputIssue[] }> => {
    const outcome = (await engine()).size(p.inputs);
    if (!outcome.ok) return { issues: outcome.issues };
    return renderReport({ input: { inputs: p.inputs, result: outcome.result }, format: p.format, paper: p.paper });
  },
  /** Analysis of a parsed interval series: statistics, the controller simulation and the answer. */
  intervalAnalysis: async (p: IntervalAnalysisTask): Promise<IntervalResult> => (await interval()).intervalResult(p),
};

export type HeavyTaskName = keyof typeof HEAVY_TASKS;
export type HeavyPayload<K extends HeavyTaskName> = Parameters<(typeof HEAVY_TASKS)[K]>[0];
export type HeavyResult<K extends HeavyTaskName> = Awaited<ReturnType<(typeof HEAVY_TASKS)[K]>>;

/** What the worker receives: the task's name and its payload. */
export interface HeavyEnvelope<K extends HeavyTaskName = HeavyTaskName> {
  name: K;
  payload: HeavyPayload<K>;
}

export function runHeavyTask<K extends HeavyTaskName>(e: HeavyEnvelope<K>): Promise<HeavyResult<K>> {
  const task = HEAVY_TASKS[e.name] as (p: HeavyPayload<K>) => HeavyResult<K> | Promise<HeavyResult<K>>;
  return Promise.resolve(task(e.payload));
}
