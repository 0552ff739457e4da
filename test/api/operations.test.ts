import { describe, expect, it } from "vitest";
import { makeStoreApp } from "../helpers/db.js";

describe("/health and /ready", () => {
  it("/ready answers 200 on a migrated store, 503 problem+json with Retry-After once the store is gone", async () => {
    const { app, store } = await makeStoreApp({ RATE_LIMIT_PER_MINUTE: 2 });
    try {
      const ok = await app.inject("/ready");
      expect(ok.statusCode).toBe(200);
      expect(ok.json()).toEqual({ status: "ready", database: "reachable", migrations: "current" });
      // neither probe needs a key nor counts against the rate limit (2 a minute here)
      for (let i = 0; i < 5; i++) {
        expect((await app.inject("/health")).statusCode).toBe(200);
        expect((await app.inject("/ready")).statusCode).toBe(200);
      }
      await store.close();
      const gone = await app.inject("/ready");
      expect(gone.statusCode).toBe(503);
      expect(gone.headers["content-type"]).toMatch(/^application\/problem\+json/);
      expect(gone.headers["retry-after"]).toBe("5");
      expect(gone.json()).toMatchObject({ type: "/problems/not-ready", status: 503 });
      expect((await app.inject("/health")).statusCode).toBe(200); // liveness does not touch the database
    } finally {
      await app.close();
    }
  });
});
