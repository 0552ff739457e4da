import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import type { FastifyInstance } from "fastify";
import { buildApp } from "../../../src/app.js";
import { defaultConfig } from "../../../src/config.js";
import { newBootstrapKey, registerAdminKey } from "../../helpers/auth.js";

/** The app as the server builds it, on a fresh temporary database (nothing written into the repository). */
export async function makeIntervalApp(): Promise<{ app: FastifyInstance; close: () => Promise<void> }> {
  const dir = mkdtempSync(join(tmpdir(), "pfc-interval-test-"));
  const key = newBootstrapKey();
  const config = defaultConfig({
    DATABASE_PATH: join(dir, "test.sqlite"),
    DEMO_DATA: "off",
    PFC_BOOTSTRAP_KEY: key,
    RATE_LIMIT_PER_MINUTE: 10_000_000,
    EVENT_LOOP_MAX_DELAY_MS: 0,
  });
  const app = await buildApp({ config, logger: false });
  await app.ready();
  await registerAdminKey(app, key);
  return {
    app,
    close: async () => {
      await app.close();
      rmSync(dir, { recursive: true, force: true });
    },
  };
}

export const CSV = { "content-type": "text/csv" } as const;
