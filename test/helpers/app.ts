import type { FastifyInstance } from "fastify";
import { buildApp } from "../../src/app.js";
import { defaultConfig, type Config } from "../../src/config.js";

/**
 * The application as tests use it: default configuration with an in-memory database and no demo data
 * (each app its own, nothing written to ./data), plus optional overrides; no logger; ready for `inject`
 * or for supertest on `app.server`. Close it in afterAll. Tests that need a database file on disk use
 * makeStoreApp from ./db.ts.
 */
export async function makeTestApp(overrides: Partial<Config> = {}): Promise<FastifyInstance> {
  const config = defaultConfig({ DATABASE_PATH: ":memory:", DEMO_DATA: "off", ...overrides });
  const app = await buildApp({ config, logger: false });
  await app.ready();
  return app;
}
