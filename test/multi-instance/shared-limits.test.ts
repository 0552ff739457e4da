import { afterAll, beforeAll, expect, it } from "vitest";
import { newBootstrapKey } from "../helpers/auth.js";
import { describePostgres, freshDatabase } from "../helpers/postgres.js";
import { startServer, type ServerProcess } from "../helpers/server-process.js";

// With REDIS_URL the rate limit is one budget across instances (the README says: without it, one per instance).

const REDIS = process.env.TEST_REDIS_URL;
const LIMIT = 10;

describePostgres("a rate limit shared through Redis by two instances", (baseUrl) => {
  let servers: ServerProcess[] = [];
  const key = newBootstrapKey();

  beforeAll(async () => {
    if (!REDIS) throw new Error('TEST_REDIS_URL is not set: eval "$(scripts/test-services.sh start)" starts a redis-server too');
    const url = await freshDatabase(baseUrl);
    const env = { DATABASE_URL: url, PFC_BOOTSTRAP_KEY: key, REDIS_URL: REDIS, RATE_LIMIT_PER_MINUTE: String(LIMIT) };
    servers = await Promise.all([startServer(env), startServer(env)]);
  }, 120_000);
  afterAll(async () => {
    await Promise.all(servers.map((s) => s.stop()));
  });

  it(`lets ${LIMIT} requests of one key through across both instances in a minute, not ${LIMIT} each`, async () => {
    const statuses: number[] = [];
    // 7 to each: under the limit on either alone, over it together.
    for (let i = 0; i < 14; i++) {
      const via = servers[i % 2];
      if (!via) throw new Error("an instance is missing");
      const r = await fetch(`${via.baseUrl}/v1/buildings`, { headers: { authorization: `Bearer ${key}` } });
      await r.arrayBuffer();
      statuses.push(r.status);
    }
    expect(statuses.filter((s) => s === 200)).toHaveLength(LIMIT);
    expect(statuses.filter((s) => s === 429)).toHaveLength(14 - LIMIT);
  });
});
