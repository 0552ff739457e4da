import { describe, expect, it } from "vitest";
import request from "supertest";
import { generateKey, hashSecret, parseKey, secretMatches } from "../../src/auth/keys.js";
import { api, keyFor } from "../helpers/auth.js";
import { makeStoreApp, rowCounts } from "../helpers/db.js";
import { buildingBody } from "../store/fixtures.js";

describe("keys", () => {
  it("are 256-bit secrets behind an 8-character prefix, compared by hash", () => {
    const a = generateKey();
    const parsed = parseKey(a.key)!;
    expect(parsed.prefix).toBe(a.prefix);
    expect(Buffer.from(parsed.secret, "base64url")).toHaveLength(32);
    expect(a.secretSha256).toBe(hashSecret(parsed.secret));
    expect(secretMatches(parsed.secret, a.secretSha256)).toBe(true);
    expect(secretMatches(parsed.secret, hashSecret(parseKey(generateKey().key)!.secret))).toBe(false);
    // unknown prefix: compared with the dummy hash, never a match
    expect(secretMatches(parsed.secret, undefined)).toBe(false);
    expect(new Set(Array.from({ length: 200 }, () => generateKey().prefix)).size).toBe(200);
  });
});

describe("rate limit", () => {
  it("answers 429 problem+json past RATE_LIMIT_PER_MINUTE per key, writing nothing; another key and anonymous callers count apart", async () => {
    const { app } = await makeStoreApp({ RATE_LIMIT_PER_MINUTE: 3 });
    try {
      const second = await keyFor(app, "surveyor");
      for (let i = 0; i < 3; i++) expect((await api(app).get("/v1/buildings")).status).toBe(200);
      const before = await rowCounts(app.store);
      const limited = await api(app).post("/v1/buildings").send(buildingBody());
      expect(limited.status).toBe(429);
      expect(limited.headers["content-type"]).toMatch(/^application\/problem\+json/);
      expect(limited.headers["retry-after"]).toBeDefined();
      expect(limited.body).toMatchObject({ status: 429, title: "Too many requests" });
      expect(await rowCounts(app.store)).toEqual(before);
      expect((await api(app, second).get("/v1/buildings")).status).toBe(200);
      for (let i = 0; i < 3; i++) expect((await request(app.server).get("/v1/buildings")).status).toBe(401);
      expect((await request(app.server).get("/v1/buildings")).status).toBe(429);
    } finally {
      await app.close();
    }
  });
});

describe("headers", () => {
  it("sends security headers with CSP default-src 'none' on the API, a relaxed CSP on /docs only", async () => {
    const { app } = await makeStoreApp();
    try {
      const r = await api(app).get("/v1/buildings");
      expect(r.headers["content-security-policy"]).toMatch(/^default-src 'none'/);
      expect(r.headers["x-content-type-options"]).toBe("nosniff");
      expect(r.headers["strict-transport-security"]).toBeDefined();
      const docs = await request(app.server).get("/docs").redirects(3);
      expect(docs.status).toBe(200);
      expect(docs.headers["content-security-policy"]).toContain("script-src 'self'");
      const health = await request(app.server).get("/health");
      expect(health.headers["content-security-policy"]).not.toContain("script-src");
      expect(app.server.requestTimeout).toBe(30_000);
      expect(app.initialConfig.connectionTimeout).toBe(30_000);
    } finally {
      await app.close();
    }
  });

  it("allows CORS for the configured origins only, preflights without a key", async () => {
    const { app } = await makeStoreApp({ CORS_ORIGINS: "https://tablet.example, http://localhost:5173" });
    try {
      const ok = await api(app).get("/v1/buildings").set("origin", "https://tablet.example");
      expect(ok.headers["access-control-allow-origin"]).toBe("https://tablet.example");
      const other = await api(app).get("/v1/buildings").set("origin", "https://elsewhere.example");
      expect(other.headers["access-control-allow-origin"]).toBeUndefined();
      const pre = await request(app.server)
        .options("/v1/buildings")
        .set("origin", "http://localhost:5173")
        .set("access-control-request-method", "POST")
        .set("access-control-request-headers", "authorization,content-type");
      expect(pre.status).toBe(204);
      expect(pre.headers["access-control-allow-headers"]).toContain("authorization");
    } finally {
      await app.close();
    }
    const { app: closed } = await makeStoreApp();
    try {
      const r = await api(closed).get("/v1/buildings").set("origin", "https://tablet.example");
      expect(r.headers["access-control-allow-origin"]).toBeUndefined();
    } finally {
      await closed.close();
    }
  });
});
