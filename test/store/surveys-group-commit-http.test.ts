import Database from "better-sqlite3";
import type { FastifyInstance } from "fastify";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Store } from "../../src/store/ports.js";
import { makeStoreApp } from "../helpers/db.js";
import { inject } from "../helpers/auth.js";
import { sqliteStore, TEST_STORE_KIND } from "../helpers/store.js";
import { buildingBody, surveyBody } from "../store/fixtures.js";

/**
 * Surveys written concurrently through HTTP share COMMITs (group commit, src/store/sqlite/group-commit.ts); each is
 * sized before its transaction and acknowledged only once its own COMMIT is on disk. SQLite only (it reads the file
 * from a second connection), so it sits with the store tests, which CI runs on SQLite; the API suites run on both.
 */

let app: FastifyInstance;
let store: Store;
let path: string;
let buildingId: string;
beforeAll(async () => {
  ({ app, store, path } = await makeStoreApp());
  buildingId = (await inject(app, { method: "POST", url: "/v1/buildings", payload: buildingBody() })).json().id;
});
afterAll(() => app.close());

const postSurvey = (notes: string) => inject(app, { method: "POST", url: `/v1/buildings/${buildingId}/surveys`, payload: surveyBody({ notes }) });

/** Survey ids another connection (another process) finds in the file: committed ones only. */
function surveyIdsOnDisk(): Set<string> {
  const other = new Database(path, { readonly: true });
  try {
    return new Set((other.prepare("SELECT id FROM surveys").all() as { id: string }[]).map((r) => r.id));
  } finally {
    other.close();
  }
}

describe.skipIf(TEST_STORE_KIND !== "sqlite")("surveys under group commit", () => {
  it("answers each of ten concurrent surveys with the result it stored, as JSON", async () => {
    const answers = await Promise.all(Array.from({ length: 10 }, (_, i) => postSurvey(`concurrent ${i}`)));
    expect(answers.map((a) => a.statusCode)).toEqual(Array(10).fill(201));
    const onDisk = surveyIdsOnDisk();
    for (const a of answers) {
      expect(a.headers["content-type"]).toBe("application/json; charset=utf-8");
      const body = a.json();
      expect(a.body).toBe(JSON.stringify(body)); // the same text JSON.stringify gives
      expect(onDisk.has(body.id)).toBe(true);
      const stored = (await inject(app, `/v1/surveys/${body.id}/revisions/1`)).json();
      expect(stored.result).toEqual(body.result);
    }
    // the result's UTF-8 bytes are stored as TEXT, the same text JSON.stringify gives
    const rows = sqliteStore(store).db.prepare("SELECT typeof(result_json) AS t, result_json AS json FROM survey_revisions").all() as {
      t: string;
      json: string;
    }[];
    expect(rows.length).toBeGreaterThanOrEqual(10);
    for (const r of rows) {
      expect(r.t).toBe("text");
      expect(r.json).toBe(JSON.stringify(JSON.parse(r.json)));
    }
  });

  it("acknowledges none of the surveys whose shared COMMIT failed; every 201 is on disk", async () => {
    const db = sqliteStore(store).db;
    const exec = db.exec.bind(db);
    let failures = 1;
    db.exec = (sql: string) => {
      if (sql === "COMMIT" && failures > 0) {
        failures--;
        throw Object.assign(new Error("disk I/O error"), { code: "SQLITE_IOERR_FSYNC" });
      }
      return exec(sql);
    };
    const surveysBefore = surveyIdsOnDisk().size;
    const answers = await Promise.all(Array.from({ length: 6 }, (_, i) => postSurvey(`doomed ${i}`)));
    db.exec = exec;
    const created = answers.filter((a) => a.statusCode === 201);
    const failed = answers.filter((a) => a.statusCode !== 201);
    expect(failed.length).toBeGreaterThanOrEqual(1);
    for (const a of failed) expect(a.statusCode).toBe(500);
    const onDisk = surveyIdsOnDisk();
    for (const a of created) expect(onDisk.has(a.json().id)).toBe(true);
    expect(onDisk.size).toBe(surveysBefore + created.length);
  });
});
