import { spawn } from "node:child_process";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { generateKey } from "../../src/auth/keys.js";
import { tempDatabasePath } from "../helpers/db.js";
import { freePort } from "./server-process.js";

const root = fileURLToPath(new URL("../../", import.meta.url));

/** Start the real server (no PFC_BOOTSTRAP_KEY), make a few requests with `key` (if any), stop it; its stdout and stderr. */
async function runServer(path: string, use: (base: string) => Promise<void>): Promise<{ out: string; err: string }> {
  const port = await freePort();
  const child = spawn(process.execPath, ["--import", "tsx", "src/server.ts"], {
    cwd: root,
    env: { ...process.env, PORT: String(port), HOST: "127.0.0.1", DATABASE_PATH: path, DEMO_DATA: "off", LOG_LEVEL: "info", PFC_BOOTSTRAP_KEY: "" },
    stdio: ["ignore", "pipe", "pipe"],
  });
  let out = "";
  let err = "";
  child.stdout.on("data", (d: Buffer) => (out += d.toString()));
  child.stderr.on("data", (d: Buffer) => (err += d.toString()));
  const exited = new Promise((resolve) => child.on("exit", resolve));
  const base = `http://127.0.0.1:${port}`;
  try {
    const deadline = Date.now() + 20_000;
    for (;;) {
      if (Date.now() > deadline) throw new Error(`no /health: ${err}`);
      const up = await fetch(`${base}/health`).then(
        (r) => r.ok,
        () => false,
      );
      if (up) break;
      await new Promise((r) => setTimeout(r, 50));
    }
    await use(base);
  } finally {
    child.kill("SIGTERM");
    await exited;
  }
  return { out, err };
}

describe("the server's first start", () => {
  it("prints a generated admin key once, on its own line and never in the request log; not again on the next start", async () => {
    const path = tempDatabasePath();
    let key = "";
    const first = await runServer(path, async () => undefined);
    const lines = first.out.split("\n").filter((l) => /pfc_[0-9a-z]{8}_/.test(l));
    expect(lines).toHaveLength(1);
    expect(lines[0]).toMatch(/^pfc-sizing: .*first admin key.*: pfc_[0-9a-z]{8}_[A-Za-z0-9_-]{43}$/);
    key = (lines[0] as string).split(": ").at(-1) as string;

    const second = await runServer(path, async (base) => {
      const ok = await fetch(`${base}/v1/buildings`, { headers: { authorization: `Bearer ${key}` } });
      expect(ok.status).toBe(200);
      const bad = await fetch(`${base}/v1/buildings`, { headers: { authorization: `Bearer ${key.slice(0, -2)}zz` } });
      expect(bad.status).toBe(401);
    });
    expect(second.out).toContain("incoming request");
    expect(second.out + second.err).not.toContain(key.slice(13));
    expect(second.out + second.err).not.toContain(key.slice(13, -2));
  }, 60_000);
});

describe("a malformed PFC_BOOTSTRAP_KEY", () => {
  it("stops the server with exit code 2 and a message that names the problem, never the value", async () => {
    // a real-looking key whose prefix holds an 'l', outside the prefix alphabet
    const good = generateKey().key;
    const bad = `pfc_l${good.slice(5)}`;
    const child = spawn(process.execPath, ["--import", "tsx", "src/server.ts"], {
      cwd: root,
      env: { ...process.env, PORT: "0", HOST: "127.0.0.1", DATABASE_PATH: tempDatabasePath(), DEMO_DATA: "off", PFC_BOOTSTRAP_KEY: bad },
      stdio: ["ignore", "pipe", "pipe"],
    });
    let all = "";
    child.stdout.on("data", (d: Buffer) => (all += d.toString()));
    child.stderr.on("data", (d: Buffer) => (all += d.toString()));
    const code = await new Promise((resolve) => child.on("exit", resolve));
    expect(code).toBe(2);
    expect(all).toContain("PFC_BOOTSTRAP_KEY");
    expect(all).toContain("except i, l, o and u");
    expect(all).not.toContain(bad.slice(13)); // the secret part
    expect(all).not.toContain(bad.slice(4, 12)); // the prefix
  }, 30_000);
});
