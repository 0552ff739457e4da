import type { FastifyInstance } from "fastify";
import swagger from "@fastify/swagger";
import swaggerUi from "@fastify/swagger-ui";
import { openapiDocument } from "../openapi.js";

/** /openapi.json and interactive docs at /docs, all served locally. */
export async function docsRoutes(app: FastifyInstance): Promise<void> {
  const document = openapiDocument();
  await app.register(swagger, { mode: "static", specification: { document: document as never } });
  await app.register(swaggerUi, { routePrefix: "/docs" });
  app.get("/openapi.json", async () => document);
}
