/**
 * Report routes: a stored survey's report as HTML or PDF, its first page's verdict as data, and the report of a
 * sizing request.
 * Thin: read or size, then src/report builds the model and renders it.
 */
import type { FastifyInstance, FastifyReply } from "fastify";
import * as contracts from "../contracts/surveys.js";
import * as sizingContracts from "../contracts/sizing.js";
import { z } from "zod";
import { sizingRequestSchema } from "../schemas/sizing.js";
import { engineIssuesTo400, parseOr400 } from "../validate.js";
import type { Store } from "../../store/ports.js";
import type { ReportOutput, ReportTask } from "../../heavy-work/tasks.js";
import { revisionOf, surveyReportData } from "../../application/survey-reads.js";
import { VERDICT_CAUTION, verdictOf } from "../../report/sections/verdict.js";

const idParams = z.object({ id: z.string() });
const paper = z.enum(["a4", "letter"], { error: "paper must be a4 or letter" }).optional();
const surveyQuery = z.strictObject({
  revision: z
    .string()
    .regex(/^[1-9]\d{0,8}$/, "revision must be a revision number: a whole number from 1")
    .optional(),
  paper,
});
const verdictQuery = surveyQuery.omit({ paper: true });
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

function sendOutput(reply: FastifyReply, out: ReportOutput, filename: string): FastifyReply {
  // A Buffer crosses the thread boundary as a plain Uint8Array: view the same bytes as a Buffer again.
  return "html" in out ? sendHtml(reply, out.html) : sendPdf(reply, Buffer.from(out.pdf.buffer, out.pdf.byteOffset, out.pdf.byteLength), filename);
}

/** The model is built and drawn on a worker thread (a report with charts takes long enough to stall other requests). */
async function sendReport(app: FastifyInstance, reply: FastifyReply, task: ReportTask, filename: string): Promise<FastifyReply> {
  return sendOutput(reply, await app.heavyWork.run("report", task), filename);
}

export async function reportRoutes(app: FastifyInstance, opts: { store: Store }): Promise<void> {
  const { store } = opts;

  app.get("/v1/surveys/:id/report", { schema: contracts.surveyReport }, async (request, reply) => {
    const { id } = parseOr400(idParams, request.params);
    const q = parseOr400(surveyQuery, request.query);
    const { input } = await surveyReportData(store, request.actor.orgId, id, q.revision === undefined ? undefined : Number(q.revision));
    return sendReport(app, reply, { input, format: "html", paper: sizeOf(q.paper) }, "");
  });

  app.get("/v1/surveys/:id/report.pdf", { schema: contracts.surveyReportPdf }, async (request, reply) => {
    const { id } = parseOr400(idParams, request.params);
    const q = parseOr400(surveyQuery, request.query);
    const { revision: r, input } = await surveyReportData(store, request.actor.orgId, id, q.revision === undefined ? undefined : Number(q.revision));
    return sendReport(app, reply, { input, format: "pdf", paper: sizeOf(q.paper) }, `${r.surveyId}-r${r.n}-report.pdf`);
  });

  // Page 1 as data, for the tablet: the report's own lines, so the two never word a recommendation differently.
  app.get("/v1/surveys/:id/verdict", { schema: contracts.surveyVerdict }, async (request) => {
    const { id } = parseOr400(idParams, request.params);
    const q = parseOr400(verdictQuery, request.query);
    const r = await revisionOf(store, request.actor.orgId, id, q.revision === undefined ? undefined : Number(q.revision));
    return { surveyId: r.surveyId, revision: r.n, ...verdictOf(r.result), caution: VERDICT_CAUTION };
  });

  app.post("/v1/sizing/report", { schema: sizingContracts.sizingReport }, async (request, reply) => {
    const q = parseOr400(sizingQuery, request.query);
    const inputs = parseOr400(sizingRequestSchema, request.body);
    const out = await app.heavyWork.run("sizingReport", { inputs, format: q.format ?? "html", paper: sizeOf(q.paper) });
    if ("issues" in out) throw engineIssuesTo400(out.issues);
    return sendOutput(reply, out, "sizing-report.pdf");
  });
}
