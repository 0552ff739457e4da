import type request from "supertest";
import type { FastifyInstance } from "fastify";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { problemSchema } from "../../src/http/schemas/results.js";
import { makeTestApp } from "../helpers/app.js";
import { exampleSizingBody } from "../helpers/bodies.js";
import { api, inject } from "../helpers/auth.js";

let app: FastifyInstance;
beforeAll(async () => {
  app = await makeTestApp();
});
afterAll(async () => {
  await app.close();
});

type Body = Record<string, any>;
const withBody = (mutate: (b: Body) => void) => () => {
  const b = exampleSizingBody();
  mutate(b);
  return b;
};
const m0 = (b: Body) => b.loads[0].measurement;

/** One row per rejection class: the body, and the path (dotted) the problem must name. */
const REJECTIONS: { name: string; body: () => Body; path: string; message?: RegExp }[] = [
  { name: "missing system", body: withBody((b) => delete b.system), path: "system" },
  { name: "frequencyHz 55", body: withBody((b) => (b.system.frequencyHz = 55)), path: "system.frequencyHz", message: /50 or 60/ },
  { name: "phases 2", body: withBody((b) => (b.system.phases = 2)), path: "system.phases", message: /1 or 3/ },
  { name: "system volts 40", body: withBody((b) => (b.system.voltageV = 40)), path: "system.voltageV", message: /between 50 and 35000/ },
  { name: "system volts 40000", body: withBody((b) => (b.system.voltageV = 40_000)), path: "system.voltageV", message: /between 50 and 35000/ },
  { name: "reading volts 40", body: withBody((b) => (m0(b).volts = 40)), path: "loads.0.measurement.volts" },
  { name: "reading volts 40000", body: withBody((b) => (m0(b).volts = 40_000)), path: "loads.0.measurement.volts" },
  { name: "pf 0", body: withBody((b) => (m0(b).pf = 0)), path: "loads.0.measurement.pf", message: /greater than 0/ },
  { name: "pf 1.2", body: withBody((b) => (m0(b).pf = 1.2)), path: "loads.0.measurement.pf", message: /at most 1/ },
  { name: "negative amps", body: withBody((b) => (m0(b).amps = -5)), path: "loads.0.measurement.amps" },
  { name: "amps as a string", body: withBody((b) => (m0(b).amps = "120")), path: "loads.0.measurement.amps" },
  {
    name: "unknown method",
    body: withBody((b) => (m0(b).method = "clamp_meter")),
    path: "loads.0.measurement.method",
    message: /method must be one of/,
  },
  {
    name: "kW > kVA (engine plausibility)",
    body: withBody((b) => (b.loads[0].measurement = { method: "kw_kva", kW: 120, kVA: 100 })),
    path: "loads.0.measurement.kW",
    message: /kW exceeds kVA/,
  },
  {
    name: "kW > V·I·√3 (engine plausibility)",
    // hand: √3·480·120/1000 = 99.77 kVA < 110 kW
    body: withBody((b) => (b.loads[0].measurement = { method: "v_i_kw", volts: 480, amps: 120, kW: 110 })),
    path: "loads.0.measurement.kW",
    message: /kW exceeds kVA/,
  },
  // issue 11 point 9: volts beyond 2× or below 0.4× the 480 V line voltage (hand: 150/480 = 0.31, 1000/480 = 2.08)
  {
    name: "reading 150 V on a 480 V system (engine)",
    body: withBody((b) => (m0(b).volts = 150)),
    path: "loads.0.measurement.volts",
    message: /less than 0\.4 times the system's 480 V/,
  },
  {
    name: "reading 1000 V on a 480 V system (engine)",
    body: withBody((b) => (m0(b).volts = 1000)),
    path: "loads.0.measurement.volts",
    message: /more than twice the system's 480 V/,
  },
  {
    name: "reading 480 V on a 4160 V system (engine)",
    body: withBody((b) => (b.system.voltageV = 4160)),
    path: "loads.0.measurement.volts",
    message: /480 V is less than 0\.4 times the system's 4160 V/,
  },
  { name: "target 0.7", body: withBody((b) => (b.targetPF = 0.7)), path: "targetPF", message: /between 0.8 and 1/ },
  { name: "target 1.01", body: withBody((b) => (b.targetPF = 1.01)), path: "targetPF" },
  { name: "no loads", body: withBody((b) => (b.loads = [])), path: "loads", message: /at least one load/ },
  {
    name: "2001 loads",
    body: withBody((b) => (b.loads = Array.from({ length: 2001 }, () => b.loads[0]))),
    path: "loads",
    message: /at most 2000 loads/,
  },
  { name: "unknown top-level field", body: withBody((b) => (b.surveyor = "J. Doe")), path: "surveyor", message: /"surveyor"/ },
  { name: "unknown load field", body: withBody((b) => (b.loads[0].colour = "red")), path: "loads.0.colour", message: /"colour"/ },
  { name: "unknown measurement field", body: withBody((b) => (m0(b).kvar = 3)), path: "loads.0.measurement.kvar", message: /"kvar"/ },
  {
    name: "spectrum order 51",
    body: withBody((b) => (b.loads[0].harmonics = [{ order: 51, pct: 2 }])),
    path: "loads.0.harmonics.0.order",
    message: /2 to 50/,
  },
  { name: "spectrum order 1", body: withBody((b) => (b.loads[0].harmonics = [{ order: 1, pct: 2 }])), path: "loads.0.harmonics.0.order" },
  {
    name: "spectrum negative pct",
    body: withBody((b) => (b.loads[0].harmonics = [{ order: 5, pct: -1 }])),
    path: "loads.0.harmonics.0.pct",
    message: /not be negative/,
  },
  {
    name: "spectrum sum > 300 %",
    body: withBody(
      (b) =>
        (b.loads[0].harmonics = [
          { order: 5, pct: 150 },
          { order: 7, pct: 100 },
          { order: 11, pct: 60 },
        ]),
    ),
    path: "loads.0.harmonics",
    message: /more than 300 %/,
  },
  { name: "sense unity on PF 0.78 (engine)", body: withBody((b) => (m0(b).sense = "unity")), path: "loads.0.measurement.sense" },
  { name: "impedancePct 0.5", body: withBody((b) => (b.transformer.impedancePct = 0.5)), path: "transformer.impedancePct" },
  { name: "reactorPct 25", body: withBody((b) => (b.proposedBank.reactorPct = 25)), path: "proposedBank.reactorPct" },
  { name: "bank without steps", body: withBody((b) => (b.proposedBank.steps = [])), path: "proposedBank.steps" },
  { name: "body is an array", body: () => [exampleSizingBody()] as unknown as Body, path: "" },
];

function expectProblem(r: request.Response, status: number): void {
  expect(r.status, JSON.stringify(r.body)).toBe(status);
  expect(r.headers["content-type"]).toMatch(/^application\/problem\+json/);
  expect(problemSchema.safeParse(r.body).success, JSON.stringify(r.body)).toBe(true);
  expect(r.body.status).toBe(status);
  expect(typeof r.body.type).toBe("string");
  expect(r.body.title.length).toBeGreaterThan(0);
  expect(r.body.detail.length).toBeGreaterThan(0);
}

describe("400 validation problems name the field", () => {
  it.each(REJECTIONS)("$name → 400 at '$path'", async ({ body, path, message }) => {
    const r = await api(app).post("/v1/sizing").send(body());
    expectProblem(r, 400);
    expect(Array.isArray(r.body.errors)).toBe(true);
    for (const e of r.body.errors) {
      expect(typeof e.path).toBe("string");
      expect(typeof e.message).toBe("string");
    }
    const hit = r.body.errors.find((e: { path: string }) => e.path === path);
    expect(hit, `errors: ${JSON.stringify(r.body.errors)}`).toBeDefined();
    if (message) expect(hit.message).toMatch(message);
    expect(r.body.type).toMatch(/\/validation$/);
  });

  it("several bad fields are all reported", async () => {
    const b = exampleSizingBody();
    b.system.frequencyHz = 55;
    b.targetPF = 0.5;
    const r = await api(app).post("/v1/sizing").send(b);
    expectProblem(r, 400);
    expect(r.body.errors.map((e: { path: string }) => e.path)).toEqual(expect.arrayContaining(["system.frequencyHz", "targetPF"]));
    expect(r.body.detail).toMatch(/2 fields are invalid/);
  });
});

describe("transport-level rejections", () => {
  it("empty body → 400 problem with errors", async () => {
    const r = await api(app).post("/v1/sizing").set("content-type", "application/json").send("");
    expectProblem(r, 400);
    expect(r.body.errors).toEqual([{ path: "", message: expect.stringMatching(/empty/) }]);
  });

  it("invalid JSON → 400 problem with errors", async () => {
    const r = await api(app).post("/v1/sizing").set("content-type", "application/json").send('{"system": {');
    expectProblem(r, 400);
    expect(r.body.errors).toHaveLength(1);
    expect(r.body.errors[0].path).toBe("");
  });

  it("JSON null → 400 at the body", async () => {
    const r = await api(app).post("/v1/sizing").set("content-type", "application/json").send("null");
    expectProblem(r, 400);
    expect(r.body.errors[0].path).toBe("");
  });

  it("a prototype-poisoning key → 400, not accepted", async () => {
    const r = await api(app).post("/v1/sizing").set("content-type", "application/json").send('{"__proto__": {"x": 1}}');
    expectProblem(r, 400);
  });

  it("wrong content type (application/xml) → 415 problem", async () => {
    const r = await api(app).post("/v1/sizing").set("content-type", "application/xml").send("<sizing/>");
    expectProblem(r, 415);
    expect(r.body.type).toMatch(/unsupported-media-type$/);
  });

  it("form-encoded body → 415 problem", async () => {
    const r = await api(app).post("/v1/sizing").type("form").send({ a: "1" });
    expectProblem(r, 415);
  });

  it("body over 1 MiB → 413 problem", async () => {
    const b = exampleSizingBody();
    b.loads[0].label = "x".repeat(1024 * 1024 + 16);
    const r = await inject(app, { method: "POST", url: "/v1/sizing", payload: JSON.stringify(b), headers: { "content-type": "application/json" } });
    expect(r.statusCode).toBe(413);
    expect(r.headers["content-type"]).toMatch(/^application\/problem\+json/);
    const body = r.json();
    expect(body).toMatchObject({ status: 413, title: "Request body too large" });
    expect(body.type).toMatch(/too-large$/);
    expect(body.detail).toMatch(/1048576 bytes/);
    expect(body.errors).toEqual([{ path: "", message: expect.any(String) }]);
  });

  it("the body limit follows the configuration", async () => {
    const small = await makeTestApp({ BODY_LIMIT_BYTES: 2048 });
    try {
      const b = exampleSizingBody();
      b.loads[0].label = "y".repeat(3000);
      const r = await api(small).post("/v1/sizing").send(b);
      expectProblem(r, 413);
    } finally {
      await small.close();
    }
  });

  it("415 problems carry errors[{path,message}] like every other rejection", async () => {
    const r = await api(app).post("/v1/sizing").set("content-type", "application/xml").send("<x/>");
    expect(r.body.errors).toEqual([{ path: "", message: expect.any(String) }]);
  });

  it("a text/plain body is answered 415, not 400", async () => {
    const r = await api(app).post("/v1/sizing").set("content-type", "text/plain").send("hello");
    expect(r.status).toBe(415);
  });
});
