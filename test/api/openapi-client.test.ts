import type { AddressInfo } from "node:net";
import { Ajv2020, type ValidateFunction } from "ajv/dist/2020.js";
import type { FastifyInstance } from "fastify";
import createClient, { type Client } from "openapi-fetch";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { components, paths } from "../generated/api.js";
import { makeTestApp } from "../helpers/app.js";
import { adminKeyOf } from "../helpers/auth.js";
import { exampleSizingBody } from "../helpers/bodies.js";
import { weekCsv } from "../helpers/routes.js";
import { buildingBody, surveyBody } from "../store/fixtures.js";

/**
 * The document tells the truth: a client no one here wrote (openapi-fetch), typed by the types openapi-typescript
 * generated from the document (test/generated/api.d.ts; `npm run typecheck` checks every call below against them),
 * drives every operation of the document against the app listening on a loopback port. Each answer must have the
 * status expected and a media type the document lists for that status, and a JSON body must validate against the
 * documented schema (Ajv, JSON Schema 2020-12, with the document's own components).
 */

type Json = Record<string, any>;
let app: FastifyInstance;
let client: Client<paths>;
let doc: Json;
const ajv = new Ajv2020({ strict: false, allErrors: true, validateFormats: false, verbose: true });
const validators = new Map<string, ValidateFunction>();
const called = new Set<string>();

beforeAll(async () => {
  app = await makeTestApp();
  await app.listen({ host: "127.0.0.1", port: 0 });
  const { port } = app.server.address() as AddressInfo;
  client = createClient<paths>({ baseUrl: `http://127.0.0.1:${port}`, headers: { authorization: `Bearer ${adminKeyOf(app)}` } });
  const served = await client.GET("/openapi.json");
  doc = served.data as Json;
  ajv.addSchema(doc, "openapi.json");
});
afterAll(async () => {
  await app.close();
});

const pointer = (...parts: string[]) => parts.map((p) => p.replace(/~/g, "~0").replace(/\//g, "~1")).join("/");

/** The documented schema of an answer, compiled once: a JSON pointer into the served document. */
function validatorFor(path: string, method: string, status: string, mediaType: string): ValidateFunction {
  const ref = `openapi.json#/${pointer("paths", path, method, "responses", status, "content", mediaType, "schema")}`;
  let v = validators.get(ref);
  if (!v) validators.set(ref, (v = ajv.compile({ $ref: ref })));
  return v;
}

/**
 * Check one answer against the document: the status is the one expected, the operation documents that status,
 * the answer's media type is one it lists, and a JSON body validates against its schema.
 */
function expectDocumented(path: string, method: string, expected: number, result: { response: Response; data?: unknown; error?: unknown }): void {
  const { response } = result;
  const op = doc.paths[path]?.[method];
  expect(op, `${method} ${path} is in the document`).toBeDefined();
  called.add(op.operationId);
  const body = response.ok ? result.data : result.error;
  expect(response.status, `${method} ${path}: ${JSON.stringify(body)?.slice(0, 300)}`).toBe(expected);
  const documented = op.responses[String(expected)];
  expect(documented, `${method} ${path} documents ${expected}`).toBeDefined();
  const mediaType = (response.headers.get("content-type") ?? "").split(";")[0]!.trim();
  if (!documented.content) {
    expect(mediaType, `${method} ${path} ${expected} has no body`).toBe("");
    return;
  }
  expect(Object.keys(documented.content), `${method} ${path} ${expected}`).toContain(mediaType);
  if (mediaType.endsWith("json")) {
    const validate = validatorFor(path, method, String(expected), mediaType);
    expect(
      validate(body),
      `${method} ${path} ${expected}: ${JSON.stringify(validate.errors?.slice(0, 5).map((e) => [e.instancePath, e.message, e.params]))}`,
    ).toBe(true);
  } else {
    expect(body, `${method} ${path} ${expected} has a body`).toBeTruthy();
  }
}

type Upload = NonNullable<paths["/v1/interval-analyses"]["post"]["requestBody"]>["content"];
/** The upload as the document describes it: CSV text as is, or a form with the option fields first and the file last. */
const upload = (b: Upload["text/csv"] | Upload["multipart/form-data"]): string | FormData => {
  if (typeof b === "string") return b;
  const fd = new FormData();
  for (const [name, value] of Object.entries(b)) if (name !== "file" && value !== undefined) fd.append(name, value);
  fd.append("file", new Blob([b.file], { type: "text/csv" }), "week.csv");
  return fd;
};
/** The fixtures are plain objects: say which documented body each one is (the typecheck then holds the call to it). */
type Body<Name extends keyof components["schemas"]> = components["schemas"][Name];
const sizingBody = () => exampleSizingBody() as Body<"SizingRequestInput">;
const csvHeaders = { "content-type": "text/csv" };

describe("a generated client drives every operation", () => {
  it("the open routes: health, the document, the problem pages", async () => {
    expectDocumented("/health", "get", 200, await client.GET("/health"));
    expectDocumented("/ready", "get", 200, await client.GET("/ready"));
    expectDocumented("/openapi.json", "get", 200, await client.GET("/openapi.json"));
    expectDocumented("/problems", "get", 200, await client.GET("/problems", { parseAs: "text" }));
    expectDocumented(
      "/problems/{type}",
      "get",
      200,
      await client.GET("/problems/{type}", { params: { path: { type: "validation" } }, parseAs: "text" }),
    );
    expectDocumented("/problems/{type}", "get", 404, await client.GET("/problems/{type}", { params: { path: { type: "no-such-type" } } }));
  });

  it("the stateless computations and a sizing's report", async () => {
    expectDocumented("/v1/sizing", "post", 200, await client.POST("/v1/sizing", { body: sizingBody() }));
    // A body the schema refuses: the 400 is a documented problem naming the field.
    const bad = await client.POST("/v1/sizing", { body: { ...sizingBody(), targetPF: 2 } });
    expectDocumented("/v1/sizing", "post", 400, bad);
    expect((bad.error as Json).errors[0].path).toBe("targetPF");
    expectDocumented("/v1/harmonics/scan", "post", 200, await client.POST("/v1/harmonics/scan", { body: sizingBody() }));
    expectDocumented("/v1/sizing/report", "post", 200, await client.POST("/v1/sizing/report", { body: sizingBody(), parseAs: "text" }));
    const pdf = await client.POST("/v1/sizing/report", {
      params: { query: { format: "pdf", paper: "letter" } },
      body: sizingBody(),
      parseAs: "arrayBuffer",
    });
    expectDocumented("/v1/sizing/report", "post", 200, pdf);
    expect(
      Buffer.from(pdf.data as ArrayBuffer)
        .subarray(0, 5)
        .toString(),
    ).toBe("%PDF-");
  });

  it("interval data, as CSV and as a form", async () => {
    expectDocumented(
      "/v1/interval-analyses",
      "post",
      200,
      await client.POST("/v1/interval-analyses", { body: weekCsv, bodySerializer: upload, headers: csvHeaders }),
    );
    const viaForm = await client.POST("/v1/interval-analyses", { body: { file: weekCsv, targetPF: "0.97" }, bodySerializer: upload });
    expectDocumented("/v1/interval-analyses", "post", 200, viaForm);
    expect((viaForm.data as Json).targetPF).toBe(0.97);
  });

  it("buildings, surveys, stored analyses and reports, keys and the audit log", async () => {
    const created = await client.POST("/v1/buildings", {
      params: { header: { "idempotency-key": '"client-1"' } },
      body: buildingBody({ name: "Client hall" }) as Body<"NewBuildingInput">,
    });
    expectDocumented("/v1/buildings", "post", 201, created);
    const id = created.data!.id;
    const building = { params: { path: { id } } };
    expectDocumented("/v1/buildings", "get", 200, await client.GET("/v1/buildings", { params: { query: { q: "client", limit: 5 } } }));
    expectDocumented("/v1/buildings/{id}", "get", 200, await client.GET("/v1/buildings/{id}", building));
    expectDocumented("/v1/buildings/{id}", "get", 404, await client.GET("/v1/buildings/{id}", { params: { path: { id: "bld_unknown" } } }));
    expectDocumented(
      "/v1/buildings/{id}",
      "patch",
      200,
      await client.PATCH("/v1/buildings/{id}", { ...building, body: { notes: "read by the generated client" } }),
    );
    expectDocumented("/v1/buildings/{id}/history", "get", 200, await client.GET("/v1/buildings/{id}/history", building));

    const stored = await client.POST("/v1/buildings/{id}/interval-analyses", {
      ...building,
      body: weekCsv,
      bodySerializer: upload,
      headers: csvHeaders,
    });
    expectDocumented("/v1/buildings/{id}/interval-analyses", "post", 201, stored);
    expectDocumented("/v1/buildings/{id}/interval-analyses", "get", 200, await client.GET("/v1/buildings/{id}/interval-analyses", building));
    expectDocumented(
      "/v1/interval-analyses/{id}",
      "get",
      200,
      await client.GET("/v1/interval-analyses/{id}", { params: { path: { id: stored.data!.id } } }),
    );

    const survey = await client.POST("/v1/buildings/{id}/surveys", { ...building, body: surveyBody() as Body<"NewSurveyInput"> });
    expectDocumented("/v1/buildings/{id}/surveys", "post", 201, survey);
    const s = { params: { path: { id: survey.data!.id } } };
    expectDocumented(
      "/v1/buildings/{id}/surveys",
      "get",
      200,
      await client.GET("/v1/buildings/{id}/surveys", { params: { path: { id }, query: { from: "2000-01-01" } } }),
    );
    expectDocumented("/v1/buildings/{id}/trend", "get", 200, await client.GET("/v1/buildings/{id}/trend", building));
    expectDocumented("/v1/buildings/{id}/bank-health", "get", 200, await client.GET("/v1/buildings/{id}/bank-health", building));
    expectDocumented("/v1/surveys/{id}", "get", 200, await client.GET("/v1/surveys/{id}", s));
    expectDocumented(
      "/v1/surveys/{id}/revisions",
      "post",
      201,
      await client.POST("/v1/surveys/{id}/revisions", { ...s, body: { ...(surveyBody() as Body<"NewSurveyInput">), reason: "a second look" } }),
    );
    expectDocumented(
      "/v1/surveys/{id}/revisions/{n}",
      "get",
      200,
      await client.GET("/v1/surveys/{id}/revisions/{n}", { params: { path: { id: survey.data!.id, n: "2" } } }),
    );
    expectDocumented("/v1/surveys/{id}/loads.csv", "get", 200, await client.GET("/v1/surveys/{id}/loads.csv", { ...s, parseAs: "text" }));
    expectDocumented(
      "/v1/surveys/{id}/report",
      "get",
      200,
      await client.GET("/v1/surveys/{id}/report", { params: { path: s.params.path, query: { revision: "1" } }, parseAs: "text" }),
    );
    expectDocumented("/v1/surveys/{id}/report.pdf", "get", 200, await client.GET("/v1/surveys/{id}/report.pdf", { ...s, parseAs: "arrayBuffer" }));
    const verdict = await client.GET("/v1/surveys/{id}/verdict", { params: { path: s.params.path, query: { revision: "1" } } });
    expectDocumented("/v1/surveys/{id}/verdict", "get", 200, verdict);
    expect(verdict.data!.revision).toBe(1);

    const key = await client.POST("/v1/keys", { body: { role: "auditor", label: "generated client" } });
    expectDocumented("/v1/keys", "post", 201, key);
    expectDocumented("/v1/keys", "get", 200, await client.GET("/v1/keys"));
    expectDocumented("/v1/keys/{id}", "delete", 204, await client.DELETE("/v1/keys/{id}", { params: { path: { id: key.data!.id } } }));
    expectDocumented("/v1/audit-log", "get", 200, await client.GET("/v1/audit-log", { params: { query: { limit: 100 } } }));
  });

  it("has called every operation of the document", () => {
    const all = Object.values(doc.paths as Json).flatMap((item) => Object.values(item as Json).map((op) => (op as Json).operationId));
    expect(all.filter((operationId) => !called.has(operationId))).toEqual([]);
  });
});
