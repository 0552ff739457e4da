import Database from "better-sqlite3";
import { afterEach, describe, expect, it } from "vitest";
import { tempDatabasePath } from "../helpers/db.js";
import { buildingBody, loads, surveyBody } from "../store/fixtures.js";
import { authFetch, postJson, startServer, stopServer, type ServerProcess } from "./server-process.js";

let running: ServerProcess | undefined;
afterEach(() => {
  running?.child.kill("SIGKILL");
  running = undefined;
});

interface Accepted {
  id: string;
  body: ReturnType<typeof surveyBody>;
  result: unknown;
  key?: string;
}

describe("kill -9 under concurrent writes", () => {
  it("keeps every survey that got a 201, whole, and the file intact", async () => {
    const path = tempDatabasePath();
    running = await startServer(path);
    const base = running.base;
    const building = await postJson(`${base}/v1/buildings`, buildingBody({ name: "Crash hall" }));
    expect(building.status).toBe(201);
    const url = `${base}/v1/buildings/${building.body.id}/surveys`;

    const accepted: Accepted[] = [];
    let attempts = 0;
    let failures = 0;
    const client = async (c: number) => {
      for (let i = 0; ; i++) {
        const body = surveyBody({
          surveyor: `client ${c}`,
          surveyedAt: new Date(Date.UTC(2024, 0, 1) + (c * 10_000 + i) * 60_000).toISOString(),
          notes: `client ${c} request ${i}`,
          loads: loads(3 + ((c + i) % 18), (k) => `c${c} r${i} load ${k}, "quoted"`),
        });
        const key = c % 2 === 0 ? `crash-${c}-${i}` : undefined;
        attempts++;
        try {
          const res = await postJson(url, body, key ? { "idempotency-key": key } : {});
          if (res.status !== 201) throw new Error(`unexpected ${res.status}: ${JSON.stringify(res.body)}`);
          accepted.push({ id: res.body.id, body, result: res.body.result, ...(key ? { key } : {}) });
        } catch (err) {
          if (String(err).includes("unexpected")) throw err;
          failures++;
          return; // the server is gone
        }
      }
    };
    const clients = Array.from({ length: 8 }, (_, c) => client(c));
    const server = running;
    const deadline = Date.now() + 8000;
    while (accepted.length < 300 && Date.now() < deadline) await new Promise((r) => setTimeout(r, 10));
    server.child.kill("SIGKILL");
    await Promise.all(clients);
    expect((await server.exited).signal).toBe("SIGKILL");
    expect(accepted.length).toBeGreaterThan(50);
    expect(failures).toBe(8);

    running = await startServer(path);
    for (const a of accepted) {
      const res = await authFetch(`${running.base}/v1/surveys/${a.id}`);
      expect(res.status).toBe(200);
      const s = (await res.json()) as { inputs: unknown; result: unknown };
      expect(s.inputs).toEqual(a.body);
      expect(s.result).toEqual(a.result);
      if (a.key) {
        const replay = await postJson(url.replace(base, running.base), a.body, { "idempotency-key": a.key });
        expect(replay.body.id).toBe(a.id);
      }
    }
    expect((await stopServer(running)).code).toBe(0);
    running = undefined;

    const db = new Database(path, { readonly: true });
    expect(db.pragma("integrity_check", { simple: true })).toBe("ok");
    expect(db.pragma("foreign_key_check")).toEqual([]);
    const surveys = db.prepare("SELECT * FROM surveys").all() as Record<string, number | string>[];
    expect(surveys.length).toBeGreaterThanOrEqual(accepted.length);
    expect(surveys.length).toBeLessThanOrEqual(attempts);
    for (const s of surveys) {
      const revs = db.prepare("SELECT * FROM survey_revisions WHERE survey_id = ? ORDER BY n").all(s.id) as Record<string, number | string>[];
      expect(revs.map((r) => r.n)).toEqual([1]);
      const r = revs[0]!;
      const result = JSON.parse(String(r.result_json));
      expect(result.site.kW).toBe(s.kw);
      expect(JSON.parse(String(r.inputs_json)).loads.length).toBe(result.loads.length);
      for (const col of ["kw", "kvar", "kva", "displacement_pf", "kvar_required", "warning_count"]) expect(r[col], col).toBe(s[col]);
    }
    const audits = db.prepare("SELECT count(*) AS n FROM audit_log WHERE action = 'survey.create'").get() as { n: number };
    expect(audits.n).toBe(surveys.length);
    const orphanKeys = db
      .prepare(
        "SELECT count(*) AS n FROM idempotency_keys WHERE json_extract(response_json, '$.id') NOT IN (SELECT id FROM surveys UNION SELECT id FROM buildings)",
      )
      .get() as { n: number };
    expect(orphanKeys.n).toBe(0);
    db.close();
    console.log(`crash test: ${accepted.length} surveys got 201 before kill -9, ${surveys.length} stored, all ${accepted.length} found whole`);
  }, 60_000);
});
