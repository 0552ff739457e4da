import { sqliteOf } from "../src/store/sqlite/sqlite-store.js";
import { mkdtempSync, rmSync } from "node:fs";
import { createRequire } from "node:module";
import { tmpdir } from "node:os";
import { join } from "node:path";
import type autocannonType from "autocannon";
import { buildApp } from "../src/app.js";
import { defaultConfig } from "../src/config.js";
import { AUTH, BENCH_CONFIG } from "./http.js";
import type { SectionResult } from "./section.js";

const autocannon = createRequire(import.meta.url)("autocannon") as typeof autocannonType;

export const LOAD_CONNECTIONS = 100;

const building = (i: number) => ({
  name: `Load hall ${i}`,
  system: { voltageV: 400, frequencyHz: 50, phases: 3 },
  transformer: { kVA: 1000, impedancePct: 6 },
  utility: { faultMVA: 250 },
});
const survey = {
  surveyedAt: "2024-06-03T09:00:00Z",
  surveyor: "Load bench",
  targetPF: 0.95,
  loads: Array.from({ length: 8 }, (_, i) => ({
    label: `Feeder ${i + 1}`,
    kind: "motor",
    measurement: { method: "kw_pf", kW: 20 + i, pf: 0.72 + i * 0.02, sense: "lagging" },
  })),
};

/**
 * Mixed load: 100 connections for BENCH_LOAD_SECONDS (60) against the real app on 127.0.0.1 with a temp database
 * file (WAL, authenticated requests, rate limit out of the way): per connection, in turn, a building list, a survey,
 * a building's survey list, a trend and a survey POST (one write in five). Goal: 0 errors, 0 non-2xx, 0 5xx
 * (a SQLITE_BUSY would surface as a 500); p50/p99 reported.
 */
export async function benchLoad(opts: { seconds: number; connections?: number }): Promise<SectionResult> {
  const connections = opts.connections ?? LOAD_CONNECTIONS;
  const dir = mkdtempSync(join(tmpdir(), "pfc-bench-load-"));
  const app = await buildApp({
    config: defaultConfig({ DATABASE_PATH: join(dir, "load.sqlite"), DEMO_DATA: "off", LOG_LEVEL: "silent", ...BENCH_CONFIG }),
    logger: false,
  });
  try {
    const base = await app.listen({ port: 0, host: "127.0.0.1" });
    const ids: { b: string; s: string }[] = [];
    for (let i = 0; i < 10; i++) {
      const b = (await app.inject({ method: "POST", url: "/v1/buildings", payload: building(i), headers: AUTH })).json() as { id: string };
      const s = (await app.inject({ method: "POST", url: `/v1/buildings/${b.id}/surveys`, payload: survey, headers: AUTH })).json() as { id: string };
      if (!b.id || !s.id) throw new Error("the load bench could not create its buildings and surveys");
      ids.push({ b: b.id, s: s.id });
    }
    const json = { ...AUTH, "content-type": "application/json" };
    const requests = ids.flatMap(({ b, s }) => [
      { method: "GET" as const, path: "/v1/buildings?limit=20", headers: AUTH },
      { method: "GET" as const, path: `/v1/surveys/${s}`, headers: AUTH },
      { method: "GET" as const, path: `/v1/buildings/${b}/surveys?limit=20`, headers: AUTH },
      { method: "GET" as const, path: `/v1/buildings/${b}/trend`, headers: AUTH },
      { method: "POST" as const, path: `/v1/buildings/${b}/surveys`, headers: json, body: JSON.stringify(survey) },
    ]);
    const before = (sqliteOf(app.store).db.prepare("SELECT count(*) AS n FROM surveys").get() as { n: number }).n;
    const r = await autocannon({ url: base, connections, duration: opts.seconds, requests, workers: 1 });
    const after = (sqliteOf(app.store).db.prepare("SELECT count(*) AS n FROM surveys").get() as { n: number }).n;
    const stats = r.statusCodeStats ?? {};
    const fiveXX = Object.entries(stats)
      .filter(([code]) => Number(code) >= 500)
      .reduce((n, [, v]) => n + v.count, 0);
    const total = Math.round(r.requests.average * r.duration);
    const ok = r.errors === 0 && r.timeouts === 0 && r.non2xx === 0;
    return {
      rows: [
        {
          section: "load",
          metric: `mixed reads + survey POSTs, ${connections} connections, req/s`,
          value: r.requests.average.toFixed(0),
          detail: `p50 ${r.latency.p50} ms, p99 ${r.latency.p99} ms`,
        },
        { section: "load", metric: "latency p50 / p99, ms", value: `${r.latency.p50} / ${r.latency.p99}` },
        { section: "load", metric: "errors + timeouts + non-2xx", value: String(r.errors + r.timeouts + r.non2xx), goal: "0", pass: ok },
        { section: "load", metric: "5xx (SQLITE_BUSY would show here)", value: String(fiveXX), goal: "0", pass: fiveXX === 0 },
      ],
      notes: [
        `${opts.seconds} s, about ${total} requests, ${after - before} surveys stored; status codes ${JSON.stringify(stats)}`,
        `errors ${r.errors}, timeouts ${r.timeouts}, non-2xx ${r.non2xx}${r.errors > 0 ? ` (${JSON.stringify((r as { errorStats?: unknown }).errorStats ?? [])})` : ""}`,
      ],
    };
  } finally {
    await app.close();
    rmSync(dir, { recursive: true, force: true });
  }
}
