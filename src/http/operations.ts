import type { z } from "zod";
import { healthSchema, sizingResultSchema } from "./schemas/results.js";
import { sizingRequestSchema } from "./schemas/sizing.js";

export interface Operation {
  method: "get" | "post" | "patch" | "delete";
  path: string;
  operationId: string;
  summary: string;
  description?: string;
  tags: string[];
  body?: z.ZodType;
  bodyType?: string;
  query?: Record<string, { type: "string" | "integer" | "number"; description: string }>;
  headers?: Record<string, string>;
  responses: Record<string, { description: string; schema?: z.ZodType; contentType?: string }>;
  /** Problem statuses this operation can answer; 400 by default. */
  problems?: number[];
}

/** Every route of the API, for the OpenAPI document. Routes add themselves here as they are built. */
export const operations: Operation[] = [
  {
    method: "get",
    path: "/health",
    operationId: "health",
    summary: "Liveness check",
    tags: ["service"],
    responses: { "200": { description: "the service is up", schema: healthSchema } },
    problems: [],
  },
  {
    method: "post",
    path: "/v1/sizing",
    operationId: "size",
    summary: "Size power-factor correction from readings (stateless)",
    description:
      "Each load's power triangle, the site's displacement PF, the kvar to the target, a recommended bank, the proposed bank's stages and a resonance screen against the supply transformer.",
    tags: ["sizing"],
    body: sizingRequestSchema,
    responses: { "200": { description: "the sizing result", schema: sizingResultSchema } },
    problems: [400, 413, 415],
  },
];
