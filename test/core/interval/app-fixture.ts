import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import type { FastifyInstance } from "fastify";
import { buildApp } from "../../../src/app.js";
import { defaultConfig } from "../../../src/config.js";

/** The app as the server builds it, on a fresh temporary database (nothing written into the repository). */
export async function makeIntervalApp(): Promise<{ app: FastifyInstance; close: () => Promise<void> }> {
  const dir = mkdtempSync(join(tmpdir(), "pfc-interval-test-"));
  const app = await buildApp({ config: defaultConfig({ DATABASE_PATH: join(dir, "test.sqlite"), DEMO_DATA: "off" }), logger: false });
  await app.ready();
  return {
    app,
    close: async () => {
      await app.close();
      rmSync(dir, { recursive: true, force: true });
    },
  };
}

export const CSV = { "content-type": "text/csv" } as const;
