import { z } from "zod";
import {
  bankHealthSchema,
  revisionInputsSchema,
  revisionSchema,
  surveyCreatedSchema,
  surveyInputsSchema,
  surveyPageSchema,
  surveySchema,
  trendSchema,
  verdictSchema,
} from "../schemas/surveys.js";
import { paperQuery } from "./sizing.js";
import { html, idempotencyHeaders, idParams, json, pagingQuery, pdf, problems, rangeQuery, withKey, type RouteContract } from "./types.js";

/** Surveys: recorded and revised (never changed in place), read as stored, and their reports. */

export const createSurvey: RouteContract = {
  operationId: "createSurvey",
  summary: "Record and size a survey",
  description:
    "Sized with the building's system, transformer, utility and economics, and — when the building has stored interval analyses — the bank designed from one " +
    "(intervalAnalysisId, or the newest; null for none). Inputs, result, engine version and a snapshot of the building (naming the analysis used) are stored.",
  tags: ["surveys"],
  security: withKey,
  params: idParams,
  headers: idempotencyHeaders,
  body: surveyInputsSchema,
  response: { "201": json("the survey's id, revision 1 and its result", surveyCreatedSchema), ...problems(withKey, 400, 404, 413, 415, 422) },
};

export const listSurveys: RouteContract = {
  operationId: "listSurveys",
  summary: "A building's surveys, newest first",
  tags: ["surveys"],
  security: withKey,
  params: idParams,
  querystring: z.object({ ...rangeQuery, ...pagingQuery }),
  response: {
    "200": json("summaries of the latest revisions, by surveyedAt then id, newest first", surveyPageSchema),
    ...problems(withKey, 400, 404),
  },
};

export const buildingTrend: RouteContract = {
  operationId: "buildingTrend",
  summary: "PF and kvar over time, oldest first",
  tags: ["surveys"],
  security: withKey,
  params: idParams,
  querystring: z.object(rangeQuery),
  response: { "200": json("one point per survey (its latest revision)", trendSchema), ...problems(withKey, 400, 404) },
};

export const buildingBankHealth: RouteContract = {
  operationId: "buildingBankHealth",
  summary: "Installed banks' capacitance and status per step across surveys, oldest first",
  tags: ["surveys"],
  security: withKey,
  params: idParams,
  response: {
    "200": json("one series per installed bank (a new one when the bank was replaced or renamed), one point per survey", bankHealthSchema),
    ...problems(withKey, 404),
  },
};

export const getSurvey: RouteContract = {
  operationId: "getSurvey",
  summary: "A survey's latest revision as stored",
  tags: ["surveys"],
  security: withKey,
  params: idParams,
  response: { "200": json("inputs and the stored result, with the list of revisions", surveySchema), ...problems(withKey, 404) },
};

export const reviseSurvey: RouteContract = {
  operationId: "reviseSurvey",
  summary: "Store a new revision of a survey",
  description:
    "Surveys are immutable: a correction is a new revision with a reason, sized with the building's current data (its economics and, as for a new survey, an interval analysis).",
  tags: ["surveys"],
  security: withKey,
  params: idParams,
  headers: idempotencyHeaders,
  body: revisionInputsSchema,
  response: { "201": json("the new revision's number and result", surveyCreatedSchema), ...problems(withKey, 400, 404, 413, 415, 422) },
};

const revisionNumber = z
  .string()
  .regex(/^[1-9]\d{0,8}$/)
  .describe("a revision number: a whole number from 1");

export const getSurveyRevision: RouteContract = {
  operationId: "getSurveyRevision",
  summary: "Any revision of a survey",
  tags: ["surveys"],
  security: withKey,
  params: z.object({ id: idParams.shape.id, n: revisionNumber }),
  response: { "200": json("the revision as stored", revisionSchema), ...problems(withKey, 400, 404) },
};

export const surveyLoadsCsv: RouteContract = {
  operationId: "surveyLoadsCsv",
  summary: "The latest revision's loads as CSV",
  tags: ["surveys"],
  security: withKey,
  params: idParams,
  response: {
    "200": {
      description: "RFC 4180 CSV, one row per load: measured then computed values; units in the header",
      content: { "text/csv": { schema: z.string() } },
    },
    ...problems(withKey, 404),
  },
};

const reportQuery = z.object({ revision: revisionNumber.optional().describe("the revision to report (default: the latest)"), paper: paperQuery });

export const surveyReport: RouteContract = {
  operationId: "surveyReport",
  summary: "A stored survey's report as a self-contained HTML page",
  description:
    "Built from what was stored (the revision and the building as it was then); nothing is recomputed. paper is accepted for symmetry with the PDF and does not change the page.",
  tags: ["surveys", "reports"],
  security: withKey,
  params: idParams,
  querystring: reportQuery,
  response: { "200": html("the report page"), ...problems(withKey, 400, 404) },
};

export const surveyReportPdf: RouteContract = {
  operationId: "surveyReportPdf",
  summary: "A stored survey's report as a PDF",
  tags: ["surveys", "reports"],
  security: withKey,
  params: idParams,
  querystring: reportQuery,
  response: { "200": pdf("the report, as an attachment"), ...problems(withKey, 400, 404) },
};

export const surveyVerdict: RouteContract = {
  operationId: "surveyVerdict",
  summary: "A stored survey's recommendation in the report's words",
  description:
    "Page 1 of the report as data — what to install, what to repair first, the PF and kVA after, cost, saving, payback and the risks that matter — " +
    "built by the same code from what was stored, so a screen that shows it says what the signed report says.",
  tags: ["surveys", "reports"],
  security: withKey,
  params: idParams,
  querystring: z.object({ revision: revisionNumber.optional().describe("the revision (default: the latest)") }),
  response: { "200": json("the recommendation's lines", verdictSchema), ...problems(withKey, 400, 404) },
};
