import { spawnSync } from "node:child_process";
import { cpSync, existsSync, mkdtempSync, rmSync, symlinkSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";
import Database from "better-sqlite3";
import { afterAll, beforeAll, describe, expect, it } from "vitest";

const ROOT = fileURLToPath(new URL("../../", import.meta.url));
const GUARD = fileURLToPath(new URL("./no-dev-deps.mjs", import.meta.url));

/**
 * The image runs `node dist/tools/keys.js` and `node dist/tools/backup.js` after `npm prune --omit=dev`. Here the
 * build runs into a scratch tree laid out as the image's /app (dist/, migrations/, package.json, node_modules), and
 * the tools run with plain node — no tsx — under hooks that refuse any devDependency imported from the compiled code.
 */
describe("compiled tools", () => {
  let app: string;
  const node = (args: string[], env: Record<string, string>) =>
    spawnSync(process.execPath, ["--import", GUARD, ...args], {
      cwd: app,
      encoding: "utf8",
      env: { PATH: process.env.PATH ?? "", HOME: process.env.HOME ?? "/tmp", PFC_COMPILED_ROOT: pathToFileURL(join(app, "dist")).href, ...env },
    });

  beforeAll(() => {
    app = mkdtempSync(join(tmpdir(), "pfc-image-"));
    cpSync(join(ROOT, "package.json"), join(app, "package.json"));
    cpSync(join(ROOT, "migrations"), join(app, "migrations"), { recursive: true });
    symlinkSync(join(ROOT, "node_modules"), join(app, "node_modules"), "dir");
    const tsc = spawnSync(
      process.execPath,
      [join(ROOT, "node_modules/typescript/bin/tsc"), "-p", join(ROOT, "tsconfig.build.json"), "--outDir", join(app, "dist")],
      {
        encoding: "utf8",
      },
    );
    if (tsc.status !== 0) throw new Error(`the build failed:\n${tsc.stdout}${tsc.stderr}`);
  }, 180_000);
  afterAll(() => rmSync(app, { recursive: true, force: true }));

  it("the build writes both tools", () => {
    expect(existsSync(join(app, "dist/tools/keys.js"))).toBe(true);
    expect(existsSync(join(app, "dist/tools/backup.js"))).toBe(true);
  });

  it("keys.js creates a key and backup.js copies the database, with no dev dependency loaded", () => {
    const path = join(app, "data.sqlite");
    const keys = node(["dist/tools/keys.js", "create", "--role", "surveyor", "--org", "Harbour Works", "--label", "site tablet"], {
      DATABASE_PATH: path,
    });
    expect(keys.stderr).toBe("");
    expect(keys.status).toBe(0);
    const lines = keys.stdout.trim().split("\n");
    expect(lines[0]).toMatch(/^created organisation "Harbour Works"/);
    const key = lines.at(-1) ?? "";
    expect(key.length).toBeGreaterThan(20);

    const target = join(app, "copy.sqlite");
    const backup = node(["dist/tools/backup.js", target], { DATABASE_PATH: path });
    expect(backup.stderr).toBe("");
    expect(backup.status).toBe(0);
    expect(backup.stdout.trim()).toBe(target);
    const copy = new Database(target, { readonly: true });
    const row = copy.prepare("SELECT role, label FROM api_keys WHERE label = ?").get("site tablet");
    copy.close();
    expect(row).toEqual({ role: "surveyor", label: "site tablet" });
  });

  it("the guard itself refuses a dev dependency imported from the compiled tree", () => {
    const probe = join(app, "dist/probe.js");
    cpSync(join(ROOT, "test/build/dev-dep-probe.js.txt"), probe);
    const run = node(["dist/probe.js"], {});
    expect(run.status).not.toBe(0);
    expect(run.stderr).toMatch(/imports the dev dependency fast-check/);
  });
});
