import pg from "pg";
import { afterAll, beforeAll, expect, it } from "vitest";
import { newBootstrapKey } from "../helpers/auth.js";
import { describePostgres, freshDatabase } from "../helpers/postgres.js";
import { startServer, type ServerProcess } from "../helpers/server-process.js";
import { buildingBody, surveyBody } from "../store/fixtures.js";

// Two real server processes on one PostgreSQL database, as behind a load balancer.

describePostgres("two instances on one PostgreSQL", (baseUrl) => {
  let a: ServerProcess;
  let b: ServerProcess;
  let db: pg.Pool;
  let buildingId: string;
  const key = newBootstrapKey();
  const headers = { authorization: `Bearer ${key}`, "content-type": "application/json" };

  const post = (via: ServerProcess, path: string, body: unknown, extra: Record<string, string> = {}) =>
    fetch(`${via.baseUrl}${path}`, { method: "POST", headers: { ...headers, ...extra }, body: JSON.stringify(body) });
  const get = (via: ServerProcess, path: string) => fetch(`${via.baseUrl}${path}`, { headers });
  const surveyCount = async () => (await db.query<{ n: number }>("SELECT count(*)::int AS n FROM surveys")).rows[0]?.n ?? -1;

  beforeAll(async () => {
    const url = await freshDatabase(baseUrl);
    db = new pg.Pool({ connectionString: url, max: 2 });
    const env = { DATABASE_URL: url, DATABASE_POOL_SIZE: "5", PFC_BOOTSTRAP_KEY: key };
    // Started together: migrations and the bootstrap key race, under the advisory locks.
    [a, b] = await Promise.all([startServer(env), startServer(env)]);
    const created = await post(a, "/v1/buildings", buildingBody({ name: "Twin-instance foundry" }));
    expect(created.status).toBe(201);
    buildingId = ((await created.json()) as { id: string }).id;
  }, 120_000);

  afterAll(async () => {
    await Promise.all([a?.stop(), b?.stop()]);
    await db?.end();
  });

  it("started both on one schema, migrated once, with one bootstrap key", async () => {
    const migrations = await db.query<{ version: number }>("SELECT version FROM schema_migrations ORDER BY version");
    expect(migrations.rows.map((r) => r.version)).toEqual([1]);
    const keys = await db.query<{ n: number }>("SELECT count(*)::int AS n FROM api_keys");
    expect(keys.rows[0]?.n).toBe(1);
    for (const via of [a, b]) expect((await get(via, "/ready")).status).toBe(200);
  });

  it("stores concurrent survey writes through both, and either reads the same data", async () => {
    const before = await surveyCount();
    const responses = await Promise.all(
      Array.from({ length: 24 }, (_, i) => post(i % 2 ? a : b, `/v1/buildings/${buildingId}/surveys`, surveyBody({ surveyor: `Writer ${i}` }))),
    );
    expect(responses.map((r) => r.status)).toEqual(Array(24).fill(201));
    const ids = await Promise.all(responses.map(async (r) => ((await r.json()) as { id: string }).id));
    expect(new Set(ids).size).toBe(24);
    expect(await surveyCount()).toBe(before + 24);
    // Each survey written through one instance reads back identically through the other.
    for (const [i, id] of ids.entries()) {
      const [viaA, viaB] = await Promise.all([get(a, `/v1/surveys/${id}`), get(b, `/v1/surveys/${id}`)]);
      expect([viaA.status, viaB.status], `survey ${i}`).toEqual([200, 200]);
      expect(await viaA.json()).toEqual(await viaB.json());
    }
    const [listA, listB] = await Promise.all([
      get(a, `/v1/buildings/${buildingId}/surveys?limit=100`),
      get(b, `/v1/buildings/${buildingId}/surveys?limit=100`),
    ]);
    expect(await listA.json()).toEqual(await listB.json());
  });

  it("stores one survey when both receive the same Idempotency-Key at once", async () => {
    const seen: string[] = [];
    for (let round = 0; round < 6; round++) {
      const before = await surveyCount();
      const idem = { "idempotency-key": `twin-${round}-${Date.now()}` };
      const body = surveyBody({ surveyor: `Twin round ${round}` });
      const [ra, rb] = await Promise.all([
        post(a, `/v1/buildings/${buildingId}/surveys`, body, idem),
        post(b, `/v1/buildings/${buildingId}/surveys`, body, idem),
      ]);
      const statuses = [ra.status, rb.status].sort();
      // Either the second saw the first finished (a replay: both 201, one Location), or still in flight (409 + Retry-After).
      expect([
        [201, 201],
        [201, 409],
      ]).toContainEqual(statuses);
      seen.push(statuses.join("+"));
      const ok = [ra, rb].filter((r) => r.status === 201);
      expect(new Set(ok.map((r) => r.headers.get("location"))).size).toBe(1);
      for (const r of [ra, rb].filter((x) => x.status === 409)) {
        expect(Number(r.headers.get("retry-after"))).toBeGreaterThan(0);
        expect(r.headers.get("content-type")).toMatch(/^application\/problem\+json/);
      }
      expect(await surveyCount()).toBe(before + 1);
      // Once the first has finished, the key replays its response through either instance.
      const again = await post(round % 2 ? a : b, `/v1/buildings/${buildingId}/surveys`, body, idem);
      expect(again.status).toBe(201);
      expect(again.headers.get("idempotent-replayed")).toBe("true");
      expect(again.headers.get("location")).toBe(ok[0]?.headers.get("location"));
      expect(await surveyCount()).toBe(before + 1);
    }
    console.log(`same key to both instances at once, 6 rounds: ${seen.join(", ")} (201+201: replay; 201+409: in flight)`);
  });

  it("keeps every acknowledged survey, whole, when one instance is killed -9 under write load", async () => {
    const acknowledged: string[] = [];
    let stop = false;
    let killedAt = 0;
    const writer = async (via: ServerProcess, n: number) => {
      for (let i = 0; !stop; i++) {
        try {
          const r = await post(via, `/v1/buildings/${buildingId}/surveys`, surveyBody({ surveyor: `Load ${n}.${i}` }));
          if (r.status === 201) acknowledged.push(((await r.json()) as { id: string }).id);
          else await r.arrayBuffer();
        } catch {
          // the killed instance's connections fail: those requests were never acknowledged
          if (via === b && killedAt) await new Promise((r) => setTimeout(r, 20));
        }
      }
    };
    const writers = [0, 1, 2, 3, 4, 5].map((n) => writer(n % 2 ? a : b, n));
    await new Promise((r) => setTimeout(r, 1500));
    b.child.kill("SIGKILL");
    killedAt = Date.now();
    expect(await b.exited).toBeNull(); // killed by the signal, no exit code
    await new Promise((r) => setTimeout(r, 700));
    stop = true;
    await Promise.all(writers);

    expect(acknowledged.length).toBeGreaterThan(10);
    const stored = await db.query<{ id: string }>("SELECT id FROM surveys WHERE id = ANY($1)", [acknowledged]);
    expect(stored.rowCount).toBe(acknowledged.length);
    // Nothing half-written: every survey has its revisions up to the head and its audit row.
    const broken = await db.query(
      `SELECT s.id FROM surveys s
        WHERE (SELECT count(*) FROM survey_revisions r WHERE r.org_id = s.org_id AND r.survey_id = s.id) <> s.latest_revision
           OR NOT EXISTS (SELECT 1 FROM audit_log l WHERE l.org_id = s.org_id AND l.resource_id = s.id)`,
    );
    expect(broken.rows).toEqual([]);
    console.log(
      `kill -9 under load: ${acknowledged.length} surveys acknowledged (201), all stored whole; ${acknowledged.length} checked in the database`,
    );
    // The survivor serves every acknowledged survey.
    for (const id of acknowledged.slice(-10)) expect((await get(a, `/v1/surveys/${id}`)).status).toBe(200);
  });
});
