import { z } from "zod";
import { KEEP_HOURS } from "../idempotency.js";
import { DEFAULT_LIMIT, MAX_LIMIT } from "../paging.js";
import { problemSchema } from "../schemas/results.js";

/**
 * What a route declares about itself: the `schema` option of its registration. The OpenAPI document is generated
 * from these (src/http/openapi.ts). They document; they do not validate: handlers keep parsing with parseOr400, so
 * the 400s keep naming each field the way they always have.
 */

type Media = Record<string, { schema: z.ZodType }>;

export interface ResponseContract {
  description: string;
  /** Absent for an answer without a body (204). */
  content?: Media;
}

export type SecurityRequirement = Record<string, string[]>;

export interface RouteContract {
  operationId: string;
  summary: string;
  description?: string;
  tags: string[];
  /** [] for an open route; the API key otherwise. */
  security: SecurityRequirement[];
  params?: z.ZodObject;
  querystring?: z.ZodObject;
  headers?: z.ZodObject;
  /** One JSON schema, or a schema per media type (an upload taken as text/csv or multipart/form-data). */
  body?: z.ZodType | { content: Media };
  response: Record<string, ResponseContract>;
}

/** The API key scheme's name in components.securitySchemes. */
export const API_KEY = "apiKey";
export const withKey: SecurityRequirement[] = [{ [API_KEY]: [] }];
export const open: SecurityRequirement[] = [];

export const json = (description: string, schema: z.ZodType): ResponseContract => ({ description, content: { "application/json": { schema } } });

const PROBLEM_WHEN: Record<number, string> = {
  400: "the request is not valid: each offending field is named in errors",
  401: "no API key, or one that is not valid",
  403: "the key's role may not do this",
  404: "not found (or another organisation's)",
  409: "conflicts with the current state",
  413: "the body is too large",
  415: "the body's media type is not accepted here",
  422: "understood but refused (see the problem's type)",
  429: "too many requests in a minute; see Retry-After",
  503: "not ready to serve; see Retry-After",
};

/**
 * Problem answers (RFC 9457) for the given statuses. Every route can answer 429 (the rate limit is global); a route
 * that needs a key also 401 and 403.
 */
export function problems(security: SecurityRequirement[], ...statuses: number[]): Record<string, ResponseContract> {
  const all = new Set([...statuses, ...(security.length ? [401, 403] : []), 429]);
  const out: Record<string, ResponseContract> = {};
  for (const status of [...all].sort((a, b) => a - b)) {
    out[String(status)] = {
      description: PROBLEM_WHEN[status] ?? "problem details",
      content: { "application/problem+json": { schema: problemSchema } },
    };
  }
  return out;
}

export const idParams = z.object({ id: z.string().describe("the resource's id") });

export const idempotencyHeaders = z.object({
  "idempotency-key": z
    .string()
    .max(200)
    .optional()
    .describe(
      `optional, bare (k1) or quoted ("k1"); the same key with the same request returns the first response and writes nothing; with another request → 422. Kept ${KEEP_HOURS} h.`,
    ),
});

export const pagingQuery = {
  limit: z.int().min(1).max(MAX_LIMIT).optional().describe(`page size, 1 to ${MAX_LIMIT} (default ${DEFAULT_LIMIT})`),
  cursor: z.string().optional().describe("nextCursor of the previous page"),
};

export const rangeQuery = {
  from: z.string().optional().describe("ISO date or date-time, inclusive (a date: from its start, UTC)"),
  to: z.string().optional().describe("ISO date or date-time, inclusive (a date: to its end, UTC)"),
};

export const html = (description: string): ResponseContract => ({ description, content: { "text/html": { schema: z.string() } } });
export const pdf = (description: string): ResponseContract => ({
  description,
  content: { "application/pdf": { schema: z.string().describe("the PDF file") } },
});
