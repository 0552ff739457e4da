import { randomBytes } from "node:crypto";
import pg from "pg";
import { afterAll, describe, it } from "vitest";

/**
 * PostgreSQL for the tests: TEST_DATABASE_URL names a database on a server where the user may create databases
 * (scripts/test-services.sh start prints one). Each test file works in fresh databases of its own, dropped after.
 */
export const TEST_DATABASE_URL = process.env.TEST_DATABASE_URL;

const HOW_TO =
  'PostgreSQL tests skipped: no TEST_DATABASE_URL. Run them with: eval "$(scripts/test-services.sh start)"; npx vitest run; scripts/test-services.sh stop';

/**
 * `describe` for tests that need PostgreSQL. Without TEST_DATABASE_URL they skip locally (saying how to run them)
 * and fail under CI=true, where the database is expected.
 */
export function describePostgres(name: string, body: (url: string) => void): void {
  const url = TEST_DATABASE_URL;
  if (url) {
    describe(name, () => body(url));
  } else if (process.env.CI === "true") {
    describe(name, () => {
      it("has the PostgreSQL that CI expects", () => {
        throw new Error("CI=true but TEST_DATABASE_URL is not set: .ci/run starts PostgreSQL with scripts/test-services.sh");
      });
    });
  } else {
    describe.skip(`${name} — ${HOW_TO}`, () => body(""));
  }
}

const made: { admin: string; name: string }[] = [];

afterAll(async () => {
  for (const { admin, name } of made.splice(0)) {
    const client = new pg.Client({ connectionString: admin });
    await client.connect();
    try {
      await client.query(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`);
    } finally {
      await client.end();
    }
  }
});

/** A new empty database on the server of `baseUrl`; its URL. Dropped after the test file. */
export async function freshDatabase(baseUrl: string): Promise<string> {
  const name = `pfc_t_${randomBytes(6).toString("hex")}`;
  const client = new pg.Client({ connectionString: baseUrl });
  await client.connect();
  try {
    await client.query(`CREATE DATABASE ${name}`);
  } finally {
    await client.end();
  }
  made.push({ admin: baseUrl, name });
  const u = new URL(baseUrl);
  u.pathname = `/${name}`;
  return u.toString();
}
