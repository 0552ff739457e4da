import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import type { FastifyInstance } from "fastify";
import { afterAll } from "vitest";
import { buildApp, type AppOptions } from "../../src/app.js";
import { defaultConfig, type Config } from "../../src/config.js";
import type { Store } from "../../src/store/ports.js";
import { openTestStore } from "./store.js";
import { newBootstrapKey, registerAdminKey } from "./auth.js";

const made: string[] = [];

// Registered in the importing test file; after hooks run in reverse, so this runs after its own afterAll(app.close).
afterAll(() => {
  for (const dir of made.splice(0)) rmSync(dir, { recursive: true, force: true });
});

/** A fresh directory under the OS temp dir, removed after the test file. */
export function tempDir(): string {
  const dir = mkdtempSync(join(tmpdir(), "pfc-store-"));
  made.push(dir);
  return dir;
}

/** A database path (not yet created) in a fresh temp directory, removed after the test file. */
export function tempDatabasePath(name = "pfc.sqlite"): string {
  return join(tempDir(), name);
}

export interface StoreApp {
  app: FastifyInstance;
  store: Store;
  path: string;
  /** An admin key of the first organisation (PFC_BOOTSTRAP_KEY); api(app) and inject(app, …) use it by default. */
  key: string;
  /** { authorization: "Bearer <key>" } */
  auth: { authorization: string };
}

/**
 * The app on a new temp database (the store from openTestStore, test/helpers/store.ts), demo data off, no logger, a fresh bootstrap admin key, a rate limit
 * too high to matter (tests of the limit set their own), and no load shedding on event-loop lag (a loaded test
 * machine lags at start-up; test/api/pressure.test.ts turns it on); close `app` in afterAll.
 */
export async function makeStoreApp(overrides: Partial<Config> = {}, options: Omit<AppOptions, "config" | "logger"> = {}): Promise<StoreApp> {
  const path = overrides.DATABASE_PATH ?? tempDatabasePath();
  const key = overrides.PFC_BOOTSTRAP_KEY ?? newBootstrapKey();
  const config = defaultConfig({
    DEMO_DATA: "off",
    RATE_LIMIT_PER_MINUTE: 10_000_000,
    EVENT_LOOP_MAX_DELAY_MS: 0,
    ...overrides,
    DATABASE_PATH: path,
    PFC_BOOTSTRAP_KEY: key,
  });
  const { migrationsDir, now, ...rest } = options;
  const store = rest.store ?? (await openTestStore({ path, ...(migrationsDir ? { migrationsDir } : {}), ...(now ? { now } : {}) }));
  const app = await buildApp({ config, logger: false, ...rest, store, ...(now ? { now } : {}) });
  await app.ready();
  await registerAdminKey(app, key);
  return { app, store: app.store, path, key, auth: { authorization: `Bearer ${key}` } };
}

export { rowCounts } from "./store.js";
