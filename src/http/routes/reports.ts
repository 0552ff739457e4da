/**
 * Report routes: a stored survey's report as HTML or PDF, and the report of a sizing request.
 * Thin: read or size, then src/report builds the model and renders it.
 */
import type { FastifyInstance, FastifyReply } from "fastify";
import { z } from "zod";
import { size } from "../../core/pipeline/size.js";
import { sizingRequestSchema } from "../schemas/sizing.js";
import { engineIssuesTo400, parseOr400 } from "../validate.js";
import type { Store } from "../../store/ports.js";
import { renderReportHtml } from "../../report/html.js";
import { buildReportModel } from "../../report/model.js";
import { renderReportPdf } from "../../report/pdf.js";
import { surveyReportData } from "../../application/survey-reads.js";

const idParams = z.object({ id: z.string() });
const paper = z.enum(["a4", "letter"], { error: "paper must be a4 or letter" }).optional();
const surveyQuery = z.strictObject({
  revision: z.string().regex(/^[1-9]\d{0,8}$/, "revision must be a revision number: a whole number from 1").optional(),
  paper,
});
const sizingQuery = z.strictObject({ format: z.enum(["html", "pdf"], { error: "format must be html or pdf" }).optional(), paper });

/** The document may not load anything (it is self-contained), nor be framed by another page, nor post or rebase links. */
const REPORT_CSP = "default-src 'none'; style-src 'unsafe-inline'; img-src data:; frame-ancestors 'none'; base-uri 'none'; form-action 'none'";

function sendHtml(reply: FastifyReply, html: string): FastifyReply {
  return reply.type("text/html; charset=utf-8").header("content-security-policy", REPORT_CSP).header("x-content-type-options", "nosniff").send(html);
}

function sendPdf(reply: FastifyReply, pdf: Buffer, filename: string): FastifyReply {
  return reply.type("application/pdf").header("content-disposition", `attachment; filename="${filename}"`).send(pdf);
}

const sizeOf = (p: "a4" | "letter" | undefined) => (p === "letter" ? "LETTER" : "A4");

export async function reportRoutes(app: FastifyInstance, opts: { store: Store }): Promise<void> {
  const { store } = opts;

  app.get("/v1/surveys/:id/report", async (request, reply) => {
    const { id } = parseOr400(idParams, request.params);
    const q = parseOr400(surveyQuery, request.query);
    const { input } = await surveyReportData(store, request.actor.orgId, id, q.revision === undefined ? undefined : Number(q.revision));
    return sendHtml(reply, renderReportHtml(buildReportModel(input)));
  });

  app.get("/v1/surveys/:id/report.pdf", async (request, reply) => {
    const { id } = parseOr400(idParams, request.params);
    const q = parseOr400(surveyQuery, request.query);
    const { revision: r, input } = await surveyReportData(store, request.actor.orgId, id, q.revision === undefined ? undefined : Number(q.revision));
    const pdf = await renderReportPdf(buildReportModel(input), { size: sizeOf(q.paper) });
    return sendPdf(reply, pdf, `${r.surveyId}-r${r.n}-report.pdf`);
  });

  app.post("/v1/sizing/report", async (request, reply) => {
    const q = parseOr400(sizingQuery, request.query);
    const inputs = parseOr400(sizingRequestSchema, request.body);
    const outcome = size(inputs);
    if (!outcome.ok) throw engineIssuesTo400(outcome.issues);
    const model = buildReportModel({ inputs, result: outcome.result });
    if (q.format === "pdf") return sendPdf(reply, await renderReportPdf(model, { size: sizeOf(q.paper) }), "sizing-report.pdf");
    return sendHtml(reply, renderReportHtml(model));
  });
}
