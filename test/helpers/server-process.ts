import { spawn, type ChildProcess } from "node:child_process";
import { createServer } from "node:net";
import { fileURLToPath } from "node:url";

/**
 * A real server process (src/server.ts through tsx, as `npm start` runs dist/server.js), for tests and benches that
 * need several instances on one database. Its output is kept for the failure message.
 */
export interface ServerProcess {
  readonly baseUrl: string;
  readonly child: ChildProcess;
  /** Resolves with the exit code (null when killed by a signal). */
  readonly exited: Promise<number | null>;
  output(): string;
  /** SIGTERM and wait for the exit. */
  stop(): Promise<void>;
}

const ROOT = fileURLToPath(new URL("../../", import.meta.url));
const START_TIMEOUT_MS = 45_000;

/** A loopback port nobody listens on right now (asked of the kernel). */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = createServer();
    s.once("error", reject);
    s.listen(0, "127.0.0.1", () => {
      const address = s.address();
      s.close(() => (typeof address === "object" && address ? resolve(address.port) : reject(new Error("no port"))));
    });
  });
}

/** Start one instance with `env` added to a quiet default environment; resolves once /health answers 200. */
export async function startServer(env: Record<string, string>): Promise<ServerProcess> {
  const port = await freePort();
  const child = spawn(process.execPath, ["--import", "tsx", "src/server.ts"], {
    cwd: ROOT,
    env: {
      PATH: process.env.PATH ?? "",
      HOME: process.env.HOME ?? "/tmp",
      HOST: "127.0.0.1",
      PORT: String(port),
      LOG_LEVEL: "warn",
      DEMO_DATA: "off",
      RATE_LIMIT_PER_MINUTE: "10000000",
      ...env,
    },
    stdio: ["ignore", "pipe", "pipe"],
  });
  let out = "";
  child.stdout?.on("data", (d: Buffer) => (out = (out + d.toString()).slice(-20_000)));
  child.stderr?.on("data", (d: Buffer) => (out = (out + d.toString()).slice(-20_000)));
  const exited = new Promise<number | null>((resolve) => child.once("exit", (code) => resolve(code)));
  let gone = false;
  void exited.then(() => (gone = true));
  const baseUrl = `http://127.0.0.1:${port}`;
  const started = Date.now();
  for (;;) {
    if (gone) throw new Error(`the server exited while starting:\n${out}`);
    if (Date.now() - started > START_TIMEOUT_MS) {
      child.kill("SIGKILL");
      throw new Error(`the server did not answer /health within ${START_TIMEOUT_MS} ms:\n${out}`);
    }
    try {
      if ((await fetch(`${baseUrl}/health`)).ok) break;
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 100));
  }
  return {
    baseUrl,
    child,
    exited,
    output: () => out,
    async stop() {
      if (!gone) child.kill("SIGTERM");
      await exited;
    },
  };
}
