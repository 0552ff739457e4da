import { connect } from "node:net";
import { readdirSync, readFileSync, statSync } from "node:fs";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import type { FastifyInstance } from "fastify";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { isProblemSlug, PROBLEM_TYPES } from "../../src/http/problem-types.js";
import { api } from "../helpers/auth.js";
import { exampleSizingBody } from "../helpers/bodies.js";
import { makeStoreApp } from "../helpers/db.js";

let app: FastifyInstance;
/** The security headers of an ordinary answer (GET /health), to compare the unusual answers with. */
let baseline: Record<string, string>;

// helmet's headers as this service sets them (src/http/security.ts)
const SECURITY_HEADERS = [
  "content-security-policy",
  "strict-transport-security",
  "x-content-type-options",
  "x-frame-options",
  "referrer-policy",
  "cross-origin-opener-policy",
  "cross-origin-resource-policy",
  "x-permitted-cross-domain-policies",
];

beforeAll(async () => {
  ({ app } = await makeStoreApp());
  const health = await request(app.server).get("/health");
  baseline = Object.fromEntries(SECURITY_HEADERS.map((h) => [h, health.headers[h] as string]));
  for (const h of SECURITY_HEADERS) expect(baseline[h], h).toBeTruthy();
});
afterAll(() => app.close());

const securityHeadersOf = (headers: Record<string, unknown>) => Object.fromEntries(SECURITY_HEADERS.map((h) => [h, headers[h]]));

describe("405 Method Not Allowed", () => {
  it("answers a known path with a wrong method by 405, listing its methods in Allow (RFC 9110 §15.5.6)", async () => {
    const cases: [string, string, string][] = [
      ["PUT", "/v1/buildings", "GET, HEAD, POST"],
      ["DELETE", "/v1/buildings/bld_whatever", "GET, HEAD, PATCH"],
      ["GET", "/v1/sizing", "POST"],
      ["DELETE", "/health", "GET, HEAD"],
      ["POST", "/", "GET, HEAD"],
    ];
    for (const [method, path, allow] of cases) {
      const r = await api(app)[method.toLowerCase() as "put" | "delete" | "get" | "post"](path);
      expect(r.status, `${method} ${path}`).toBe(405);
      expect(r.headers.allow).toBe(allow);
      expect(r.headers["content-type"]).toMatch(/^application\/problem\+json/);
      expect(r.body).toMatchObject({ status: 405, type: "/problems/method-not-allowed", instance: path });
      expect(r.body.detail).toContain(allow);
      expect(securityHeadersOf(r.headers)).toEqual(baseline);
    }
  });

  it("keeps 404 for a path no method has, and 401 before either on /v1 without a key", async () => {
    const none = await api(app).put("/v1/nothing-here");
    expect(none.status).toBe(404);
    expect(none.headers.allow).toBeUndefined();
    expect((await request(app.server).put("/v1/buildings")).status).toBe(401);
  });
});

describe("414 URI Too Long and a broken URL", () => {
  it("answers a path segment over 100 characters with 414 problem+json and the usual security headers", async () => {
    const r = await api(app).get(`/v1/surveys/${"s".repeat(101)}`);
    expect(r.status).toBe(414);
    expect(r.headers["content-type"]).toMatch(/^application\/problem\+json/);
    expect(r.body).toMatchObject({ status: 414, type: "/problems/uri-too-long", errors: [{ path: "url" }] });
    expect(securityHeadersOf(r.headers)).toEqual(baseline);
    expect(r.headers["x-request-id"]).toBeTruthy();
    // 100 characters is still a path: a plain 404 (no such survey)
    expect((await api(app).get(`/v1/surveys/${"s".repeat(100)}`)).status).toBe(404);
  });

  it("answers a %-escape that does not decode with 400 problem+json and the usual security headers", async () => {
    const r = await api(app).get("/v1/surveys/%E0%A4%A");
    expect(r.status).toBe(400);
    expect(r.headers["content-type"]).toMatch(/^application\/problem\+json/);
    expect(r.body).toMatchObject({ status: 400, type: "/problems/bad-request" });
    expect(securityHeadersOf(r.headers)).toEqual(baseline);
  });
});

/** One raw HTTP/1.1 exchange: what Node's parser refuses never reaches fastify, nor any HTTP client's checks. */
async function rawExchange(port: number, head: string): Promise<{ status: number; headers: Record<string, string>; body: string }> {
  const text = await new Promise<string>((resolve, reject) => {
    const socket = connect(port, "127.0.0.1", () => socket.write(head));
    let got = "";
    socket.setEncoding("utf8");
    socket.on("data", (d: string) => (got += d));
    socket.on("end", () => resolve(got));
    socket.on("error", reject);
  });
  const [headText = "", body = ""] = text.split("\r\n\r\n");
  const [statusLine = "", ...lines] = headText.split("\r\n");
  const headers = Object.fromEntries(lines.map((l) => [l.slice(0, l.indexOf(":")).toLowerCase(), l.slice(l.indexOf(":") + 1).trim()]));
  return { status: Number(statusLine.split(" ")[1]), headers, body };
}

describe("requests Node's HTTP parser refuses", () => {
  it("answers a request head over 16 KiB (a URL that long) with 431 problem+json and the usual security headers", async () => {
    const server = await makeStoreApp();
    try {
      await server.app.listen({ port: 0, host: "127.0.0.1" });
      const port = (server.app.server.address() as { port: number }).port;
      const r = await rawExchange(port, `GET /v1/buildings?q=${"a".repeat(20_000)} HTTP/1.1\r\nHost: x\r\n\r\n`);
      expect(r.status).toBe(431);
      expect(r.headers["content-type"]).toMatch(/^application\/problem\+json/);
      expect(JSON.parse(r.body)).toMatchObject({ status: 431, type: "/problems/headers-too-large", errors: [{ path: "headers" }] });
      expect(securityHeadersOf(r.headers)).toEqual(baseline);
      const garbled = await rawExchange(port, "NOT HTTP AT ALL\r\n\r\n");
      expect(garbled.status).toBe(400);
      expect(JSON.parse(garbled.body)).toMatchObject({ status: 400, type: "/problems/bad-request" });
      expect(securityHeadersOf(garbled.headers)).toEqual(baseline);
    } finally {
      await server.app.close();
    }
  });
});

describe("problem type pages", () => {
  it("serves a short HTML page for every problem type, without a key, with the usual security headers", async () => {
    for (const [slug, doc] of Object.entries(PROBLEM_TYPES)) {
      const r = await request(app.server).get(`/problems/${slug}`);
      expect(r.status, slug).toBe(200);
      expect(r.headers["content-type"]).toMatch(/^text\/html/);
      expect(securityHeadersOf(r.headers)).toEqual(baseline);
      expect(r.text).toContain(`<h1>${doc.title}</h1>`);
      expect(r.text).toContain("What it means");
      expect(r.text).toContain("What to do");
    }
    const index = await request(app.server).get("/problems");
    expect(index.status).toBe(200);
    for (const slug of Object.keys(PROBLEM_TYPES)) expect(index.text).toContain(`href="/problems/${slug}"`);
    const unknown = await request(app.server).get("/problems/no-such-type");
    expect(unknown.status).toBe(404);
    expect(unknown.headers["content-type"]).toMatch(/^application\/problem\+json/);
  });

  it("every problem type named in src/ has a page, every page a use, and a problem's type opens it", async () => {
    const root = fileURLToPath(new URL("../../src/", import.meta.url));
    const files = (dir: string): string[] =>
      readdirSync(dir).flatMap((name) => {
        const path = join(dir, name);
        return statSync(path).isDirectory() ? files(path) : path.endsWith(".ts") ? [path] : [];
      });
    const used = new Set<string>();
    for (const file of files(root)) {
      const text = readFileSync(file, "utf8");
      // problem(status, "slug", …) calls and the interval upload's table of { status, slug, title }
      for (const m of text.matchAll(/problem\(\s*(?:\d+|status|f\.status)\s*,\s*"([a-z-]+)"/g)) used.add(m[1] as string);
      for (const m of text.matchAll(/\bslug:\s*"([a-z-]+)"/g)) used.add(m[1] as string);
    }
    // and no page for a type nothing answers with
    expect([...used].sort()).toEqual(Object.keys(PROBLEM_TYPES).sort());
    for (const slug of used) {
      expect(isProblemSlug(slug), `${slug} is used in src/ but has no entry in PROBLEM_TYPES`).toBe(true);
      expect((await request(app.server).get(`/problems/${slug}`)).status, slug).toBe(200);
    }
    // a real answer: its type, resolved against the request's URL (RFC 9457 §3.1.1), is the page
    const answer = await api(app).post("/v1/buildings").send({});
    expect(answer.status).toBe(400);
    const page = await request(app.server).get(new URL(answer.body.type, "http://service.example/v1/buildings").pathname);
    expect(page.status).toBe(200);
    expect(page.text).toContain(PROBLEM_TYPES.validation.title);
  });
});

describe("report CSP", () => {
  it("forbids framing the HTML report: frame-ancestors 'none'", async () => {
    const r = await api(app).post("/v1/sizing/report").send(exampleSizingBody());
    expect(r.status).toBe(200);
    expect(r.headers["content-type"]).toMatch(/^text\/html/);
    const csp = String(r.headers["content-security-policy"])
      .split(";")
      .map((d) => d.trim());
    expect(csp).toContain("frame-ancestors 'none'");
    expect(csp).toContain("default-src 'none'");
  });
});
