import { execFile } from "node:child_process";
import { mkdirSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { promisify } from "node:util";
import pg from "pg";
import { afterEach, expect, it } from "vitest";
import { MigrationError, type MigrationReport } from "../../../src/store/sqlite/migrate.js";
import { migratePostgres } from "../../../src/store/postgres/migrate.js";
import { openPostgresStore } from "../../../src/store/postgres/store.js";
import { tempDir } from "../../helpers/db.js";
import { describePostgres, freshDatabase } from "../../helpers/postgres.js";

const run = promisify(execFile);
const CHILD = fileURLToPath(new URL("./migrate-child.ts", import.meta.url));

/** Migrations that count their own runs: a second application would add a row (and not fail, to be seen). */
function countingMigrations(count = 2): string {
  const dir = join(tempDir(), "migrations");
  mkdirSync(dir);
  writeFileSync(join(dir, "001_log.sql"), "CREATE TABLE IF NOT EXISTS applied_log (n integer NOT NULL); INSERT INTO applied_log VALUES (1);");
  for (let n = 2; n <= count; n++) {
    // The sleep widens the window in which an unlocked second starter would read the applied list too early.
    writeFileSync(join(dir, `00${n}_more.sql`), `SELECT pg_sleep(0.2); INSERT INTO applied_log VALUES (${n});`);
  }
  return dir;
}

const pools: pg.Pool[] = [];
const poolOn = (url: string) => {
  const p = new pg.Pool({ connectionString: url, max: 2 });
  pools.push(p);
  return p;
};
afterEach(async () => {
  await Promise.all(pools.splice(0).map((p) => p.end()));
});

async function appliedLog(url: string): Promise<number[]> {
  return (await poolOn(url).query<{ n: number }>("SELECT n FROM applied_log ORDER BY n")).rows.map((r) => r.n);
}

describePostgres("PostgreSQL migrations", (baseUrl) => {
  it("apply once when eight pools start at the same moment", async () => {
    const url = await freshDatabase(baseUrl);
    const dir = countingMigrations(3);
    const reports = await Promise.all(Array.from({ length: 8 }, () => migratePostgres(poolOn(url), dir)));
    expect(await appliedLog(url)).toEqual([1, 2, 3]);
    expect(reports.filter((r) => r.applied.length > 0)).toEqual([{ from: 0, to: 3, applied: [1, 2, 3] }]);
  });

  it("apply once when five processes start at the same moment, with the real schema", async () => {
    const url = await freshDatabase(baseUrl);
    const outs = await Promise.all(Array.from({ length: 5 }, () => run(process.execPath, ["--import", "tsx", CHILD, url], { timeout: 60_000 })));
    const reports = outs.map((o) => JSON.parse(o.stdout) as MigrationReport);
    expect(reports.filter((r) => r.applied.length > 0)).toHaveLength(1);
    const rows = await poolOn(url).query<{ version: number }>("SELECT version FROM schema_migrations ORDER BY version");
    expect(rows.rows.map((r) => r.version)).toEqual(reports.find((r) => r.applied.length > 0)?.applied);
    const orgs = await poolOn(url).query<{ n: number }>("SELECT count(*)::int AS n FROM organisations");
    expect(orgs.rows[0]?.n).toBe(1); // the default organisation, inserted once
  });

  it("applies only what is new, refuses an edited or unknown migration, and leaves a failed one unapplied", async () => {
    const url = await freshDatabase(baseUrl);
    const dir = countingMigrations(1);
    expect((await migratePostgres(poolOn(url), dir)).applied).toEqual([1]);
    writeFileSync(join(dir, "002_more.sql"), "INSERT INTO applied_log VALUES (2);");
    expect(await migratePostgres(poolOn(url), dir)).toEqual({ from: 1, to: 2, applied: [2] });

    writeFileSync(join(dir, "003_broken.sql"), "INSERT INTO applied_log VALUES (3); SELECT no_such_function();");
    await expect(migratePostgres(poolOn(url), dir)).rejects.toThrow(/003_broken\.sql failed/);
    expect(await appliedLog(url)).toEqual([1, 2]);

    writeFileSync(join(dir, "003_broken.sql"), "INSERT INTO applied_log VALUES (3);");
    await migratePostgres(poolOn(url), dir);
    writeFileSync(join(dir, "002_more.sql"), "INSERT INTO applied_log VALUES (22);");
    await expect(migratePostgres(poolOn(url), dir)).rejects.toBeInstanceOf(MigrationError);
    await expect(migratePostgres(poolOn(url), countingMigrations(1))).rejects.toThrow(/newer than this program/);
  });

  it("reports not ready when the schema is behind this build, and unreachable when the server is gone", async () => {
    const url = await freshDatabase(baseUrl);
    const dir = countingMigrations(1);
    const store = await openPostgresStore({ url, poolSize: 2, statementTimeoutMs: 5000, sslMode: "disable", migrationsDir: dir });
    try {
      expect(await store.readiness()).toEqual({ databaseReachable: true, migrationsCurrent: true });
      writeFileSync(join(dir, "002_more.sql"), "SELECT 1;");
      expect(await store.readiness()).toMatchObject({
        databaseReachable: true,
        migrationsCurrent: false,
        detail: expect.stringMatching(/version 1.*expects 2/),
      });
    } finally {
      await store.close();
    }
    const nowhere = new URL(url);
    nowhere.port = "9"; // discard: nothing listens there on loopback
    await expect(openPostgresStore({ url: nowhere.toString(), poolSize: 1, statementTimeoutMs: 1000, sslMode: "disable" })).rejects.toThrow();
  });
});
