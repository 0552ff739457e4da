import { z } from "zod";
import { healthSchema } from "../schemas/results.js";
import { html, json, open, problems, type ResponseContract, type RouteContract } from "./types.js";

/** /health and /ready are exempt from the rate limit (a load balancer polls them): no 429 among their answers. */
function unlimited(r: Record<string, ResponseContract>): Record<string, ResponseContract> {
  const { "429": _limited, ...rest } = r;
  return rest;
}

/** The open routes of the service itself: liveness, the problem-type pages, the document. */

export const health: RouteContract = {
  operationId: "health",
  summary: "Liveness check",
  tags: ["service"],
  security: open,
  response: { "200": json("the service is up", healthSchema), ...unlimited(problems(open)) },
};

/** GET /ready (src/http/readiness.ts): { status: "ready", … } or a 503 problem. */
export const ready: RouteContract = {
  operationId: "ready",
  summary: "Readiness check: the database answers and its schema is current",
  description:
    "For a load balancer: 200 when this instance can serve; 503 problem+json (with Retry-After) when its database cannot be reached or its migrations are not this build's. No key.",
  tags: ["service"],
  security: open,
  response: {
    "200": json("ready to serve", z.object({ status: z.literal("ready"), database: z.literal("reachable"), migrations: z.literal("current") })),
    ...unlimited(problems(open, 503)),
  },
};

export const problemTypes: RouteContract = {
  operationId: "problemTypes",
  summary: "Every problem type, as a short HTML page of links",
  tags: ["service"],
  security: open,
  response: { "200": html("a short HTML page"), ...problems(open) },
};

export const problemType: RouteContract = {
  operationId: "problemType",
  summary: "What a problem type means and what to do (the page a problem's type points at)",
  tags: ["service"],
  security: open,
  params: z.object({ type: z.string().describe("the problem type's slug, e.g. validation") }),
  response: { "200": html("a short HTML page"), ...problems(open, 404) },
};

export const openapiDocument: RouteContract = {
  operationId: "openapiDocument",
  summary: "This OpenAPI document",
  tags: ["service"],
  security: open,
  response: { "200": json("the OpenAPI 3.1 document", z.record(z.string(), z.unknown())), ...problems(open) },
};
