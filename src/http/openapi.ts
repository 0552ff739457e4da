import swagger, { type FastifyDynamicSwaggerOptions } from "@fastify/swagger";
import type { FastifyInstance, RouteOptions } from "fastify";
import { createJsonSchemaTransform, createJsonSchemaTransformObject } from "fastify-type-provider-zod";
import { z } from "zod";
import { ENGINE_VERSION } from "../core/pipeline/engine-version.js";
import { componentRegistry } from "./contracts/components.js";
import { API_KEY, type RouteContract } from "./contracts/types.js";

/**
 * The OpenAPI 3.1 document, generated from the running app: every route declares its contract as its `schema`
 * (src/http/contracts/), @fastify/swagger collects them as the routes are registered, and zod's JSON Schema
 * conversion (through fastify-type-provider-zod's transform) writes the schemas, the named ones once under
 * components.schemas. A route without a contract (the survey page's files, the docs viewer) stays out of it.
 */

type Json = Record<string, unknown>;
type TransformInput = Parameters<NonNullable<FastifyDynamicSwaggerOptions["transform"]>>[0];
type TransformOutput = ReturnType<NonNullable<FastifyDynamicSwaggerOptions["transform"]>>;

declare module "fastify" {
  interface FastifyInstance {
    /** Every route as registered (method, URL pattern, declared contract): what the document must cover. */
    routeTable: RegisteredRoute[];
  }
}

export interface RegisteredRoute {
  method: string;
  /** The pattern as registered: /v1/buildings/:id */
  url: string;
  contract: RouteContract | undefined;
}

type ZodToJsonConfig = NonNullable<Parameters<typeof createJsonSchemaTransform>[0]["zodToJsonConfig"]>;

/**
 * Per schema node, after zod's conversion. The transform reads metadata from the component registry only, where
 * `.describe()` texts are not (zod keeps them in its global registry): they are copied in here. And, as the
 * transform's own override does, an empty branch of a union (an unrepresentable one) is dropped.
 */
const override: NonNullable<ZodToJsonConfig["override"]> = (ctx) => {
  const json = ctx.jsonSchema as Json;
  if (ctx.zodSchema._zod.def.type === "union" && Array.isArray(json.anyOf))
    json.anyOf = json.anyOf.filter((branch: Json) => Object.keys(branch).length > 0);
  const description = z.globalRegistry.get(ctx.zodSchema)?.description;
  if (description !== undefined && json.description === undefined) json.description = description;
};

const zodTransform = createJsonSchemaTransform({ schemaRegistry: componentRegistry, skipList: [], zodToJsonConfig: { override } });
const zodComponents = createJsonSchemaTransformObject({ schemaRegistry: componentRegistry, zodToJsonConfig: { override } });

/** A schema for one media type of a multi-type body: small and unnamed, so plain zod conversion. */
function plainSchema(schema: z.ZodType): Json {
  const js = z.toJSONSchema(schema, { target: "draft-2020-12", io: "input", unrepresentable: "any" }) as Json;
  delete js.$schema;
  return js;
}

export const isContract = (schema: unknown): schema is RouteContract =>
  typeof schema === "object" && schema !== null && typeof (schema as { operationId?: unknown }).operationId === "string";

/**
 * The per-route transform. The zod transform handles one JSON body and responses with content; this adds what it
 * does not: a body per media type (an upload) and an answer without a body (204).
 */
function routeTransform(input: TransformInput): TransformOutput {
  const contract = input.schema as unknown;
  if (!isContract(contract)) return { schema: { hide: true }, url: input.url };
  const { body, response, ...rest } = contract;
  const perMediaType = body !== undefined && !(body instanceof z.ZodType) ? body : undefined;
  const withBody = Object.entries(response).filter(([, r]) => r.content);
  const out = zodTransform({
    ...input,
    schema: { ...rest, ...(body instanceof z.ZodType ? { body } : {}), response: Object.fromEntries(withBody) } as never,
  });
  const schema = out.schema as Json;
  if (perMediaType) {
    schema.body = { content: Object.fromEntries(Object.entries(perMediaType.content).map(([type, m]) => [type, { schema: plainSchema(m.schema) }])) };
  }
  const responses = schema.response as Json;
  for (const [status, r] of Object.entries(response)) {
    // @fastify/swagger writes no content for type "null": the answer has no body.
    if (!r.content) responses[status] = { type: "null", description: r.description };
  }
  return out;
}

/** Every $ref reachable from the paths, so the document keeps only the components it uses. */
function usedComponents(doc: Json): Set<string> {
  const schemas = ((doc.components as Json | undefined)?.schemas ?? {}) as Json;
  const used = new Set<string>();
  const visit = (v: unknown): void => {
    if (Array.isArray(v)) return v.forEach(visit);
    if (v === null || typeof v !== "object") return;
    for (const [k, c] of Object.entries(v)) {
      if (k === "$ref" && typeof c === "string" && c.startsWith("#/components/schemas/")) {
        const name = c.slice("#/components/schemas/".length);
        if (!used.has(name)) {
          used.add(name);
          visit(schemas[name]);
        }
      } else visit(c);
    }
  };
  visit(doc.paths);
  return used;
}

function documentObject(input: Parameters<typeof zodComponents>[0]): Json {
  const doc = zodComponents(input) as unknown as Json;
  const components = doc.components as Json;
  const schemas = (components.schemas ?? {}) as Json;
  const used = usedComponents(doc);
  const kept = Object.keys(schemas)
    .filter((name) => used.has(name))
    .sort()
    .map((name) => [name, schemas[name]] as const);
  return { ...doc, components: { ...components, schemas: Object.fromEntries(kept) } };
}

const TAGS: { name: string; description: string }[] = [
  { name: "sizing", description: "Stateless sizing of power-factor correction from readings" },
  { name: "harmonics", description: "Harmonic studies with impedance scans" },
  { name: "reports", description: "Reports as self-contained HTML pages or PDFs" },
  { name: "buildings", description: "Buildings, their electrical system and every version of them" },
  { name: "surveys", description: "Surveys of a building, their revisions and what is read from them" },
  { name: "interval data", description: "Interval demand data analysed, and stored with a building" },
  { name: "audit", description: "The organisation's log of writes" },
  { name: "keys", description: "The organisation's API keys" },
  { name: "service", description: "Liveness, the problem-type pages and this document (no key)" },
];

export const swaggerOptions: FastifyDynamicSwaggerOptions = {
  openapi: {
    openapi: "3.1.0",
    info: {
      title: "pfc-sizing",
      version: ENGINE_VERSION,
      description:
        "Sizes power-factor correction from field readings: kvar to a target PF, a bank of standard steps, resonance with the supply, and the safety cautions. kvar > 0 is lagging, < 0 leading.",
      license: { name: "Proprietary", identifier: "LicenseRef-Proprietary" },
    },
    // The service does not know the host it is reached by: the document is relative to where it is served.
    servers: [{ url: "/", description: "the service that serves this document" }],
    tags: TAGS,
    components: {
      securitySchemes: {
        [API_KEY]: {
          type: "http",
          scheme: "bearer",
          description:
            "An API key: Authorization: Bearer pfc_<prefix>_<secret>. admin: keys, buildings, surveys; surveyor: create buildings and surveys, read; auditor: read, including history and the audit log.",
        },
      },
    },
  },
  transform: routeTransform as FastifyDynamicSwaggerOptions["transform"],
  transformObject: documentObject as FastifyDynamicSwaggerOptions["transformObject"],
};

/**
 * Before any route: the route table, the document's collector, and compilers that leave requests and answers as they
 * were. Validation stays in the handlers (parseOr400 names each field in a 400); answers are serialised with
 * JSON.stringify as without a schema (no run-time response checking).
 */
export async function installOpenapi(app: FastifyInstance): Promise<void> {
  const table: RegisteredRoute[] = [];
  app.decorate("routeTable", table);
  app.addHook("onRoute", (route: RouteOptions) => {
    for (const method of [route.method].flat()) table.push({ method, url: route.url, contract: isContract(route.schema) ? route.schema : undefined });
  });
  app.setValidatorCompiler(() => () => true);
  app.setSerializerCompiler(() => (data) => JSON.stringify(data));
  await app.register(swagger, swaggerOptions);
}
