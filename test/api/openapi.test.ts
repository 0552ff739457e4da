import { readFileSync } from "node:fs";
import type { FastifyInstance } from "fastify";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { OPENAPI_PATH, openapiText } from "../../scripts/write-openapi.js";
import { makeTestApp } from "../helpers/app.js";
import { api } from "../helpers/auth.js";

let app: FastifyInstance;
beforeAll(async () => {
  app = await makeTestApp();
});
afterAll(async () => {
  await app.close();
});

describe("OpenAPI document", () => {
  it("the committed openapi/openapi.json is the generated document", () => {
    let committed = "";
    try {
      committed = readFileSync(OPENAPI_PATH, "utf8");
    } catch {
      // missing file: fall through to the message below
    }
    const generated = openapiText();
    if (committed !== generated) {
      expect.fail(
        `openapi/openapi.json is out of date with the schemas (or missing): run \`npm run openapi\` and commit the file` +
          ` (committed ${committed.length} bytes, generated ${generated.length} bytes)`,
      );
    }
  });

  it("is OpenAPI 3.1 and documents POST /v1/sizing with a JSON body and problem responses", () => {
    const doc = JSON.parse(openapiText());
    expect(doc.openapi).toBe("3.1.0");
    const op = doc.paths["/v1/sizing"]?.post;
    expect(op).toBeDefined();
    expect(op.requestBody.content["application/json"].schema.type).toBe("object");
    expect(op.requestBody.content["application/json"].schema.required).toEqual(expect.arrayContaining(["system", "loads"]));
    for (const status of ["400", "413", "415"]) expect(op.responses[status].content).toHaveProperty(["application/problem+json"]);
    expect(doc.components.schemas.Problem).toBeDefined();
  });

  it("GET /openapi.json serves the same document", async () => {
    const r = await api(app).get("/openapi.json");
    expect(r.status).toBe(200);
    expect(r.headers["content-type"]).toMatch(/^application\/json/);
    expect(r.body).toEqual(JSON.parse(openapiText()));
  });

  it("GET /docs answers with a redirect or an HTML page", async () => {
    const r = await api(app).get("/docs");
    if (r.status >= 300 && r.status < 400) {
      expect(r.headers.location).toBeTruthy();
      const next = await api(app).get(new URL(r.headers.location as string, "http://x/docs").pathname);
      expect(next.status).toBe(200);
      expect(next.headers["content-type"]).toMatch(/text\/html/);
    } else {
      expect(r.status).toBe(200);
      expect(r.headers["content-type"]).toMatch(/text\/html/);
      expect(r.text).toMatch(/<html/i);
    }
  });
});
