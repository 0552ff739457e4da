import { readFileSync } from "node:fs";
import type { FastifyInstance } from "fastify";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { API_TYPES_PATH, apiTypesText, generatedDocument, OPENAPI_PATH, openapiText } from "../../scripts/write-openapi.js";
import { formAssets } from "../../src/form/plugin.js";
import { makeTestApp } from "../helpers/app.js";
import { api } from "../helpers/auth.js";
import { label, openapiPath, routesOf, type AppRoute } from "../helpers/routes.js";

type Json = Record<string, any>;
let app: FastifyInstance;
let doc: Json;
beforeAll(async () => {
  app = await makeTestApp();
  doc = await generatedDocument();
});
afterAll(async () => {
  await app.close();
});

/**
 * Routes the document leaves out on purpose: the survey page's static files (HTML, CSS, scripts and the service
 * worker of the tablet form, not an API) and the interactive docs viewer under /docs (its page, assets and its own
 * copies of this document). Any other route must be in the document.
 */
const formUrls = new Set(formAssets().map((a) => a.url));
const leftOut = (r: AppRoute) => formUrls.has(r.url) || r.url === "/docs" || r.url.startsWith("/docs/");

const METHODS = ["get", "put", "post", "delete", "options", "head", "patch", "trace"];
const operationsOf = (d: Json) =>
  Object.entries(d.paths as Json).flatMap(([path, item]) =>
    Object.entries(item as Json)
      .filter(([m]) => METHODS.includes(m))
      .map(([method, op]) => ({ method: method.toUpperCase(), path, op: op as Json })),
  );

function committed(path: string): string {
  try {
    return readFileSync(path, "utf8");
  } catch {
    return ""; // missing file: the comparison below says so
  }
}

describe("OpenAPI document", () => {
  it("the committed openapi/openapi.json is the document generated from the app", () => {
    const generated = openapiText(doc);
    const file = committed(OPENAPI_PATH);
    if (file !== generated) {
      expect.fail(
        `openapi/openapi.json is out of date with the routes (or missing): run \`npm run openapi\` and commit the file` +
          ` (committed ${file.length} bytes, generated ${generated.length} bytes)`,
      );
    }
  });

  it("the committed test/generated/api.d.ts is openapi-typescript's output for it", async () => {
    const generated = await apiTypesText(doc);
    const file = committed(API_TYPES_PATH);
    if (file !== generated) {
      expect.fail(`test/generated/api.d.ts is out of date with the document (or missing): run \`npm run openapi\` and commit it`);
    }
  });

  it("documents every route of the app but the explicit list, and nothing that is not a route", () => {
    const routes = routesOf(app);
    const documented = new Set(operationsOf(doc).map((o) => `${o.method} ${o.path}`));
    const missing = routes.filter((r) => !leftOut(r) && !documented.has(`${r.method} ${openapiPath(r.url)}`)).map(label);
    expect(missing, "routes missing from the document: give each a contract (src/http/contracts/) as its schema").toEqual([]);
    const real = new Set(routes.map((r) => `${r.method} ${openapiPath(r.url)}`));
    expect([...documented].filter((o) => !real.has(o))).toEqual([]);
    // The routes the hand-kept list once missed, by name.
    for (const o of [
      "GET /v1/surveys/{id}/report",
      "GET /v1/surveys/{id}/report.pdf",
      "POST /v1/sizing/report",
      "POST /v1/interval-analyses",
      "GET /problems/{type}",
    ]) {
      expect(documented).toContain(o);
    }
    // The left-out list is not a blanket: it holds only the form's files and the docs viewer.
    expect(routes.filter(leftOut).every((r) => r.method === "GET" && r.contract === undefined)).toBe(true);
  });

  it("names the security of every operation: the API key under /v1, none elsewhere", () => {
    expect(doc.components.securitySchemes.apiKey).toMatchObject({ type: "http", scheme: "bearer" });
    for (const { method, path, op } of operationsOf(doc)) {
      expect(op.security, `${method} ${path}`).toEqual(path.startsWith("/v1/") ? [{ apiKey: [] }] : []);
      if (path.startsWith("/v1/")) expect(Object.keys(op.responses), `${method} ${path}`).toEqual(expect.arrayContaining(["401", "403", "429"]));
    }
    expect(doc.servers).toEqual([expect.objectContaining({ url: "/" })]);
  });

  it("documents the multipart upload with its file field and the CSV body", () => {
    for (const path of ["/v1/interval-analyses", "/v1/buildings/{id}/interval-analyses"]) {
      const content = doc.paths[path].post.requestBody.content;
      expect(Object.keys(content).sort()).toEqual(["multipart/form-data", "text/csv"]);
      expect(content["multipart/form-data"].schema.required).toEqual(["file"]);
      expect(content["multipart/form-data"].schema.properties).toHaveProperty("targetPF");
    }
  });

  it("writes shared schemas once, as named components", () => {
    const sizing = doc.paths["/v1/sizing"].post;
    expect(sizing.requestBody.content["application/json"].schema).toEqual({ $ref: "#/components/schemas/SizingRequestInput" });
    expect(doc.paths["/v1/sizing/report"].post.requestBody.content["application/json"].schema).toEqual({
      $ref: "#/components/schemas/SizingRequestInput",
    });
    expect(doc.components.schemas.SizingRequestInput.required).toEqual(expect.arrayContaining(["system", "loads"]));
    for (const status of ["400", "413", "415"]) {
      expect(sizing.responses[status].content["application/problem+json"].schema).toEqual({ $ref: "#/components/schemas/Problem" });
    }
    // Every named component is used, and the measurement union (written inline in every body before) appears once.
    const text = JSON.stringify(doc);
    for (const name of Object.keys(doc.components.schemas)) expect(text, name).toContain(`"#/components/schemas/${name}"`);
    expect(text.split('"v_i_pf"').length - 1).toBeLessThanOrEqual(2); // MeasurementInput and Measurement (the stored inputs)
  });

  it("keeps the schemas' own words: parameter and property descriptions", () => {
    const params = doc.paths["/v1/buildings/{id}"].patch.parameters as Json[];
    expect(params.find((p) => p.name === "idempotency-key")?.description).toMatch(/same key with the same request/);
    expect(params.find((p) => p.name === "id")?.description).toBeTruthy();
    expect(doc.components.schemas.NewBuildingInput.properties.economics.description).toMatch(/savings and payback/);
    const page = doc.paths["/v1/buildings/{id}/interval-analyses"].get.responses["200"].content["application/json"].schema;
    expect(page.properties.nextCursor.description).toMatch(/next page/);
  });

  it("GET /openapi.json serves the same document", async () => {
    const r = await api(app).get("/openapi.json");
    expect(r.status).toBe(200);
    expect(r.headers["content-type"]).toMatch(/^application\/json/);
    expect(r.body).toEqual(JSON.parse(openapiText(doc)));
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
