import autocannon from "autocannon";
import type { FastifyInstance } from "fastify";
import { buildApp } from "../src/app.js";
import { generateKey } from "../src/auth/keys.js";
import { defaultConfig, type Config } from "../src/config.js";

/** The admin key every bench app bootstraps with (PFC_BOOTSTRAP_KEY); bench requests send AUTH. */
export const BENCH_KEY = generateKey().key;
export const AUTH = { authorization: `Bearer ${BENCH_KEY}` } as const;
/** Bench config: the bench key, and no rate limit in the way of the load generator. */
export const BENCH_CONFIG: Partial<Config> = { PFC_BOOTSTRAP_KEY: BENCH_KEY, RATE_LIMIT_PER_MINUTE: 10_000_000 };

/** Knobs shared by every HTTP section; read once from the environment by bench/run.ts. */
export interface Knobs {
  seconds: number;
  connections: number;
  warmupSeconds: number;
}

export function knobsFromEnv(env: NodeJS.ProcessEnv): Knobs {
  const int = (name: string, fallback: number, min: number) => {
    const raw = env[name];
    if (raw === undefined || raw === "") return fallback;
    const n = Number(raw);
    if (!Number.isInteger(n) || n < min) throw new Error(`${name} must be an integer ≥ ${min}, got ${JSON.stringify(raw)}`);
    return n;
  };
  return {
    seconds: int("BENCH_SECONDS", 10, 1),
    connections: int("BENCH_CONNECTIONS", 10, 1),
    warmupSeconds: int("BENCH_WARMUP_SECONDS", 3, 0),
  };
}

export interface RunningApp {
  app: FastifyInstance;
  baseUrl: string;
  close(): Promise<void>;
}

/**
 * The real application listening on 127.0.0.1 on an ephemeral port, logger silent, in-memory database
 * without demo data. `extend` may register bench-only routes before the app starts.
 */
export async function startApp(extend?: (app: FastifyInstance) => void, overrides: Partial<Config> = {}): Promise<RunningApp> {
  const config = defaultConfig({ LOG_LEVEL: "silent", DATABASE_PATH: ":memory:", DEMO_DATA: "off", ...BENCH_CONFIG, ...overrides });
  const app = await buildApp({ config, logger: { level: "silent" } });
  extend?.(app);
  const baseUrl = await app.listen({ host: "127.0.0.1", port: 0 });
  return { app, baseUrl, close: () => app.close() };
}

export interface LoadResult {
  reqPerSec: number;
  p50Ms: number;
  p99Ms: number;
  requests: number;
  non2xx: number;
  errors: number;
}

/** autocannon POSTing one JSON body; throws if any response was not 2xx or a connection failed. */
export async function postLoad(url: string, body: string, seconds: number, connections: number, workers = 1): Promise<LoadResult> {
  const r = await autocannon({
    url,
    method: "POST",
    headers: { "content-type": "application/json", ...AUTH },
    body,
    connections,
    duration: seconds,
    ...(workers > 0 ? { workers } : {}),
  });
  const result: LoadResult = {
    reqPerSec: r.requests.average,
    p50Ms: r.latency.p50,
    p99Ms: r.latency.p99,
    requests: Math.round(r.requests.average * r.duration),
    non2xx: r.non2xx,
    errors: r.errors,
  };
  if (r.non2xx > 0 || r.errors > 0) {
    throw new Error(`${url}: ${r.non2xx} non-2xx responses and ${r.errors} errors (${JSON.stringify(r.statusCodeStats ?? {})})`);
  }
  return result;
}
