import { z } from "zod";
import { ENGINE_VERSION } from "../core/pipeline/engine-version.js";
import { operations, type Operation } from "./operations.js";
import { problemSchema } from "./schemas/results.js";

type Json = Record<string, unknown>;

function schemaOf(s: z.ZodType, io: "input" | "output"): Json {
  const js = z.toJSONSchema(s, { target: "draft-2020-12", io, unrepresentable: "any" }) as Json;
  delete js.$schema;
  return js;
}

function operationObject(op: Operation): Json {
  const responses: Json = {};
  for (const [status, r] of Object.entries(op.responses)) {
    responses[status] = {
      description: r.description,
      ...(r.schema ? { content: { [r.contentType ?? "application/json"]: { schema: schemaOf(r.schema, "output") } } } : {}),
      ...(r.contentType && !r.schema ? { content: { [r.contentType]: { schema: { type: "string" } } } } : {}),
    };
  }
  const secured = op.path.startsWith("/v1/");
  for (const status of [...(op.problems ?? [400]), ...(secured ? [401, 403, 429] : [])]) {
    responses[String(status)] = {
      description: "problem details (RFC 9457)",
      content: { "application/problem+json": { schema: { $ref: "#/components/schemas/Problem" } } },
    };
  }
  const parameters: Json[] = [];
  for (const name of op.path.match(/\{(\w+)\}/g) ?? []) {
    parameters.push({ name: name.slice(1, -1), in: "path", required: true, schema: { type: "string" } });
  }
  for (const [name, q] of Object.entries(op.query ?? {})) {
    parameters.push({ name, in: "query", required: false, description: q.description, schema: { type: q.type } });
  }
  for (const [name, h] of Object.entries(op.headers ?? {})) {
    parameters.push({ name, in: "header", required: false, description: h, schema: { type: "string" } });
  }
  return {
    summary: op.summary,
    ...(op.description ? { description: op.description } : {}),
    tags: op.tags,
    operationId: op.operationId,
    ...(parameters.length ? { parameters } : {}),
    ...(op.body
      ? { requestBody: { required: true, content: { [op.bodyType ?? "application/json"]: { schema: schemaOf(op.body, "input") } } } }
      : {}),
    responses,
    ...(secured ? { security: [{ apiKey: [] }] } : {}),
  };
}

/** The OpenAPI 3.1 document, generated from the same zod schemas that validate requests. */
export function openapiDocument(): Json {
  const paths: Record<string, Json> = {};
  for (const op of operations) {
    const path = (paths[op.path] ??= {});
    path[op.method] = operationObject(op);
  }
  return {
    openapi: "3.1.0",
    info: {
      title: "pfc-sizing",
      version: ENGINE_VERSION,
      description:
        "Sizes power-factor correction from field readings: kvar to a target PF, a bank of standard steps, resonance with the supply, and the safety cautions. kvar > 0 is lagging, < 0 leading.",
    },
    paths,
    components: {
      schemas: { Problem: schemaOf(problemSchema, "output") },
      securitySchemes: {
        apiKey: { type: "http", scheme: "bearer", description: "An API key: Authorization: Bearer pfc_<prefix>_<secret>. admin: keys, buildings, surveys; surveyor: create buildings and surveys, read; auditor: read, including history and the audit log." },
      },
    },
  };
}
