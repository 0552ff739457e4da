import { spawn, type ChildProcess } from "node:child_process";
import { createServer } from "node:net";
import { fileURLToPath } from "node:url";
import { generateKey } from "../../src/auth/keys.js";

/** The real server as a child process (node --import tsx src/server.ts), for crash and restart tests. */

const root = fileURLToPath(new URL("../../", import.meta.url));

/** The admin key every spawned server bootstraps with (PFC_BOOTSTRAP_KEY); postJson and authFetch send it. */
export const TEST_KEY = generateKey().key;
const AUTH = { authorization: `Bearer ${TEST_KEY}` };

/** fetch with Authorization: Bearer TEST_KEY. */
export function authFetch(url: string, init: RequestInit = {}): Promise<Response> {
  return fetch(url, { ...init, headers: { ...AUTH, ...((init.headers as Record<string, string> | undefined) ?? {}) } });
}

export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = createServer();
    srv.unref();
    srv.on("error", reject);
    srv.listen(0, "127.0.0.1", () => {
      const address = srv.address();
      const port = typeof address === "object" && address ? address.port : 0;
      srv.close(() => resolve(port));
    });
  });
}

export interface ServerProcess {
  child: ChildProcess;
  base: string;
  stderr: () => string;
  exited: Promise<{ code: number | null; signal: NodeJS.Signals | null }>;
}

export function spawnServer(databasePath: string, port: number, env: Record<string, string> = {}): Omit<ServerProcess, "base"> & { port: number } {
  const child = spawn(process.execPath, ["--import", "tsx", "src/server.ts"], {
    cwd: root,
    env: {
      ...process.env,
      PORT: String(port),
      HOST: "127.0.0.1",
      DATABASE_PATH: databasePath,
      DEMO_DATA: "off",
      LOG_LEVEL: "warn",
      PFC_BOOTSTRAP_KEY: TEST_KEY,
      ...env,
    },
    stdio: ["ignore", "ignore", "pipe"],
  });
  let err = "";
  child.stderr?.on("data", (d: Buffer) => (err += d.toString()));
  const exited = new Promise<{ code: number | null; signal: NodeJS.Signals | null }>((resolve) =>
    child.on("exit", (code, signal) => resolve({ code, signal })),
  );
  return { child, port, stderr: () => err, exited };
}

/** Start the server on `databasePath` and wait until /health answers. */
export async function startServer(databasePath: string, env: Record<string, string> = {}): Promise<ServerProcess> {
  const port = await freePort();
  const proc = spawnServer(databasePath, port, env);
  const base = `http://127.0.0.1:${port}`;
  let gone = false;
  void proc.exited.then(() => (gone = true));
  const deadline = Date.now() + 20_000;
  while (Date.now() < deadline) {
    if (gone) throw new Error(`the server exited during start-up: ${proc.stderr()}`);
    try {
      const res = await fetch(`${base}/health`);
      if (res.ok) return { ...proc, base };
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 50));
  }
  proc.child.kill("SIGKILL");
  throw new Error(`the server did not answer /health within 20 s: ${proc.stderr()}`);
}

export async function stopServer(s: ServerProcess): Promise<{ code: number | null; signal: NodeJS.Signals | null }> {
  s.child.kill("SIGTERM");
  return s.exited;
}

export async function postJson(url: string, body: unknown, headers: Record<string, string> = {}): Promise<{ status: number; body: any }> {
  const res = await fetch(url, { method: "POST", headers: { "content-type": "application/json", ...AUTH, ...headers }, body: JSON.stringify(body) });
  return { status: res.status, body: await res.json() };
}
