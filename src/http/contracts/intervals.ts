import { z } from "zod";
import { INTERVAL_MAX_BYTES, INTERVAL_MAX_ROWS } from "../interval/ingest.js";
import { INTERVAL_OPTION_DOCS } from "../interval/options.js";
import { intervalAnalysisCreatedSchema, intervalAnalysisPageSchema, intervalResultSchema, storedIntervalAnalysisSchema } from "../interval/schema.js";
import { idempotencyHeaders, idParams, json, pagingQuery, problems, withKey, type RouteContract } from "./types.js";

/** Interval demand data: analysed as uploaded, or analysed and stored with a building. */

const MIB = INTERVAL_MAX_BYTES / 1048576;

/** The analysis options, each a query parameter or a form field (documentation: upload.ts parses them). */
const optionShape = Object.fromEntries(
  Object.entries(INTERVAL_OPTION_DOCS).map(([name, o]) => [name, (o.type === "number" ? z.number() : z.string()).optional().describe(o.description)]),
);
const optionFields = Object.fromEntries(
  Object.entries(INTERVAL_OPTION_DOCS).map(([name, o]) => [name, z.string().optional().describe(o.description)]),
);

/** The upload: the CSV as the body, or a form with the option fields first and the CSV in the field "file". */
const upload = {
  content: {
    "text/csv": { schema: z.string().describe("CSV text with a header line") },
    "multipart/form-data": {
      schema: z
        .object({ ...optionFields, file: z.string().describe("the CSV file (the last part of the form)") })
        .describe("the option fields first, then the CSV in the field file"),
    },
  },
};

export const analyseIntervals: RouteContract = {
  operationId: "analyseIntervals",
  summary: "Analyse interval demand data (CSV) for power-factor correction",
  description:
    `A CSV as text/csv (or multipart/form-data, option fields first, the CSV in field "file"), up to ${MIB} MiB and ${INTERVAL_MAX_ROWS} rows: ` +
    "a timestamp column and kW + kvar, kW + PF or kW + kVA, found by header name. Returns the reactive-demand duration curve and percentiles, " +
    "the kvar needed to hold the target PF in 95/99/100 % of intervals, the minimum reactive demand, monthly peak kW/kVA and billing PF, " +
    "data-quality findings (bad rows with line numbers, gaps, duplicates, out-of-order rows) and, given a bank, a simulated PF controller. " +
    "More than 5 % bad rows refuses the upload (422).",
  tags: ["interval data"],
  security: withKey,
  querystring: z.object(optionShape),
  body: upload,
  response: { "200": json("the analysis", intervalResultSchema), ...problems(withKey, 400, 413, 415, 422) },
};

export const storeIntervalAnalysis: RouteContract = {
  operationId: "storeIntervalAnalysis",
  summary: "Analyse interval data and store it with a building",
  description:
    `The same upload and options as POST /v1/interval-analyses (text/csv, or multipart/form-data with the CSV in field "file"; up to ${MIB} MiB). ` +
    "The summary (not the file) is stored with the building; later surveys of the building design their bank from it. " +
    "Idempotency-Key: a replay is recognised by the query, media type, form fields and the SHA-256 of the uploaded bytes.",
  tags: ["interval data"],
  security: withKey,
  params: idParams,
  querystring: z.object(optionShape),
  headers: idempotencyHeaders,
  body: upload,
  response: {
    "201": json("the stored analysis's id and the full analysis", intervalAnalysisCreatedSchema),
    ...problems(withKey, 400, 404, 413, 415, 422),
  },
};

export const listIntervalAnalyses: RouteContract = {
  operationId: "listIntervalAnalyses",
  summary: "A building's stored interval analyses, newest first",
  tags: ["interval data"],
  security: withKey,
  params: idParams,
  querystring: z.object(pagingQuery),
  response: { "200": json("a page, newest first", intervalAnalysisPageSchema), ...problems(withKey, 400, 404) },
};

export const getIntervalAnalysis: RouteContract = {
  operationId: "getIntervalAnalysis",
  summary: "A stored interval analysis",
  tags: ["interval data"],
  security: withKey,
  params: idParams,
  response: { "200": json("the analysis's summary as stored", storedIntervalAnalysisSchema), ...problems(withKey, 404) },
};
