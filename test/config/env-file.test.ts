import { readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { parseEnv } from "node:util";
import { afterEach, describe, expect, it } from "vitest";
import { defaultConfig, loadConfig, loadEnvFileIfPresent } from "../../src/config.js";
import { tempDir } from "../helpers/db.js";

const root = fileURLToPath(new URL("../../", import.meta.url));

describe(".env.example", () => {
  it("is read by Node's own .env parser into variables the service knows and accepts", () => {
    const text = readFileSync(join(root, ".env.example"), "utf8");
    const vars = parseEnv(text);
    const known = [...Object.keys(defaultConfig()), "PFC_BOOTSTRAP_KEY"];
    expect(Object.keys(vars).length).toBeGreaterThan(5);
    for (const name of Object.keys(vars)) expect(known, name).toContain(name);
    // every variable is at least mentioned, the secret one commented out
    for (const name of known) expect(text, name).toMatch(new RegExp(`^#? ?${name}=`, "m"));
    expect(() => loadConfig(vars)).not.toThrow();
  });
});

describe("loading .env", () => {
  const names = ["PFC_TEST_FROM_FILE", "PFC_TEST_FROM_SHELL"];
  afterEach(() => {
    for (const n of names) delete process.env[n];
  });

  it("takes a file's variables, lets the environment win, and does nothing without a file", () => {
    const file = join(tempDir(), ".env");
    writeFileSync(file, "PFC_TEST_FROM_FILE=file\nPFC_TEST_FROM_SHELL=file\n");
    process.env.PFC_TEST_FROM_SHELL = "shell";
    loadEnvFileIfPresent(file);
    expect(process.env.PFC_TEST_FROM_FILE).toBe("file");
    expect(process.env.PFC_TEST_FROM_SHELL).toBe("shell");
    expect(() => loadEnvFileIfPresent(join(tempDir(), "absent.env"))).not.toThrow();
  });

  it("npm start runs the built server with Node's --env-file-if-exists and does not rebuild", () => {
    const pkg = JSON.parse(readFileSync(join(root, "package.json"), "utf8")) as { scripts: Record<string, string>; engines: { node: string } };
    expect(pkg.scripts.start).toBe("node --env-file-if-exists=.env dist/server.js");
    expect(pkg.scripts.prestart).not.toContain("build &&");
    // the Node that --env-file-if-exists and process.loadEnvFile need, and the one .nvmrc names
    expect(pkg.engines.node).toBe(`>=${readFileSync(join(root, ".nvmrc"), "utf8").trim()}`);
  });
});
