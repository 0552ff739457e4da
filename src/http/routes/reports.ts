/**
 * Report routes: a stored survey's report as HTML or PDF, and the report of a sizing request.
 * Thin: read or size, then src/report builds the model and renders it.
 */
import type { FastifyInstance, FastifyReply } from "fastify";
import * as contracts from "../contracts/surveys.js";
import * as sizingContracts from "../contracts/sizing.js";
import { z } from "zod";
import { size } from "../../core/pipeline/size.js";
import { notFound, ProblemError } from "../problem.js";
import { sizingRequestSchema } from "../schemas/sizing.js";
import { engineIssuesTo400, parseOr400 } from "../validate.js";
import type { Store } from "../../store/store.js";
import type { RevisionRecord } from "../../store/types.js";
import { renderReportHtml } from "../../report/html.js";
import { buildReportModel } from "../../report/model.js";
import { renderReportPdf } from "../../report/pdf.js";
import { surveyReportInput } from "../../report/survey-input.js";
import type { ReportInput } from "../../report/types.js";
import { bankHealthSeries } from "../../application/bank-health.js";
import { surveyResultsRepo } from "../../store/bank-health-repo.js";

const idParams = z.object({ id: z.string() });
const paper = z.enum(["a4", "letter"], { error: "paper must be a4 or letter" }).optional();
const surveyQuery = z.strictObject({
  revision: z.string().regex(/^[1-9]\d{0,8}$/, "revision must be a revision number: a whole number from 1").optional(),
  paper,
});
const sizingQuery = z.strictObject({ format: z.enum(["html", "pdf"], { error: "format must be html or pdf" }).optional(), paper });

/** The document may not load anything (it is self-contained), nor be framed by another page, nor post or rebase links. */
const REPORT_CSP = "default-src 'none'; style-src 'unsafe-inline'; img-src data:; frame-ancestors 'none'; base-uri 'none'; form-action 'none'";

function revisionOf(store: Store, orgId: string, id: string, n?: string): RevisionRecord {
  if (n !== undefined) {
    const r = store.surveys.revision(orgId, id, Number(n));
    if (!r) throw new ProblemError(notFound(store.surveys.head(orgId, id) ? `revision ${n} of survey ${id}` : `survey ${id}`));
    return r;
  }
  const head = store.surveys.head(orgId, id);
  const latest = head && store.surveys.revision(orgId, id, head.revision);
  if (!latest) throw new ProblemError(notFound(`survey ${id}`));
  return latest;
}

/** The revision, its building's data at the snapshot, and the interval analysis the snapshot names (its duration curve). */
function reportInputOf(store: Store, orgId: string, r: RevisionRecord, health?: ReturnType<typeof surveyResultsRepo>): ReportInput {
  const current = store.buildings.get(orgId, r.buildingId);
  const atSnapshot = current && store.buildings.history(orgId, r.buildingId).find((v) => v.version === r.building.buildingVersion)?.data;
  const analysisId = r.building.intervalAnalysisId;
  const interval = analysisId ? store.intervalAnalyses.get(orgId, analysisId)?.summary : undefined;
  return { ...surveyReportInput(r, atSnapshot ?? current), ...(interval ? { interval } : {}), ...(health ? bankHistoryOf(health, orgId, r) : {}) };
}

/** The building's installed-bank series up to this survey (this revision in place of its latest), for the capacitance chart. */
function bankHistoryOf(health: ReturnType<typeof surveyResultsRepo>, orgId: string, r: RevisionRecord): Pick<ReportInput, "bankHistory"> {
  if (!r.result.installedBanks) return {};
  const rows = health.withInstalledBanks(orgId, r.buildingId, 1000);
  const upTo = rows.findIndex((x) => x.surveyId === r.surveyId);
  const used = (upTo >= 0 ? rows.slice(0, upTo + 1) : rows).map((x) => (x.surveyId === r.surveyId ? { ...x, result: r.result, building: r.building } : x));
  const bankHistory = bankHealthSeries(used.map((x) => ({ surveyId: x.surveyId, surveyedAt: x.surveyedAt, definitions: x.building.installedBanks ?? [], results: x.result.installedBanks ?? [] })));
  return { bankHistory };
}

function sendHtml(reply: FastifyReply, html: string): FastifyReply {
  return reply.type("text/html; charset=utf-8").header("content-security-policy", REPORT_CSP).header("x-content-type-options", "nosniff").send(html);
}

function sendPdf(reply: FastifyReply, pdf: Buffer, filename: string): FastifyReply {
  return reply.type("application/pdf").header("content-disposition", `attachment; filename="${filename}"`).send(pdf);
}

const sizeOf = (p: "a4" | "letter" | undefined) => (p === "letter" ? "LETTER" : "A4");

export async function reportRoutes(app: FastifyInstance, opts: { store: Store }): Promise<void> {
  const { store } = opts;
  const health = surveyResultsRepo(store.db);

  app.get("/v1/surveys/:id/report", { schema: contracts.surveyReport }, async (request, reply) => {
    const { id } = parseOr400(idParams, request.params);
    const q = parseOr400(surveyQuery, request.query);
    const r = revisionOf(store, request.actor.orgId, id, q.revision);
    return sendHtml(reply, renderReportHtml(buildReportModel(reportInputOf(store, request.actor.orgId, r, health))));
  });

  app.get("/v1/surveys/:id/report.pdf", { schema: contracts.surveyReportPdf }, async (request, reply) => {
    const { id } = parseOr400(idParams, request.params);
    const q = parseOr400(surveyQuery, request.query);
    const r = revisionOf(store, request.actor.orgId, id, q.revision);
    const pdf = await renderReportPdf(buildReportModel(reportInputOf(store, request.actor.orgId, r, health)), { size: sizeOf(q.paper) });
    return sendPdf(reply, pdf, `${r.surveyId}-r${r.n}-report.pdf`);
  });

  app.post("/v1/sizing/report", { schema: sizingContracts.sizingReport }, async (request, reply) => {
    const q = parseOr400(sizingQuery, request.query);
    const inputs = parseOr400(sizingRequestSchema, request.body);
    const outcome = size(inputs);
    if (!outcome.ok) throw engineIssuesTo400(outcome.issues);
    const model = buildReportModel({ inputs, result: outcome.result });
    if (q.format === "pdf") return sendPdf(reply, await renderReportPdf(model, { size: sizeOf(q.paper) }), "sizing-report.pdf");
    return sendHtml(reply, renderReportHtml(model));
  });
}
