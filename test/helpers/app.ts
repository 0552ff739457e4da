import type { FastifyInstance } from "fastify";
import { buildApp } from "../../src/app.js";
import { defaultConfig, type Config } from "../../src/config.js";
import { newBootstrapKey, registerAdminKey } from "./auth.js";

/**
 * The application as tests use it: default configuration with an in-memory database and no demo data
 * (each app its own, nothing written to ./data), plus optional overrides; no logger; ready for `inject`
 * or for supertest on `app.server`. Close it in afterAll. Tests that need a database file on disk use
 * makeStoreApp from ./db.ts. The app has a fresh bootstrap admin key: call it with api(app) or inject(app, …) from ./auth.ts.
 */
export async function makeTestApp(overrides: Partial<Config> = {}): Promise<FastifyInstance> {
  const key = overrides.PFC_BOOTSTRAP_KEY ?? newBootstrapKey();
  const config = defaultConfig({
    DATABASE_PATH: ":memory:",
    DEMO_DATA: "off",
    RATE_LIMIT_PER_MINUTE: 10_000_000,
    EVENT_LOOP_MAX_DELAY_MS: 0,
    ...overrides,
    PFC_BOOTSTRAP_KEY: key,
  });
  const app = await buildApp({ config, logger: false });
  await app.ready();
  await registerAdminKey(app, key);
  return app;
}
