import { spawnSync } from "node:child_process";
import { existsSync } from "node:fs";
import { join } from "node:path";
import Database from "better-sqlite3";
import { describe, expect, it } from "vitest";
import { backupDatabase } from "../../src/store/sqlite/backup.js";
import { makeStoreApp, rowCounts, tempDir } from "../helpers/db.js";

const root = new URL("../../", import.meta.url).pathname;

describe("backup", () => {
  it("copies a database while the app has it open, as one self-contained checked file", async () => {
    const { app, store, path } = await makeStoreApp({ DEMO_DATA: "on" });
    const target = join(tempDir(), "sub", "copy.sqlite");
    const outcome = await backupDatabase(path, target);
    expect(outcome).toMatchObject({ file: target, integrity: "ok" });
    const copy = new Database(target, { readonly: true });
    expect(copy.pragma("journal_mode", { simple: true })).toBe("delete");
    const tables = await rowCounts(store);
    for (const [table, n] of Object.entries(tables)) {
      expect((copy.prepare(`SELECT count(*) AS n FROM "${table}"`).get() as { n: number }).n, table).toBe(n);
    }
    copy.close();
    expect(existsSync(`${target}-wal`)).toBe(false);
    await expect(backupDatabase(path, target)).rejects.toThrow(/already exists/);
    await expect(backupDatabase(join(tempDir(), "none.sqlite"), join(tempDir(), "x.sqlite"))).rejects.toThrow(/no database/);
    await app.close();
  });

  it("npm run backup -- <file> prints the written file", async () => {
    const { app, path } = await makeStoreApp({ DEMO_DATA: "on" });
    const target = join(tempDir(), "nightly.sqlite");
    const run = spawnSync(process.execPath, ["--import", "tsx", "src/tools/backup.ts", target], {
      cwd: root,
      env: { ...process.env, DATABASE_PATH: path },
      encoding: "utf8",
    });
    expect(run.stderr).toBe("");
    expect(run.status).toBe(0);
    expect(run.stdout.trim()).toBe(target);
    const copy = new Database(target, { readonly: true });
    expect((copy.prepare("SELECT count(*) AS n FROM surveys").get() as { n: number }).n).toBe(2);
    copy.close();
    const usage = spawnSync(process.execPath, ["--import", "tsx", "src/tools/backup.ts"], { cwd: root, encoding: "utf8" });
    expect(usage.status).toBe(2);
    expect(usage.stderr).toMatch(/usage: npm run backup -- <backup-file>/);
    await app.close();
  });
});
