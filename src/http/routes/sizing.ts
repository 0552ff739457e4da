import type { FastifyInstance } from "fastify";
import * as contracts from "../contracts/sizing.js";
import { size } from "../../core/pipeline/size.js";
import { jsonBytes } from "../../application/json-bytes.js";
import { sizingRequestSchema } from "../schemas/sizing.js";
import { engineIssuesTo400, parseOr400 } from "../validate.js";

export async function sizingRoutes(app: FastifyInstance): Promise<void> {
  app.post("/v1/sizing", { schema: contracts.size }, async (request, reply) => {
    const input = parseOr400(sizingRequestSchema, request.body);
    const outcome = size(input);
    if (!outcome.ok) throw engineIssuesTo400(outcome.issues);
    // The default serialiser's JSON, as bytes: see json-bytes.ts.
    return reply.type("application/json; charset=utf-8").send(jsonBytes(outcome.result));
  });
}
