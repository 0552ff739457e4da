import type { FastifyInstance } from "fastify";
import * as contracts from "../contracts/service.js";
import swaggerUi from "@fastify/swagger-ui";

/**
 * /openapi.json and interactive docs at /docs, all served locally. The document is the one @fastify/swagger
 * generated from the app's routes (src/http/openapi.ts installs it before any route).
 */
export async function docsRoutes(app: FastifyInstance): Promise<void> {
  await app.register(swaggerUi, { routePrefix: "/docs" });
  app.get("/openapi.json", { schema: contracts.openapiDocument }, async () => app.swagger());
}
