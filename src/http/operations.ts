import type { z } from "zod";
import { storeOperations } from "./operations-store.js";
import { harmonicScanRequestSchema } from "./schemas/harmonics.js";
import { harmonicScanResultSchema, healthSchema, readySchema, sizingWithHarmonicsSchema } from "./schemas/results.js";
import { sizingRequestSchema } from "./schemas/sizing.js";
import { intervalOperation } from "./interval/schema.js";

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
    method: "get",
    path: "/ready",
    operationId: "ready",
    summary: "Readiness check: the database answers and its schema is current",
    description: "For a load balancer: 200 when this instance can serve; 503 problem+json (with Retry-After) when its database cannot be reached or its migrations are not this build's. Not rate-limited, no key.",
    tags: ["service"],
    responses: { "200": { description: "ready to serve", schema: readySchema } },
    problems: [503],
  },
  {
    method: "get",
    path: "/problems/{type}",
    operationId: "problemType",
    summary: "What a problem type means and what to do (the page a problem's type points at)",
    tags: ["service"],
    responses: { "200": { description: "a short HTML page", contentType: "text/html" } },
    problems: [404],
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
    responses: { "200": { description: "the sizing result", schema: sizingWithHarmonicsSchema } },
    problems: [400, 413, 415],
  },
  {
    method: "post",
    path: "/v1/harmonics/scan",
    operationId: "harmonicScan",
    summary: "Harmonic study with the impedance scan series per stage",
    description:
      "The sizing body plus scan options: |Z(h)| at the capacitor bus for the bus alone and every cumulative stage of the recommended and proposed banks, parallel-resonance peaks and series-tuned dips, harmonic voltages and THD_v against IEEE Std 519-2014 Table 1, capacitor duty against IEEE Std 18, and a detuned design when a stage fails.",
    tags: ["harmonics"],
    body: harmonicScanRequestSchema,
    responses: { "200": { description: "the study with scan series", schema: harmonicScanResultSchema } },
    problems: [400, 413, 415],
  },
  ...storeOperations,
  intervalOperation,
];
