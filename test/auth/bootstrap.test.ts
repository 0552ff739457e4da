import { execFile } from "node:child_process";
import { fileURLToPath } from "node:url";
import { promisify } from "node:util";
import { Writable } from "node:stream";
import { describe, expect, it } from "vitest";
import { buildApp } from "../../src/app.js";
import { generateKey } from "../../src/auth/keys.js";
import { defaultConfig, loadConfig } from "../../src/config.js";
import { openSqliteStore } from "../../src/store/sqlite/sqlite-store.js";
import { api, bearer, inject } from "../helpers/auth.js";
import { makeStoreApp, rowCounts, tempDatabasePath } from "../helpers/db.js";
import { databaseEnvFor } from "../helpers/store.js";
import { buildingBody } from "../store/fixtures.js";

const run = promisify(execFile);
const root = fileURLToPath(new URL("../../", import.meta.url));
const keysCli = (path: string, args: string[], env: Record<string, string> = { DATABASE_PATH: path }) =>
  run(process.execPath, ["--import", "tsx", "src/tools/keys.ts", ...args], { cwd: root, env: { ...process.env, ...env } });

describe("bootstrap key", () => {
  it("generates one admin key on a database without keys, hands it over once, and not again on the next start", async () => {
    const path = tempDatabasePath();
    const config = defaultConfig({ DATABASE_PATH: path, DEMO_DATA: "off" });
    const given: string[] = [];
    const app = await buildApp({ config, logger: false, onGeneratedKey: (k) => given.push(k) });
    expect(given).toHaveLength(1);
    expect((await inject(app, "/v1/keys", given[0])).json().items).toMatchObject([{ role: "admin", createdBy: "bootstrap" }]);
    await app.close();
    const again = await buildApp({ config, logger: false, onGeneratedKey: (k) => given.push(k) });
    expect(given).toHaveLength(1);
    expect((await inject(again, "/v1/buildings", given[0])).statusCode).toBe(200);
    await again.close();
  });

  it("takes PFC_BOOTSTRAP_KEY when set and refuses a malformed one naming the variable", async () => {
    const key = generateKey().key;
    expect(loadConfig({ PFC_BOOTSTRAP_KEY: key }).PFC_BOOTSTRAP_KEY).toBe(key);
    expect(() => loadConfig({ PFC_BOOTSTRAP_KEY: "letmein" })).toThrow(/PFC_BOOTSTRAP_KEY/);
    expect(() => loadConfig({ CORS_ORIGINS: "https://ok.example, not an origin" })).toThrow(/CORS_ORIGINS/);
    expect(() => loadConfig({ RATE_LIMIT_PER_MINUTE: "0" })).toThrow(/RATE_LIMIT_PER_MINUTE/);
    expect(() => loadConfig({ REQUEST_TIMEOUT_MS: "abc" })).toThrow(/REQUEST_TIMEOUT_MS/);
    const given: string[] = [];
    const app = await buildApp({
      config: defaultConfig({ DATABASE_PATH: ":memory:", DEMO_DATA: "off", PFC_BOOTSTRAP_KEY: key }),
      logger: false,
      onGeneratedKey: (k) => given.push(k),
    });
    expect(given).toEqual([]);
    expect((await inject(app, "/v1/keys", key)).statusCode).toBe(200);
    await app.close();
  });

  it("says what is wrong with a malformed PFC_BOOTSTRAP_KEY, and the alphabets, without repeating it", () => {
    const good = generateKey().key;
    const secret = good.slice(13);
    const cases: [string, RegExp][] = [
      [`pfc_o${good.slice(5)}`, /prefix may hold only the digits 0-9 and the lower-case letters a-z except i, l, o and u/],
      [`pfc_ABCDEFGH_${secret}`, /prefix may hold only/],
      [`pfc_abc_${secret}`, /prefix \(between pfc_ and the next _\) has 3 characters, not 8/],
      [`${good}\n`, /white space/],
      [`key_${good.slice(4)}`, /does not start with pfc_/],
      [`${good}Q`, /secret \(after the prefix's _\) has 44 characters, not 43/],
      [`${good.slice(0, -1)}!`, /secret may hold only A-Z, a-z, 0-9, - and _/],
      [good.slice(0, 12), /the _ between the prefix and the secret is missing/],
    ];
    for (const [value, reason] of cases) {
      let message = "";
      try {
        loadConfig({ PFC_BOOTSTRAP_KEY: value });
      } catch (err) {
        message = (err as Error).message;
      }
      expect(message, JSON.stringify(value)).toMatch(/PFC_BOOTSTRAP_KEY/);
      expect(message).toMatch(reason);
      // every message states the whole shape with both alphabets
      expect(message).toContain("a-z except i, l, o and u");
      expect(message).toContain("43 characters: A-Z, a-z, 0-9, - and _");
      expect(message).not.toContain(secret.slice(0, 20));
      expect(message).not.toContain(value.slice(4, 12));
      expect(message).toContain("not shown");
    }
    // other variables still show what they got
    expect(() => loadConfig({ RATE_LIMIT_PER_MINUTE: "0" })).toThrow(/got "0"/);
  });

  it("never writes a key to the request log", async () => {
    let log = "";
    const stream = new Writable({ write: (chunk, _e, done) => ((log += chunk.toString()), done()) });
    const key = generateKey().key;
    const config = defaultConfig({ DATABASE_PATH: ":memory:", DEMO_DATA: "off", PFC_BOOTSTRAP_KEY: key, LOG_LEVEL: "trace" });
    const app = await buildApp({ config, logger: { level: "trace", stream } });
    const created = (await inject(app, { method: "POST", url: "/v1/keys", payload: { role: "surveyor" } }, key)).json().key as string;
    await inject(app, "/v1/buildings", created);
    await inject(app, "/v1/buildings", `${key.slice(0, -1)}x`);
    await app.close();
    expect(log).toContain("incoming request");
    for (const k of [key, created]) expect(log).not.toContain(k.slice(13));
  });
});

describe("npm run keys", () => {
  it("creates a key in a new organisation offline, printing the key alone on its last line", async () => {
    const path = tempDatabasePath();
    // The database the test store will open for this path (SQLite file, or PostgreSQL with TEST_STORE=postgres).
    const env = await databaseEnvFor(path);
    const { stdout } = await keysCli(path, ["create", "--role", "surveyor", "--org", "Second company"], env);
    const lines = stdout.trimEnd().split("\n");
    const key = lines.at(-1) as string;
    expect(key).toMatch(/^pfc_[0-9a-z]{8}_[A-Za-z0-9_-]{43}$/);
    expect(stdout).toContain('created organisation "Second company"');
    const again = await keysCli(path, ["create", "--role", "auditor", "--org", "Second company"], env);
    expect(again.stdout).not.toContain("created organisation");

    const { app, key: admin } = await makeStoreApp({ DATABASE_PATH: path });
    try {
      const mine = await api(app, admin)
        .post("/v1/buildings")
        .send(buildingBody({ name: "First company hall" }));
      const theirs = await api(app, key)
        .post("/v1/buildings")
        .send(buildingBody({ name: "Second company hall" }));
      expect(theirs.status).toBe(201);
      expect((await api(app, key).get(`/v1/buildings/${mine.body.id}`)).status).toBe(404);
      expect((await api(app, key).get("/v1/buildings")).body.items.map((b: any) => b.name)).toEqual(["Second company hall"]);
      expect((await inject(app, "/v1/keys", again.stdout.trimEnd().split("\n").at(-1))).statusCode).toBe(403);
      expect((await api(app).get("/v1/audit-log").set(bearer(admin))).body.items.every((e: any) => e.resourceId !== theirs.body.id)).toBe(true);
    } finally {
      await app.close();
    }
  });

  it("refuses a bad role or command with a usage line and stores nothing", async () => {
    const path = tempDatabasePath();
    await keysCli(path, ["create", "--role", "admin"]);
    const counts = async () => {
      const store = await openSqliteStore({ path });
      try {
        return await rowCounts(store);
      } finally {
        await store.close();
      }
    };
    const before = await counts();
    for (const args of [["create", "--role", "root"], ["create"], ["delete", "--role", "admin"], ["create", "--role", "admin", "--org", " "]]) {
      const err = await keysCli(path, args).then(
        () => undefined,
        (e: { code: number; stderr: string }) => e,
      );
      expect(err?.code, args.join(" ")).toBe(2);
      expect(err?.stderr).toMatch(/usage|--role|--org/);
    }
    expect(await counts()).toEqual(before);
  });
});
