import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { FastifyInstance } from "fastify";
import request from "supertest";
import { generateKey } from "../../src/auth/keys.js";
import { api, bearer, inject, keyFor } from "../helpers/auth.js";
import { buildingBody, surveyBody } from "../store/fixtures.js";
import { makeStoreApp, rowCounts } from "../helpers/db.js";
import { sqlRows } from "../helpers/store.js";

let app: FastifyInstance;
let adminKey: string;

beforeAll(async () => {
  ({ app, key: adminKey } = await makeStoreApp());
});
afterAll(() => app.close());

function expect401(r: { status: number; headers: Record<string, unknown>; body: any }, detail: RegExp): void {
  expect(r.status).toBe(401);
  expect(r.headers["content-type"]).toMatch(/^application\/problem\+json/);
  expect(r.headers["www-authenticate"]).toMatch(/^Bearer/);
  expect(r.body.detail).toMatch(detail);
}

describe("authentication", () => {
  it("refuses /v1 without a key, with a malformed header, a malformed key, an unknown key or a wrong secret", async () => {
    const known = adminKey.slice(0, 13);
    const cases: [Record<string, string>, RegExp][] = [
      [{}, /no Authorization header/],
      [{ authorization: adminKey }, /must be Bearer/],
      [{ authorization: `Basic ${adminKey}` }, /must be Bearer/],
      [{ authorization: "Bearer pfc_short" }, /not valid/],
      [bearer(generateKey().key), /not valid/],
      [bearer(known + generateKey().key.slice(13)), /not valid/],
    ];
    const before = await rowCounts(app.store);
    for (const [headers, detail] of cases) {
      expect401(await request(app.server).post("/v1/buildings").set(headers).send(buildingBody()), detail);
      expect401(await request(app.server).get("/v1/buildings").set(headers), detail);
    }
    expect(await rowCounts(app.store)).toEqual(before);
  });

  it("cannot be bypassed with an encoded or odd spelling of a /v1 path", async () => {
    for (const url of ["/%761/buildings", "/v1/%62uildings", "/%76%31/audit-log", "/v1/buildings/", "/./v1/buildings", "/x/../v1/keys"]) {
      const r = await request(app.server).get(url);
      expect([401, 404], `${url}: ${r.status}`).toContain(r.status);
      expect(r.headers["content-type"]).toMatch(/^application\/problem\+json/);
      if (r.status === 404) expect(JSON.stringify(r.body)).not.toContain("items");
    }
    expect((await request(app.server).get("/%761/buildings")).status).toBe(401);
  });

  it("leaves /health, /openapi.json and /docs open", async () => {
    expect((await request(app.server).get("/health")).status).toBe(200);
    expect((await request(app.server).get("/openapi.json")).status).toBe(200);
    expect((await request(app.server).get("/docs/")).status).toBeLessThan(400);
  });

  it("accepts a valid key and records its id as the actor in the audit log", async () => {
    const b = await api(app)
      .post("/v1/buildings")
      .send(buildingBody({ name: "Keyed hall" }));
    expect(b.status).toBe(201);
    const id = (await app.store.keys.findByPrefix(adminKey.slice(4, 12)))!.id;
    const log = (await api(app).get("/v1/audit-log")).body.items;
    expect(log[0]).toMatchObject({ actor: id, action: "building.create", resourceId: b.body.id });
  });
});

describe("roles", () => {
  it("lets a surveyor create and change buildings and surveys and read, but not keys or the audit log", async () => {
    const k = await keyFor(app, "surveyor");
    const b = await api(app, k)
      .post("/v1/buildings")
      .send(buildingBody({ name: "Surveyor hall" }));
    expect(b.status).toBe(201);
    expect((await api(app, k).patch(`/v1/buildings/${b.body.id}`).send({ notes: "fitted" })).status).toBe(200);
    expect((await api(app, k).post(`/v1/buildings/${b.body.id}/surveys`).send(surveyBody())).status).toBe(201);
    expect((await api(app, k).get(`/v1/buildings/${b.body.id}/history`)).status).toBe(200);
    const before = await rowCounts(app.store);
    for (const r of [
      await api(app, k).post("/v1/keys").send({ role: "admin" }),
      await api(app, k).get("/v1/keys"),
      await api(app, k).get("/v1/audit-log"),
    ]) {
      expect(r.status).toBe(403);
      expect(r.headers["content-type"]).toMatch(/^application\/problem\+json/);
      expect(r.body.detail).toMatch(/surveyor role may not/);
    }
    expect(await rowCounts(app.store)).toEqual(before);
  });

  it("lets an auditor read buildings, history and the audit log, and write nothing", async () => {
    const k = await keyFor(app, "auditor");
    const b = (
      await api(app)
        .post("/v1/buildings")
        .send(buildingBody({ name: "Audited hall" }))
    ).body;
    expect((await api(app, k).get(`/v1/buildings/${b.id}`)).status).toBe(200);
    expect((await api(app, k).get(`/v1/buildings/${b.id}/history`)).status).toBe(200);
    expect((await api(app, k).get("/v1/audit-log")).status).toBe(200);
    expect((await api(app, k).post("/v1/sizing").send({ system: buildingBody().system, loads: surveyBody().loads })).status).toBe(200);
    const before = await rowCounts(app.store);
    const writes = [
      await api(app, k)
        .post("/v1/buildings")
        .send(buildingBody({ name: "No" })),
      await api(app, k).patch(`/v1/buildings/${b.id}`).send({ notes: "no" }),
      await api(app, k).post(`/v1/buildings/${b.id}/surveys`).send(surveyBody()),
      await api(app, k).post("/v1/keys").send({ role: "auditor" }),
    ];
    expect(writes.map((r) => r.status)).toEqual([403, 403, 403, 403]);
    expect(await rowCounts(app.store)).toEqual(before);
  });
});

describe("keys", () => {
  it("shows a new key once, lists keys without secrets or hashes, and revokes", async () => {
    const created = await api(app).post("/v1/keys").send({ role: "surveyor", label: "tablet 3" });
    expect(created.status).toBe(201);
    expect(created.headers["cache-control"]).toBe("no-store");
    expect(created.body).toMatchObject({ role: "surveyor", label: "tablet 3", revokedAt: null, lastUsedAt: null });
    const key: string = created.body.key;
    expect(key).toMatch(/^pfc_[0-9a-z]{8}_[A-Za-z0-9_-]{43}$/);
    expect(created.body.prefix).toBe(key.slice(4, 12));
    const [row] = await sqlRows<Record<string, string>>(app.store, "SELECT * FROM api_keys WHERE id = ?", [created.body.id]);
    if (!row) throw new Error("the new key has no row");
    expect(JSON.stringify(row)).not.toContain(key.slice(13));

    expect((await api(app, key).get("/v1/buildings")).status).toBe(200);
    const list = await api(app).get("/v1/keys");
    expect(list.status).toBe(200);
    const text = JSON.stringify(list.body);
    expect(text).not.toContain(key.slice(13));
    expect(text).not.toContain(row.secret_sha256);
    expect(list.body.items.find((k: any) => k.id === created.body.id)).toMatchObject({ prefix: created.body.prefix, lastUsedAt: expect.any(String) });

    expect((await api(app).delete(`/v1/keys/${created.body.id}`)).status).toBe(204);
    expect401(await api(app, key).get("/v1/buildings"), /not valid/);
    expect((await api(app).delete(`/v1/keys/${created.body.id}`)).status).toBe(204);
    const log = (await api(app).get("/v1/audit-log")).body.items.map((e: any) => `${e.action} ${e.resourceId}`);
    expect(log.filter((l: string) => l === `key.revoke ${created.body.id}`)).toHaveLength(1);
  });

  it("names the field of a bad body, answers 404 for an unknown key and 409 for the last admin key", async () => {
    const before = await rowCounts(app.store);
    const bad = await api(app).post("/v1/keys").send({ role: "root" });
    expect(bad.status).toBe(400);
    expect(bad.body.errors[0].path).toBe("role");
    const extra = await api(app).post("/v1/keys").send({ role: "auditor", organisation: "Other" });
    expect(extra.body.errors[0].path).toBe("organisation");
    expect((await api(app).delete("/v1/keys/key_nothing")).status).toBe(404);
    const adminId = (await app.store.keys.findByPrefix(adminKey.slice(4, 12)))!.id;
    const last = await api(app).delete(`/v1/keys/${adminId}`);
    expect(last.status).toBe(409);
    expect(await rowCounts(app.store)).toEqual(before);
  });
});

describe("last used", () => {
  it("is written at most once a minute per key", async () => {
    let clock = Date.parse("2025-03-01T08:00:00Z");
    const { app: timed, key } = await makeStoreApp({}, { now: () => new Date(clock) });
    try {
      const lastUsed = async () => (await timed.store.keys.findByPrefix(key.slice(4, 12)))!.lastUsedAt;
      await inject(timed, "/v1/buildings");
      expect(await lastUsed()).toBe("2025-03-01T08:00:00.000Z");
      clock += 59_000;
      await inject(timed, "/v1/buildings");
      expect(await lastUsed()).toBe("2025-03-01T08:00:00.000Z");
      clock += 2_000;
      await inject(timed, "/v1/buildings");
      expect(await lastUsed()).toBe("2025-03-01T08:01:01.000Z");
    } finally {
      await timed.close();
    }
  });
});
