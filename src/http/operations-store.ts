import { z } from "zod";
import { KEEP_HOURS } from "./idempotency.js";
import { INTERVAL_MAX_BYTES } from "./interval/ingest.js";
import { INTERVAL_OPTION_DOCS } from "./interval/options.js";
import { intervalAnalysisCreatedSchema, intervalAnalysisPageSchema, storedIntervalAnalysisSchema } from "./interval/schema.js";
import type { Operation } from "./operations.js";
import { keyCreatedSchema, keyCreateSchema, keyListSchema } from "./routes/keys.js";
import {
  buildingCreateSchema,
  buildingHistorySchema,
  buildingPageSchema,
  buildingPatchSchema,
  buildingSchema,
} from "./schemas/buildings.js";
import {
  auditPageSchema,
  revisionInputsSchema,
  revisionSchema,
  surveyCreatedSchema,
  surveyInputsSchema,
  surveyPageSchema,
  surveySchema,
  trendSchema,
  bankHealthSchema,
} from "./schemas/surveys.js";

const idempotency = {
  "Idempotency-Key":
    `optional, bare (k1) or quoted ("k1"); the same key with the same request returns the first response and writes nothing; with another request → 422. Kept ${KEEP_HOURS} h.`,
};
const paging = {
  limit: { type: "integer" as const, description: "page size, 1 to 100 (default 20)" },
  cursor: { type: "string" as const, description: "nextCursor of the previous page" },
};
const range = {
  from: { type: "string" as const, description: "ISO date or date-time, inclusive (a date: from its start, UTC)" },
  to: { type: "string" as const, description: "ISO date or date-time, inclusive (a date: to its end, UTC)" },
};

/** The stored resources: buildings, surveys and their revisions, the audit log. */
export const storeOperations: Operation[] = [
  {
    method: "post", path: "/v1/buildings", operationId: "createBuilding", summary: "Create a building", tags: ["buildings"],
    body: buildingCreateSchema, headers: idempotency,
    responses: { "201": { description: "the building, version 1", schema: buildingSchema } }, problems: [400, 413, 415, 422],
  },
  {
    method: "get", path: "/v1/buildings", operationId: "listBuildings", summary: "List buildings by name", tags: ["buildings"],
    query: { q: { type: "string", description: "part of the name, case-insensitive" }, ...paging },
    responses: { "200": { description: "a page, ordered by name then id", schema: buildingPageSchema } },
  },
  {
    method: "get", path: "/v1/buildings/{id}", operationId: "getBuilding", summary: "A building", tags: ["buildings"],
    responses: { "200": { description: "the current version", schema: buildingSchema } }, problems: [404],
  },
  {
    method: "patch", path: "/v1/buildings/{id}", operationId: "updateBuilding", summary: "Change a building (keeps history)", tags: ["buildings"],
    description:
      "Omitted fields stay; null clears address, notes, transformer, utility or economics (economics is replaced whole). A change makes a new version; an unchanged body writes nothing.",
    body: buildingPatchSchema, headers: idempotency,
    responses: { "200": { description: "the new current version", schema: buildingSchema } }, problems: [400, 404, 413, 415, 422],
  },
  {
    method: "get", path: "/v1/buildings/{id}/history", operationId: "buildingHistory", summary: "Every version of a building, oldest first", tags: ["buildings"],
    responses: { "200": { description: "versions, oldest first; the last is current", schema: buildingHistorySchema } }, problems: [404],
  },
  {
    method: "post", path: "/v1/buildings/{id}/surveys", operationId: "createSurvey", summary: "Record and size a survey", tags: ["surveys"],
    description:
      "Sized with the building's system, transformer, utility and economics, and — when the building has stored interval analyses — the bank designed from one " +
      "(intervalAnalysisId, or the newest; null for none). Inputs, result, engine version and a snapshot of the building (naming the analysis used) are stored.",
    body: surveyInputsSchema, headers: idempotency,
    responses: { "201": { description: "the survey's id, revision 1 and its result", schema: surveyCreatedSchema } },
    problems: [400, 404, 413, 415, 422],
  },
  {
    method: "get", path: "/v1/buildings/{id}/surveys", operationId: "listSurveys", summary: "A building's surveys, newest first", tags: ["surveys"],
    query: { ...range, ...paging },
    responses: { "200": { description: "summaries of the latest revisions, by surveyedAt then id, newest first", schema: surveyPageSchema } },
    problems: [400, 404],
  },
  {
    method: "get", path: "/v1/buildings/{id}/trend", operationId: "buildingTrend", summary: "PF and kvar over time, oldest first", tags: ["surveys"],
    query: range,
    responses: { "200": { description: "one point per survey (its latest revision)", schema: trendSchema } }, problems: [400, 404],
  },
  {
    method: "get", path: "/v1/buildings/{id}/bank-health", operationId: "buildingBankHealth", summary: "Installed banks' capacitance and status per step across surveys, oldest first", tags: ["surveys"],
    responses: { "200": { description: "one series per installed bank (a new one when the bank was replaced or renamed), one point per survey", schema: bankHealthSchema } }, problems: [404],
  },
  {
    method: "get", path: "/v1/surveys/{id}", operationId: "getSurvey", summary: "A survey's latest revision as stored", tags: ["surveys"],
    responses: { "200": { description: "inputs and the stored result, with the list of revisions", schema: surveySchema } }, problems: [404],
  },
  {
    method: "post", path: "/v1/surveys/{id}/revisions", operationId: "reviseSurvey", summary: "Store a new revision of a survey", tags: ["surveys"],
    description:
      "Surveys are immutable: a correction is a new revision with a reason, sized with the building's current data (its economics and, as for a new survey, an interval analysis).",
    body: revisionInputsSchema, headers: idempotency,
    responses: { "201": { description: "the new revision's number and result", schema: surveyCreatedSchema } },
    problems: [400, 404, 413, 415, 422],
  },
  {
    method: "get", path: "/v1/surveys/{id}/revisions/{n}", operationId: "getSurveyRevision", summary: "Any revision of a survey", tags: ["surveys"],
    responses: { "200": { description: "the revision as stored", schema: revisionSchema } }, problems: [400, 404],
  },
  {
    method: "get", path: "/v1/surveys/{id}/loads.csv", operationId: "surveyLoadsCsv", summary: "The latest revision's loads as CSV", tags: ["surveys"],
    responses: { "200": { description: "RFC 4180 CSV, one row per load: measured then computed values; units in the header", contentType: "text/csv" } },
    problems: [404],
  },
  {
    method: "post", path: "/v1/buildings/{id}/interval-analyses", operationId: "storeIntervalAnalysis", summary: "Analyse interval data and store it with a building",
    tags: ["interval data"],
    description:
      `The same upload and options as POST /v1/interval-analyses (text/csv, or multipart/form-data with the CSV in field "file"; up to ${INTERVAL_MAX_BYTES / 1048576} MiB). ` +
      "The summary (not the file) is stored with the building; later surveys of the building design their bank from it. " +
      "Idempotency-Key: a replay is recognised by the query, media type, form fields and the SHA-256 of the uploaded bytes.",
    body: z.string().describe("CSV text with a header line"), bodyType: "text/csv", query: INTERVAL_OPTION_DOCS, headers: idempotency,
    responses: { "201": { description: "the stored analysis's id and the full analysis", schema: intervalAnalysisCreatedSchema } },
    problems: [400, 404, 413, 415, 422],
  },
  {
    method: "get", path: "/v1/buildings/{id}/interval-analyses", operationId: "listIntervalAnalyses", summary: "A building's stored interval analyses, newest first",
    tags: ["interval data"], query: paging,
    responses: { "200": { description: "a page, newest first", schema: intervalAnalysisPageSchema } }, problems: [400, 404],
  },
  {
    method: "get", path: "/v1/interval-analyses/{id}", operationId: "getIntervalAnalysis", summary: "A stored interval analysis", tags: ["interval data"],
    responses: { "200": { description: "the analysis's summary as stored", schema: storedIntervalAnalysisSchema } }, problems: [404],
  },
  {
    method: "get", path: "/v1/audit-log", operationId: "auditLog", summary: "Every write, newest first", tags: ["audit"],
    query: paging,
    responses: { "200": { description: "a page of audit entries", schema: auditPageSchema } },
  },
  {
    method: "post", path: "/v1/keys", operationId: "createKey", summary: "Create an API key in the caller's organisation (admin)", tags: ["keys"],
    description: "The key is in the answer this once; only its SHA-256 and public prefix are stored.",
    body: keyCreateSchema,
    responses: { "201": { description: "the key, shown once", schema: keyCreatedSchema } }, problems: [400, 413, 415],
  },
  {
    method: "get", path: "/v1/keys", operationId: "listKeys", summary: "The organisation's API keys, without secrets (admin)", tags: ["keys"],
    responses: { "200": { description: "every key, revoked ones included, oldest first", schema: keyListSchema } }, problems: [],
  },
  {
    method: "delete", path: "/v1/keys/{id}", operationId: "revokeKey", summary: "Revoke an API key (admin)", tags: ["keys"],
    description: "A revoked key is refused from then on (401); revoking it again changes nothing. The last active admin key cannot be revoked (409).",
    responses: { "204": { description: "revoked" } }, problems: [404, 409],
  },
];
