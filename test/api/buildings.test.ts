import type { FastifyInstance } from "fastify";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Store } from "../../src/store/ports.js";
import { makeStoreApp, rowCounts } from "../helpers/db.js";
import { buildingBody } from "../store/fixtures.js";
import { inject, keyIdOf } from "../helpers/auth.js";

let app: FastifyInstance;
let store: Store;
beforeAll(async () => {
  ({ app, store } = await makeStoreApp());
});
afterAll(() => app.close());

const post = (payload: unknown, headers: Record<string, string> = {}) =>
  inject(app, { method: "POST", url: "/v1/buildings", payload: payload as object, headers });
const patch = (id: string, payload: unknown) => inject(app, { method: "PATCH", url: `/v1/buildings/${id}`, payload: payload as object });

describe("POST /v1/buildings", () => {
  it("creates a building, version 1, with a Location", async () => {
    const res = await post(buildingBody({ name: "  Create hall  ", notes: "north side" }));
    expect(res.statusCode).toBe(201);
    const b = res.json();
    expect(b).toMatchObject({
      version: 1,
      name: "Create hall",
      address: "1 Example Yard",
      notes: "north side",
      system: { voltageV: 400, frequencyHz: 50, phases: 3 },
      transformer: { kVA: 630, impedancePct: 4.5 },
      utility: { faultMVA: 150 },
    });
    expect(b.id).toMatch(/^bld_/);
    expect(b.createdAt).toBe(b.updatedAt);
    expect(res.headers.location).toBe(`/v1/buildings/${b.id}`);
    expect((await inject(app, `/v1/buildings/${b.id}`)).json()).toEqual(b);
  });

  it("stores absent optional parts as null", async () => {
    const res = await post({ name: "Bare hall", system: { voltageV: 230, frequencyHz: 50, phases: 1 } });
    expect(res.statusCode).toBe(201);
    expect(res.json()).toMatchObject({ address: null, notes: null, transformer: null, utility: null });
  });

  it("answers 400 naming each bad field, and writes nothing", async () => {
    const before = await rowCounts(store);
    const res = await post({ name: "", system: { voltageV: 10, frequencyHz: 55, phases: 2 }, transformer: { kVA: -1, impedancePct: 5 }, extra: 1 });
    expect(res.statusCode).toBe(400);
    expect(res.headers["content-type"]).toMatch(/^application\/problem\+json/);
    const paths = res.json().errors.map((e: { path: string }) => e.path);
    expect(paths).toEqual(expect.arrayContaining(["name", "system.voltageV", "system.frequencyHz", "system.phases", "transformer.kVA", "extra"]));
    expect(res.json().errors.find((e: { path: string }) => e.path === "system.frequencyHz").message).toBe("frequencyHz must be 50 or 60");
    expect(await rowCounts(store)).toEqual(before);
  });
});

describe("GET /v1/buildings", () => {
  beforeAll(async () => {
    for (let i = 0; i < 27; i++) {
      const res = await post(buildingBody({ name: `Paged block ${String(i).padStart(2, "0")}` }));
      expect(res.statusCode).toBe(201);
    }
  });

  it("pages through more than one page in a stable order with an opaque cursor", async () => {
    const seen: string[] = [];
    let cursor: string | null = null;
    let pages = 0;
    do {
      const url: string = `/v1/buildings?q=paged%20block&limit=10${cursor ? `&cursor=${encodeURIComponent(cursor)}` : ""}`;
      const res = await inject(app, url);
      expect(res.statusCode).toBe(200);
      const body = res.json();
      expect(body.items.length).toBeLessThanOrEqual(10);
      seen.push(...body.items.map((b: { name: string }) => b.name));
      cursor = body.nextCursor;
      pages++;
    } while (cursor);
    expect(pages).toBe(3);
    expect(seen).toEqual(Array.from({ length: 27 }, (_, i) => `Paged block ${String(i).padStart(2, "0")}`));
  });

  it("searches by name, case-insensitively, and defaults to 20 per page", async () => {
    const res = (await inject(app, "/v1/buildings?q=PAGED BLOCK 1")).json();
    expect(res.items.map((b: { name: string }) => b.name)).toEqual(Array.from({ length: 10 }, (_, i) => `Paged block 1${i}`));
    expect((await inject(app, "/v1/buildings")).json().items).toHaveLength(20);
  });

  it("refuses a bad limit, a forged cursor and unknown parameters with 400", async () => {
    for (const [url, path] of [
      ["/v1/buildings?limit=0", "limit"],
      ["/v1/buildings?limit=101", "limit"],
      ["/v1/buildings?limit=abc", "limit"],
      ["/v1/buildings?cursor=not-a-cursor", "cursor"],
      [`/v1/buildings?cursor=${Buffer.from(JSON.stringify({ k: "s", t: "x", i: "y" })).toString("base64url")}`, "cursor"],
      ["/v1/buildings?name=x", "name"],
    ] as const) {
      const res = await inject(app, url);
      expect(res.statusCode, url).toBe(400);
      expect(res.json().errors[0].path, url).toBe(path);
    }
  });
});

describe("GET/PATCH /v1/buildings/{id} and history", () => {
  it("404s an unknown building on every building route", async () => {
    for (const req of [
      { method: "GET" as const, url: "/v1/buildings/bld_nope" },
      { method: "GET" as const, url: "/v1/buildings/bld_nope/history" },
      { method: "PATCH" as const, url: "/v1/buildings/bld_nope", payload: { name: "x" } },
    ]) {
      const res = await inject(app, req);
      expect(res.statusCode, req.url).toBe(404);
      expect(res.json()).toMatchObject({ status: 404, detail: "building bld_nope was not found" });
    }
  });

  it("updates partly, keeps every version in history oldest first", async () => {
    const created = (await post(buildingBody({ name: "History hall" }))).json();
    const r1 = await patch(created.id, { notes: "MCC-3 replaced", transformer: { kVA: 1000, impedancePct: 5.5 } });
    expect(r1.statusCode).toBe(200);
    expect(r1.json()).toMatchObject({
      version: 2,
      name: "History hall",
      notes: "MCC-3 replaced",
      transformer: { kVA: 1000, impedancePct: 5.5 },
      utility: { faultMVA: 150 },
    });
    const r2 = await patch(created.id, { utility: null, address: null, name: "History hall (east)" });
    expect(r2.json()).toMatchObject({ version: 3, utility: null, address: null, name: "History hall (east)", createdAt: created.createdAt });

    const history = (await inject(app, `/v1/buildings/${created.id}/history`)).json();
    expect(history.order).toBe("oldest_first");
    expect(history.items.map((v: { version: number }) => v.version)).toEqual([1, 2, 3]);
    expect(history.items[0]).toMatchObject({
      name: "History hall",
      notes: null,
      transformer: { kVA: 630 },
      utility: { faultMVA: 150 },
      actor: keyIdOf(app),
    });
    expect(history.items[1]).toMatchObject({ notes: "MCC-3 replaced", transformer: { kVA: 1000 } });
    expect(history.items[2]).toMatchObject({ utility: null, name: "History hall (east)" });
    expect((await inject(app, `/v1/buildings/${created.id}`)).json()).toEqual(r2.json());
  });

  it("writes no new version when a PATCH changes nothing", async () => {
    const created = (await post(buildingBody({ name: "Same hall" }))).json();
    const before = await rowCounts(store);
    const res = await patch(created.id, { name: "Same hall", system: { phases: 3, frequencyHz: 50, voltageV: 400 } });
    expect(res.statusCode).toBe(200);
    expect(res.json()).toEqual(created);
    expect(await rowCounts(store)).toEqual(before);
  });

  it("refuses an empty or bad PATCH with 400 and changes nothing", async () => {
    const created = (await post(buildingBody({ name: "Patch guard hall" }))).json();
    const before = await rowCounts(store);
    const empty = await patch(created.id, {});
    expect(empty.statusCode).toBe(400);
    expect(empty.json().detail).toMatch(/at least one field/);
    const bad = await patch(created.id, { system: { voltageV: 400, frequencyHz: 50 }, name: null, colour: "red" });
    expect(bad.statusCode).toBe(400);
    expect(bad.json().errors.map((e: { path: string }) => e.path)).toEqual(expect.arrayContaining(["system.phases", "name", "colour"]));
    expect(await rowCounts(store)).toEqual(before);
    expect((await inject(app, `/v1/buildings/${created.id}`)).json()).toEqual(created);
  });

  it("records each write in the audit log with the request id", async () => {
    const res = await inject(app, {
      method: "POST",
      url: "/v1/buildings",
      payload: buildingBody({ name: "Audited hall" }),
      headers: { "x-request-id": "req-audit-1" },
    });
    const id = res.json().id;
    await inject(app, { method: "PATCH", url: `/v1/buildings/${id}`, payload: { notes: "n" }, headers: { "x-request-id": "req-audit-2" } });
    const log = (await inject(app, "/v1/audit-log?limit=2")).json();
    expect(log.items).toMatchObject([
      { action: "building.update", resourceType: "building", resourceId: id, actor: keyIdOf(app), requestId: "req-audit-2" },
      { action: "building.create", resourceType: "building", resourceId: id, actor: keyIdOf(app), requestId: "req-audit-1" },
    ]);
    expect(log.nextCursor).toEqual(expect.any(String));
    const next = (await inject(app, `/v1/audit-log?limit=2&cursor=${log.nextCursor}`)).json();
    expect(next.items[0].id).toBeLessThan(log.items[1].id);
  });
});
