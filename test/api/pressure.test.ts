/**
 * Load shedding: once the event loop has lagged beyond EVENT_LOOP_MAX_DELAY_MS, requests are answered 503
 * problem+json with Retry-After, /health excepted, until the lag is gone. The lag is made here by holding the loop.
 * Tests build their apps with the check off (test/helpers/db.ts); this one turns it on.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { FastifyInstance } from "fastify";
import { makeStoreApp } from "../helpers/db.js";
import { inject } from "../helpers/auth.js";

const LIMIT_MS = 100;
const RETRY_AFTER_S = 7;

/** Hold the event loop for `ms` (nothing else in this process runs meanwhile). */
function holdLoop(ms: number): void {
  const end = performance.now() + ms;
  while (performance.now() < end) {
    // busy: the point of the test
  }
}

const pause = (ms: number) => new Promise((r) => setTimeout(r, ms));

/** Ask until `status` comes back (the lag is sampled every EVENT_LOOP_SAMPLE_MS), at most `tries` times. */
async function until(app: FastifyInstance, status: number, tries: number) {
  for (let i = 0; i < tries; i++) {
    const res = await inject(app, "/v1/buildings");
    if (res.statusCode === status) return res;
    await pause(20);
  }
  return null;
}

describe("load shedding on event-loop lag", () => {
  let app: FastifyInstance;
  beforeAll(async () => {
    ({ app } = await makeStoreApp({ EVENT_LOOP_MAX_DELAY_MS: LIMIT_MS, EVENT_LOOP_SAMPLE_MS: 200, OVERLOAD_RETRY_AFTER_S: RETRY_AFTER_S }));
  });
  afterAll(async () => {
    await app.close();
  });

  it("answers 503 problem+json with Retry-After while the loop lags, /health 200, and recovers", async () => {
    expect((await until(app, 200, 100))?.statusCode).toBe(200); // calm before
    // Sustained lag: the loop held 600 ms at a time, with requests in between: each 200 ms tick fires ~400 ms late.
    let busy = null;
    for (let i = 0; i < 20 && busy === null; i++) {
      holdLoop(600);
      await pause(5); // the timers phase runs: the sampling tick fires, late
      const res = await inject(app, "/v1/buildings");
      if (res.statusCode === 503) busy = res;
    }
    expect(busy, "no 503 while the loop stalled 600 ms at a time").not.toBeNull();
    expect(busy!.headers["retry-after"]).toBe(String(RETRY_AFTER_S));
    expect(busy!.headers["content-type"]).toMatch(/^application\/problem\+json/);
    const body = busy!.json();
    expect(body).toMatchObject({ type: "/problems/overloaded", status: 503, title: "The service is busy", instance: "/v1/buildings" });
    expect(body.detail).toMatch(/lagged \d+ ms, above the 100 ms limit/);
    // within the same sample, /health still answers
    const health = await app.inject("/health");
    expect(health.statusCode).toBe(200);
    expect(health.json()).toEqual({ status: "ok" });
    // the next samples see a calm loop again
    expect((await until(app, 200, 200))?.statusCode).toBe(200);
  });

  it("documents the problem type", async () => {
    const res = await app.inject("/problems/overloaded");
    expect(res.statusCode).toBe(200);
    expect(res.body).toMatch(/Retry-After/);
  });
});
