import { existsSync, readFileSync } from "node:fs";
import Database from "better-sqlite3";
import { afterEach, describe, expect, it } from "vitest";
import { openSqliteStore } from "../../src/store/sqlite/sqlite-store.js";
import { tempDatabasePath } from "../helpers/db.js";
import { buildingBody, surveyBody } from "../store/fixtures.js";
import { authFetch, freePort, postJson, spawnServer, startServer, stopServer, type ServerProcess } from "./server-process.js";

let running: ServerProcess | undefined;
afterEach(() => {
  running?.child.kill("SIGKILL");
  running = undefined;
});

const getJson = async (url: string) => {
  const res = await authFetch(url);
  return { status: res.status, body: (await res.json()) as any };
};

describe("server restarts", () => {
  it("stops on SIGTERM (closing the database) and finds everything on the next start", async () => {
    const path = tempDatabasePath();
    running = await startServer(path);
    let base = running.base;
    const b = (await postJson(`${base}/v1/buildings`, buildingBody({ name: "Restart hall" }))).body;
    const patch = await authFetch(`${base}/v1/buildings/${b.id}`, {
      method: "PATCH",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ notes: "bank fitted" }),
    });
    expect(patch.status).toBe(200);
    const surveys = [];
    for (let i = 0; i < 3; i++) {
      const s = await postJson(`${base}/v1/buildings/${b.id}/surveys`, surveyBody({ surveyedAt: `2024-0${i + 1}-15` }));
      expect(s.status).toBe(201);
      surveys.push(s.body);
    }
    const rev = await postJson(`${base}/v1/surveys/${surveys[0].id}/revisions`, { ...surveyBody({ targetPF: 0.97 }), reason: "target changed" });
    expect(rev.status).toBe(201);
    const before = {
      building: (await getJson(`${base}/v1/buildings/${b.id}`)).body,
      history: (await getJson(`${base}/v1/buildings/${b.id}/history`)).body,
      list: (await getJson(`${base}/v1/buildings/${b.id}/surveys`)).body,
      trend: (await getJson(`${base}/v1/buildings/${b.id}/trend`)).body,
      survey: (await getJson(`${base}/v1/surveys/${surveys[0].id}`)).body,
      audit: (await getJson(`${base}/v1/audit-log`)).body,
    };

    expect(await stopServer(running)).toEqual({ code: 0, signal: null });
    running = undefined;
    expect(existsSync(`${path}-wal`)).toBe(false); // closed cleanly: the WAL was checkpointed and removed

    running = await startServer(path);
    base = running.base;
    expect((await getJson(`${base}/v1/buildings/${b.id}`)).body).toEqual(before.building);
    expect((await getJson(`${base}/v1/buildings/${b.id}/history`)).body).toEqual(before.history);
    expect((await getJson(`${base}/v1/buildings/${b.id}/surveys`)).body).toEqual(before.list);
    expect((await getJson(`${base}/v1/buildings/${b.id}/trend`)).body).toEqual(before.trend);
    expect((await getJson(`${base}/v1/surveys/${surveys[0].id}`)).body).toEqual(before.survey);
    expect((await getJson(`${base}/v1/audit-log`)).body).toEqual(before.audit);
    expect(before.list.items).toHaveLength(3);
    expect(before.survey.revisions).toHaveLength(2);
    expect(
      (
        await authFetch(`${base}/v1/sizing`, {
          method: "POST",
          headers: { "content-type": "application/json" },
          body: JSON.stringify({ system: buildingBody().system, loads: surveyBody().loads }),
        })
      ).status,
    ).toBe(200);
  }, 60_000);

  it("seeds the demo on the first start only", async () => {
    const path = tempDatabasePath();
    running = await startServer(path, { DEMO_DATA: "on" });
    expect((await getJson(`${running.base}/v1/buildings`)).body.items).toHaveLength(1);
    await stopServer(running);
    running = await startServer(path, { DEMO_DATA: "on" });
    const items = (await getJson(`${running.base}/v1/buildings`)).body.items;
    expect(items).toHaveLength(1);
    expect((await getJson(`${running.base}/v1/buildings/${items[0].id}/surveys`)).body.items).toHaveLength(2);
  }, 60_000);

  it("refuses to start on a database from a newer version: non-zero exit, clear message, file unchanged", async () => {
    const path = tempDatabasePath();
    await (await openSqliteStore({ path })).close();
    const raw = new Database(path);
    raw.prepare("INSERT INTO schema_migrations VALUES (999, '999_future.sql', 'x', '2031-01-01T00:00:00Z')").run();
    raw.close();
    const bytes = readFileSync(path);
    const proc = spawnServer(path, await freePort());
    const exit = await proc.exited;
    expect(exit.code).toBe(1);
    expect(proc.stderr()).toMatch(/cannot start with the database at .*schema version 999.*newer than this program/);
    expect(readFileSync(path).equals(bytes)).toBe(true);
  }, 30_000);
});
