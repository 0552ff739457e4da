import { copyFileSync, existsSync, mkdirSync, readFileSync, readdirSync, statSync, writeFileSync } from "node:fs";
import { join, resolve } from "node:path";
import { fileURLToPath } from "node:url";
import Database from "better-sqlite3";
import { describe, expect, it } from "vitest";
import { buildApp } from "../../src/app.js";
import { defaultConfig } from "../../src/config.js";
import { DEFAULT_MIGRATIONS_DIR, loadMigrations, MigrationError } from "../../src/store/sqlite/migrate.js";
import { openSqliteStore as openStore } from "../../src/store/sqlite/sqlite-store.js";
import { tempDatabasePath, tempDir } from "../helpers/db.js";

const projectMigrations = resolve(fileURLToPath(new URL("../../migrations/", import.meta.url)));
const latest = readdirSync(projectMigrations).filter((f) => f.endsWith(".sql")).length;

/** A migrations directory holding the project's files plus `extra`. */
function migrationsWith(extra: Record<string, string>): string {
  const dir = tempDir();
  for (const f of readdirSync(projectMigrations).filter((x) => x.endsWith(".sql"))) copyFileSync(join(projectMigrations, f), join(dir, f));
  for (const [name, sql] of Object.entries(extra)) writeFileSync(join(dir, name), sql);
  return dir;
}

async function migratedFile(): Promise<string> {
  const path = tempDatabasePath();
  await (await openStore({ path })).close();
  return path;
}

describe("migrations", () => {
  it("finds migrations/ relative to the module, as from dist/store/ after tsc", async () => {
    expect(resolve(DEFAULT_MIGRATIONS_DIR)).toBe(projectMigrations);
    expect(fileURLToPath(new URL("../../migrations/", "file:///srv/app/dist/store/migrate.js"))).toBe("/srv/app/migrations/");
  });

  it("migrates an empty file to the latest version and records each migration", async () => {
    const path = tempDatabasePath("nested/dir/fresh.sqlite");
    const store = await openStore({ path, now: () => new Date("2025-01-02T03:04:05.000Z") });
    expect(store.migration).toEqual({ from: 0, to: latest, applied: Array.from({ length: latest }, (_, i) => i + 1) });
    const rows = store.db.prepare("SELECT version, name, checksum, applied_at FROM schema_migrations ORDER BY version").all();
    expect(rows).toEqual(
      loadMigrations(projectMigrations).map((m) => ({
        version: m.version,
        name: m.name,
        checksum: m.checksum,
        applied_at: "2025-01-02T03:04:05.000Z",
      })),
    );
    const tables = (store.db.prepare("SELECT name FROM sqlite_master WHERE type = 'table' ORDER BY name").all() as { name: string }[]).map(
      (t) => t.name,
    );
    expect(tables).toEqual(
      expect.arrayContaining(["organisations", "buildings", "building_versions", "surveys", "survey_revisions", "idempotency_keys", "audit_log"]),
    );
    expect(store.db.prepare("SELECT id FROM organisations").all()).toEqual([{ id: "org_default" }]);
    expect(store.db.pragma("journal_mode", { simple: true })).toBe("wal");
    // NORMAL: COMMIT does not sync; the store syncs the log itself before it answers (src/store/sqlite/wal-file.ts)
    expect(store.db.pragma("synchronous", { simple: true })).toBe(1);
    expect(store.db.pragma("foreign_keys", { simple: true })).toBe(1);
    expect(Number(store.db.pragma("busy_timeout", { simple: true }))).toBeGreaterThan(0);
    await store.close();
  });

  it("also runs on an in-memory database (each store its own)", async () => {
    const a = await openStore({ path: ":memory:" });
    const b = await openStore({ path: ":memory:" });
    expect(a.migration.to).toBe(latest);
    await a.transaction((tx) =>
      tx.buildings.create(
        "org_default",
        "bld_m",
        { name: "m", address: null, notes: null, system: { voltageV: 400, frequencyHz: 50, phases: 3 }, transformer: null, utility: null },
        "local",
        "2025-01-01T00:00:00.000Z",
      ),
    );
    expect((await a.buildings.get("org_default", "bld_m"))?.name).toBe("m");
    expect(await b.buildings.get("org_default", "bld_m")).toBeUndefined();
    await a.close();
    await b.close();
  });

  it("applies nothing on a second start", async () => {
    const path = await migratedFile();
    const again = await openStore({ path });
    expect(again.migration.applied).toEqual([]);
    expect(again.migration.to).toBe(latest);
    await again.close();
  });

  it("applies only the new migration to a database at the previous version", async () => {
    const path = await migratedFile();
    const dir = migrationsWith({ [`${String(latest + 1).padStart(3, "0")}_extra.sql`]: "CREATE TABLE extra_things (id INTEGER PRIMARY KEY);" });
    const store = await openStore({ path, migrationsDir: dir });
    expect(store.migration).toEqual({ from: latest, to: latest + 1, applied: [latest + 1] });
    expect(store.db.prepare("SELECT count(*) AS n FROM extra_things").get()).toEqual({ n: 0 });
    await store.close();
  });

  it("refuses a database from a newer version with a clear message and leaves its bytes alone", async () => {
    const path = await migratedFile();
    const raw = new Database(path);
    raw.prepare("INSERT INTO schema_migrations VALUES (?, ?, ?, ?)").run(latest + 1, "099_from_the_future.sql", "abc", "2030-01-01T00:00:00Z");
    raw.close();
    const before = readFileSync(path);
    await expect(openStore({ path })).rejects.toThrow(MigrationError);
    await expect(openStore({ path })).rejects.toThrow(/newer than this program.*up to \d+.*not changed/);
    await expect(buildApp({ config: defaultConfig({ DATABASE_PATH: path, DEMO_DATA: "off" }), logger: false })).rejects.toThrow(/newer/);
    expect(readFileSync(path).equals(before)).toBe(true);
  });

  it("rolls back a failing migration: error naming the file, database bytes unchanged", async () => {
    const path = await migratedFile();
    const before = readFileSync(path);
    const dir = migrationsWith({
      [`${String(latest + 1).padStart(3, "0")}_good.sql`]: "CREATE TABLE fine_table (id INTEGER);",
      [`${String(latest + 2).padStart(3, "0")}_broken.sql`]: "CREATE TABLE half_done (id INTEGER);\nINSERT INTO no_such_table VALUES (1);",
    });
    await expect(openStore({ path, migrationsDir: dir })).rejects.toThrow(/_broken\.sql failed: no such table: no_such_table.*left as it was/);
    expect(readFileSync(path).equals(before)).toBe(true);
    const raw = new Database(path, { readonly: true });
    const names = raw.prepare("SELECT name FROM sqlite_master WHERE name IN ('fine_table', 'half_done')").all();
    expect(names).toEqual([]);
    expect((raw.prepare("SELECT max(version) AS v FROM schema_migrations").get() as { v: number }).v).toBe(latest);
    raw.close();
  });

  it("leaves an empty file empty when the very first migration fails", async () => {
    const path = tempDatabasePath();
    const dir = tempDir();
    writeFileSync(join(dir, "001_init.sql"), "CREATE TABLE a (id INTEGER); SELECT * FROM missing;");
    await expect(openStore({ path, migrationsDir: dir })).rejects.toThrow(/001_init\.sql failed/);
    expect(statSync(path).size).toBe(0);
    expect(existsSync(`${path}-wal`)).toBe(false);
  });

  it("refuses a migration edited after it was applied", async () => {
    const path = await migratedFile();
    const dir = migrationsWith({});
    writeFileSync(join(dir, "001_init.sql"), `${readFileSync(join(dir, "001_init.sql"), "utf8")}\n-- edited`);
    await expect(openStore({ path, migrationsDir: dir })).rejects.toThrow(/001_init\.sql was changed after it was applied/);
  });

  it("refuses badly named or gapped migration files", async () => {
    const gap = tempDir();
    writeFileSync(join(gap, "001_a.sql"), "SELECT 1;");
    writeFileSync(join(gap, "003_c.sql"), "SELECT 1;");
    expect(() => loadMigrations(gap)).toThrow(/without gaps/);
    const badName = tempDir();
    writeFileSync(join(badName, "first.sql"), "SELECT 1;");
    expect(() => loadMigrations(badName)).toThrow(/NNN_name\.sql/);
    const missing = join(tempDir(), "nope");
    expect(() => loadMigrations(missing)).toThrow(/cannot read the migrations directory/);
  });

  it("lets two stores on one file start together (the second waits for the first's migration)", async () => {
    const path = tempDatabasePath();
    mkdirSync(join(path, ".."), { recursive: true });
    const a = await openStore({ path });
    const b = await openStore({ path });
    expect(b.migration.applied).toEqual([]);
    await a.close();
    await b.close();
  });
});
