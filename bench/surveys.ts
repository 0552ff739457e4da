import { mkdtempSync, rmSync } from "node:fs";
import { createRequire } from "node:module";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { buildApp } from "../src/app.js";
import { defaultConfig } from "../src/config.js";
import { AUTH, BENCH_CONFIG } from "./http.js";
import { size } from "../src/core/pipeline/size.js";
import { surveyInputsSchema } from "../src/http/schemas/surveys.js";
import { computeRevision } from "../src/application/survey-sizing.js";
import { parseOr400 } from "../src/http/validate.js";
import { newId } from "../src/store/ids.js";
import { DEFAULT_ORG_ID } from "../src/store/ports.js";
import { auditRepo } from "../src/store/sqlite/audit-repo.js";
import { buildingsRepo } from "../src/store/sqlite/buildings-repo.js";
import type { GroupCommitStats } from "../src/store/sqlite/group-commit.js";
import { openSqliteStore, sqliteOf } from "../src/store/sqlite/sqlite-store.js";
import { surveysRepo } from "../src/store/sqlite/surveys-repo.js";

/**
 * Survey writes: HTTP POST /v1/buildings/{id}/surveys with 20 loads (autocannon against the real
 * app on 127.0.0.1 and a temp database), the bare rate of a route that only parses the same body,
 * and the raw rate of one better-sqlite3 transaction per survey writing the same rows through the
 * same repositories (WAL, synchronous = FULL: SQLite's fsync inside every COMMIT, one per survey; the service's own
 * connection runs NORMAL and syncs the log itself off the event loop, src/store/sqlite/wal-file.ts). The goal
 * (issue 16): stored surveys per second over HTTP ≥ that raw ceiling, which only group commit (many surveys per
 * fsync) can reach.
 * The HTTP load and the raw loop alternate in 1-second slices (the same moments' load on a shared machine); stored
 * surveys count over the seconds autocannon ran; the notes give how many surveys each COMMIT carried.
 * The older combined ratio http / (1/(1/bare + 1/raw)) is printed beside it.
 */

interface AutocannonResult {
  requests: { average: number; total: number };
  /** Seconds the load actually ran (its worker thread's start-up excluded). */
  duration: number;
  non2xx: number;
  errors: number;
  timeouts: number;
}
type Autocannon = (opts: Record<string, unknown>) => Promise<AutocannonResult>;
const autocannon = createRequire(import.meta.url)("autocannon") as Autocannon;

const BUILDING = {
  name: "Bench hall",
  system: { voltageV: 480, frequencyHz: 60 as const, phases: 3 as const },
  transformer: { kVA: 1500, impedancePct: 5.75 },
  utility: { faultMVA: 250 },
};

function surveyOf20Loads() {
  const methods = [
    (i: number) => ({ method: "kw_pf", kW: 10 + i, pf: 0.72 + (i % 6) * 0.03, sense: "lagging" }),
    (i: number) => ({ method: "v_i_pf", volts: 480, amps: 20 + i * 3, pf: 0.8, sense: "lagging" }),
    (i: number) => ({ method: "kw_kva", kW: 15 + i, kVA: 22 + i }),
    (i: number) => ({ method: "kw_kvar", kW: 30, kvar: 12 + i }),
  ];
  return {
    surveyedAt: "2024-04-02T09:00:00Z",
    surveyor: "Bench surveyor",
    targetPF: 0.95,
    loads: Array.from({ length: 20 }, (_, i) => ({
      label: `Feeder ${i + 1}`,
      kind: i % 5 === 0 ? "drive" : "motor",
      measurement: methods[i % methods.length]!(i),
    })),
  };
}

async function load(url: string, body: string, seconds: number, connections: number): Promise<AutocannonResult> {
  // the load generator runs in a worker thread, so the server keeps the main thread to itself
  return autocannon({
    url,
    method: "POST",
    headers: { "content-type": "application/json", ...AUTH },
    body,
    connections,
    duration: seconds,
    workers: 1,
  });
}

/** The raw ceiling's writer: one better-sqlite3 transaction per survey, SQLite's own fsync in each COMMIT. */
async function rawWriter(dir: string): Promise<{ run(seconds: number): { n: number; seconds: number }; close(): Promise<void> }> {
  const store = await openSqliteStore({ path: join(dir, "raw.sqlite") });
  const { db } = store;
  // the store's connection syncs its log itself (synchronous = NORMAL); the ceiling is SQLite's own fsync per COMMIT
  db.pragma("synchronous = FULL");
  if (db.pragma("synchronous", { simple: true }) !== 2) throw new Error("the raw loop must run with synchronous = FULL");
  const buildings = buildingsRepo(db);
  const surveys = surveysRepo(db);
  const audit = auditRepo(db);
  const write = <T>(fn: () => T): T => db.transaction(fn).immediate();
  const building = write(() =>
    buildings.create(DEFAULT_ORG_ID, newId("bld"), { ...BUILDING, address: null, notes: null }, "bench", new Date().toISOString()),
  );
  const inputs = parseOr400(surveyInputsSchema, surveyOfLoadsParsed());
  const template = computeRevision(building, inputs, { surveyId: "x", n: 1, reason: null, actor: "bench", at: new Date().toISOString() });
  return {
    run(seconds) {
      const until = performance.now() + seconds * 1000;
      let n = 0;
      const started = performance.now();
      while (performance.now() < until) {
        write(() => {
          const at = new Date().toISOString();
          const surveyId = newId("srv");
          surveys.create(DEFAULT_ORG_ID, building.id, { ...template, surveyId, createdAt: at });
          audit.record({
            orgId: DEFAULT_ORG_ID,
            actor: "bench",
            action: "survey.create",
            resourceType: "survey",
            resourceId: surveyId,
            requestId: "bench",
            at,
          });
        });
        n++;
      }
      return { n, seconds: (performance.now() - started) / 1000 };
    },
    close: () => store.close(),
  };
}
const surveyOfLoadsParsed = surveyOf20Loads;

/** The COMMITs between two readings of the counts: how many, transactions per COMMIT, and how often each size. */
export function groupsSince(a: GroupCommitStats, b: GroupCommitStats): string {
  const groups = b.groups - a.groups;
  if (groups === 0) return "no COMMIT";
  const syncs = b.syncs - a.syncs;
  const sizes = b.bySize
    .map((n, size) => [size, (n ?? 0) - (a.bySize[size] ?? 0)] as const)
    .filter(([, n]) => n > 0)
    .map(([size, n]) => `${size}×${n}`);
  const perCommit = ((b.transactions - a.transactions) / groups).toFixed(1);
  return `${groups} COMMITs, ${perCommit} transactions each on average, ${syncs} syncs of the log; sizes ${sizes.join(" ")}`;
}

/** For the report only: how many times a second the engine alone sizes this survey. */
function engineRate(seconds: number): number {
  const inputs = parseOr400(surveyInputsSchema, surveyOf20Loads());
  const { surveyedAt: _a, surveyor: _b, ...rest } = inputs;
  const input = { ...rest, system: BUILDING.system, transformer: BUILDING.transformer, utility: BUILDING.utility };
  const started = performance.now();
  let n = 0;
  while (performance.now() - started < seconds * 1000) {
    if (!size(input).ok) throw new Error("the bench survey does not size");
    n++;
  }
  return n / ((performance.now() - started) / 1000);
}

export async function benchSurveys(opts: { seconds: number; connections: number }): Promise<{
  httpRps: number;
  rawTxPerSec: number;
  bareRps?: number;
  ratio: number;
  /** Surveys stored per second over HTTP / raw one-transaction-per-survey rate (the issue 16 goal: ≥ 1.0). */
  storedOverRaw: number;
  storedPerSec: number;
  lines: string[];
}> {
  const dir = mkdtempSync(join(tmpdir(), "pfc-bench-"));
  const app = await buildApp({
    config: defaultConfig({ DATABASE_PATH: join(dir, "http.sqlite"), DEMO_DATA: "off", LOG_LEVEL: "silent", ...BENCH_CONFIG }),
    logger: false,
  });
  app.post("/bench/bare", async (request) => {
    parseOr400(surveyInputsSchema, request.body);
    return { ok: true };
  });
  try {
    const base = await app.listen({ port: 0, host: "127.0.0.1" });
    const created = await app.inject({ method: "POST", url: "/v1/buildings", payload: BUILDING, headers: AUTH });
    const buildingId = (created.json() as { id: string }).id;
    const body = JSON.stringify(surveyOf20Loads());
    const surveysUrl = `${base}/v1/buildings/${buildingId}/surveys`;

    await load(surveysUrl, body, 1, opts.connections); // warm-up
    const sqlite = sqliteOf(app.store);
    const count = () => (sqlite.db.prepare("SELECT count(*) AS n FROM surveys").get() as { n: number }).n;
    const groupsBefore = sqlite.groupCommitStats();
    // The HTTP run and the raw loop alternate in 1-second slices: on a shared machine the load of the moment moves
    // both alike, so their ratio is measured under the same conditions.
    const raw = await rawWriter(dir);
    let stored = 0;
    let httpSeconds = 0;
    let httpRequests = 0;
    let rawN = 0;
    let rawSeconds = 0;
    const rawSlices: number[] = [];
    const httpResults: AutocannonResult[] = [];
    try {
      for (let slice = 0; slice < Math.max(1, Math.round(opts.seconds)); slice++) {
        const beforeSlice = count();
        const http = await load(surveysUrl, body, 1, opts.connections);
        httpResults.push(http);
        // over the seconds autocannon ran: the start-up of its worker thread is no time the server could store in
        stored += count() - beforeSlice;
        httpSeconds += http.duration;
        httpRequests += http.requests.total;
        const r = raw.run(1);
        rawN += r.n;
        rawSeconds += r.seconds;
        rawSlices.push(r.n / r.seconds);
      }
    } finally {
      await raw.close();
    }
    const storedPerSec = stored / httpSeconds;
    const rawTxPerSec = rawN / rawSeconds;
    const batches = groupsSince(groupsBefore, sqlite.groupCommitStats());
    const bare = await load(`${base}/bench/bare`, body, opts.seconds, opts.connections);
    const engineRps = engineRate(Math.min(2, opts.seconds));

    const httpRps = httpRequests / httpSeconds;
    const bareRps = bare.requests.average;
    const ceiling = 1 / (1 / bareRps + 1 / rawTxPerSec);
    const ratio = httpRps / ceiling;
    const storedOverRaw = storedPerSec / rawTxPerSec;
    const bad = [...httpResults, bare].reduce((sum, r) => sum + r.non2xx + r.errors + r.timeouts, 0);
    const lines = [
      `surveys: POST /v1/buildings/{id}/surveys, 20 loads, ${opts.connections} connections, ${opts.seconds} s each (http and raw in alternate 1-s slices)`,
      `  http (parse + engine + group commit):    ${httpRps.toFixed(0)} req/s, ${storedPerSec.toFixed(0)} surveys stored/s (${stored} in the slices)`,
      `  bare route (parse only):                 ${bareRps.toFixed(0)} req/s`,
      `  group commit during the http run:        ${batches}`,
      `  raw better-sqlite3 transaction/survey:   ${rawTxPerSec.toFixed(0)} tx/s (WAL, synchronous=FULL; slices ${rawSlices.map((r) => r.toFixed(0)).join(" ")})`,
      `  engine size() alone (for context):       ${engineRps.toFixed(0)} /s`,
      `  ratio http / (1/(1/bare + 1/raw)):        ${ratio.toFixed(2)}`,
      `  stored surveys/s / raw tx/s:             ${storedOverRaw.toFixed(2)} (goal ≥ 1.0)`,
      ...(bad > 0 ? [`  WARNING: ${bad} non-2xx, errors or timeouts`] : []),
    ];
    return { httpRps, rawTxPerSec, bareRps, ratio, storedOverRaw, storedPerSec, lines };
  } finally {
    await app.close();
    rmSync(dir, { recursive: true, force: true });
  }
}
