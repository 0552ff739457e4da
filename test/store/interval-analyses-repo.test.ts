import { copyFileSync } from "node:fs";
import { join } from "node:path";
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { buildApp } from "../../src/app.js";
import { analyseIntervals } from "../../src/core/interval/analyse.js";
import { summarise } from "../../src/core/interval/summary.js";
import { computeRevision } from "../../src/application/survey-sizing.js";
import { defaultConfig } from "../../src/config.js";
import { openDatabase } from "../../src/store/sqlite/database.js";
import { sqliteOf } from "../../src/store/sqlite/sqlite-store.js";
import { DEFAULT_MIGRATIONS_DIR, migrate } from "../../src/store/sqlite/migrate.js";
import { DEFAULT_ORG_ID } from "../../src/store/ports.js";
import { openSqliteRepos as openStore, type SqliteRepos as Store } from "../helpers/store.js";
import type { BuildingData, SurveyInputs } from "../../src/store/types.js";
import { syntheticYear } from "../core/interval/fixtures.js";
import { rowCounts, tempDatabasePath, tempDir } from "../helpers/db.js";
import { surveyBody } from "./fixtures.js";
import { inject, newBootstrapKey, registerAdminKey } from "../helpers/auth.js";

const ORG = DEFAULT_ORG_ID;
const at = "2025-06-01T10:00:00.000Z";
const data: BuildingData = {
  name: "Repo interval hall",
  address: null,
  notes: null,
  system: { voltageV: 400, frequencyHz: 50, phases: 3 },
  transformer: null,
  utility: null,
};
/** Three days of hourly data: 100 kW / 60 kvar at night (00–06 h), 300 kW / 240 kvar by day (invented). */
const summary = summarise(
  analyseIntervals(
    syntheticYear(24, (k) => (k < 6 ? { kW: 100, kvar: 60 } : { kW: 300, kvar: 240 }), 3),
    0.95,
  ),
);

let store: Store;
beforeEach(async () => {
  store = await openStore({ path: tempDatabasePath() });
  store.db.prepare("INSERT INTO organisations (id, name, created_at) VALUES ('org_other', 'Other', ?)").run(at);
  store.write(() => {
    store.buildings.create(ORG, "bld_a", data, "local", at);
    store.buildings.create(ORG, "bld_b", data, "local", at);
    store.buildings.create("org_other", "bld_o", data, "local", at);
  });
});
afterEach(() => store.close());

const add = (id: string, buildingId = "bld_a", orgId = ORG) =>
  store.write(() => store.intervalAnalyses.create(orgId, { id, buildingId, createdAt: at, actor: "local", requestId: "req-1", summary }));

describe("interval analyses repository", () => {
  it("stores the summary whole, with its list figures in columns", async () => {
    const a = add("iva_1");
    expect(a.summary).toEqual(summary);
    expect(a).toMatchObject({ id: "iva_1", buildingId: "bld_a", requestId: "req-1", intervalCount: 72, intervalMinutes: 60, targetPF: 0.95 });
    // hand: the day level needs 240 − 300·tan(acos 0.95) = 141.40 kvar (18 of 24 h: the 99 % hold); the minimum is 60
    expect(a.hold99PctKvar).toBeCloseTo(240 - 300 * Math.tan(Math.acos(0.95)), 3);
    expect(a.minKvar).toBe(60);
  });

  it("keeps organisations and buildings apart; newest is the last stored", async () => {
    add("iva_1");
    add("iva_2");
    add("iva_b", "bld_b");
    add("iva_o", "bld_o", "org_other");
    expect(store.intervalAnalyses.get(ORG, "iva_o")).toBeUndefined();
    expect(store.intervalAnalyses.get("org_other", "iva_1")).toBeUndefined();
    expect(store.intervalAnalyses.newestOf(ORG, "bld_a")?.id).toBe("iva_2");
    expect(store.intervalAnalyses.newestOf(ORG, "bld_o")).toBeUndefined();
    expect(store.intervalAnalyses.listByBuilding(ORG, "bld_a", { limit: 10 }).map((e) => e.id)).toEqual(["iva_2", "iva_1"]);
  });

  it("refuses an analysis of a building of another organisation, or of no building", async () => {
    const before = await rowCounts(store.store);
    expect(() => add("iva_x", "bld_o", ORG)).toThrow(/FOREIGN KEY/);
    expect(() => add("iva_y", "bld_nope")).toThrow(/FOREIGN KEY/);
    expect(await rowCounts(store.store)).toEqual(before);
  });

  it("is immutable: no UPDATE, no DELETE", async () => {
    add("iva_1");
    expect(() => store.db.prepare("UPDATE interval_analyses SET target_pf = 0.9 WHERE id = 'iva_1'").run()).toThrow(/immutable/);
    expect(() => store.db.prepare("DELETE FROM interval_analyses WHERE id = 'iva_1'").run()).toThrow(/never deleted/);
    expect(store.intervalAnalyses.get(ORG, "iva_1")?.targetPF).toBe(0.95);
  });
});

describe("migration 002 on a database written by 001", () => {
  it("keeps the old building and survey; both read back without economics or an analysis", async () => {
    const dir = tempDir();
    copyFileSync(join(DEFAULT_MIGRATIONS_DIR, "001_init.sql"), join(dir, "001_init.sql"));
    const path = tempDatabasePath();
    const old = openDatabase(path);
    migrate(old, dir);
    // rows as version 1 wrote them: the snapshot without economics or intervalAnalysisId
    old
      .prepare(
        `INSERT INTO buildings (id, org_id, name, voltage_v, frequency_hz, phases, version, created_at, updated_at)
       VALUES ('bld_old', ?, 'Old hall', 400, 50, 3, 1, ?, ?)`,
      )
      .run(ORG, at, at);
    old.prepare("INSERT INTO building_versions VALUES (?, 'bld_old', 1, ?, ?, 'local')").run(ORG, JSON.stringify(data), at);
    const building = { id: "bld_old", version: 1, createdAt: at, updatedAt: at, ...data, economics: null };
    const rev = computeRevision(building, surveyBody() as unknown as SurveyInputs, { surveyId: "srv_old", n: 1, reason: null, actor: "local", at });
    const { economics: _e, intervalAnalysisId: _i, ...v1Snapshot } = rev.building;
    const m = rev.summary;
    old
      .prepare(`INSERT INTO surveys VALUES ('srv_old', ?, 'bld_old', ?, 1, ?, ?, 'Test surveyor', ?, ?, ?, ?, ?, ?)`)
      .run(ORG, at, rev.inputs.surveyedAt, rev.surveyedAtUtc, m.kW, m.kvar, m.kVA, m.displacementPF, m.kvarRequired, m.warningCount);
    old
      .prepare(`INSERT INTO survey_revisions VALUES (?, 'srv_old', 1, NULL, ?, 'local', ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`)
      .run(
        ORG,
        at,
        JSON.stringify(rev.inputs),
        JSON.stringify(rev.result),
        rev.engineVersion,
        JSON.stringify(v1Snapshot),
        m.kW,
        m.kvar,
        m.kVA,
        m.displacementPF,
        m.kvarRequired,
        m.warningCount,
      );
    old.close();

    const key = newBootstrapKey();
    const app = await buildApp({ config: defaultConfig({ DATABASE_PATH: path, DEMO_DATA: "off", PFC_BOOTSTRAP_KEY: key }), logger: false });
    await registerAdminKey(app, key);
    try {
      // 003 (API keys), 004 (installed banks) and 005 (idempotency claims) came after 002 and are applied too.
      expect(sqliteOf(app.store).migration.applied).toEqual([2, 3, 4, 5]);
      expect((await inject(app, "/v1/buildings/bld_old")).json()).toMatchObject({ name: "Old hall", economics: null });
      expect((await inject(app, "/v1/buildings/bld_old/history")).json().items[0].economics).toBeNull();
      const s = (await inject(app, "/v1/surveys/srv_old")).json();
      expect(s.building).toMatchObject({ buildingVersion: 1, economics: null, intervalAnalysisId: null });
      expect((await inject(app, "/v1/buildings/bld_old/interval-analyses")).json().items).toEqual([]);
    } finally {
      await app.close();
    }
  });
});
