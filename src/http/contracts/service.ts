import { z } from "zod";
import { healthSchema } from "../schemas/results.js";
import { html, json, open, problems, type RouteContract } from "./types.js";

/** The open routes of the service itself: liveness, the problem-type pages, the document. */

export const health: RouteContract = {
  operationId: "health",
  summary: "Liveness check",
  tags: ["service"],
  security: open,
  response: { "200": json("the service is up", healthSchema), ...problems(open) },
};

/** For the readiness route (GET /ready) when it is registered: `{ schema: service.ready }`. */
export const ready: RouteContract = {
  operationId: "ready",
  summary: "Readiness check: the store answers",
  tags: ["service"],
  security: open,
  response: {
    "200": json("ready to serve", z.object({ status: z.string() }).loose()),
    "503": json("not ready yet (or no longer)", z.object({ status: z.string() }).loose()),
    ...problems(open),
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
