import { randomBytes } from "node:crypto";
import { createRequire } from "node:module";
import type autocannonType from "autocannon";
import pg from "pg";
import { newId } from "../src/store/ids.js";
import { startServer, type ServerProcess } from "../test/helpers/server-process.js";
import { AUTH, BENCH_KEY } from "./http.js";
import type { SectionResult } from "./section.js";

const autocannon = createRequire(import.meta.url)("autocannon") as typeof autocannonType;

/**
 * Stored surveys per second on PostgreSQL: POST /v1/buildings/{id}/surveys (8 loads) through one server process,
 * then through two on the same database (the load split between them), against a raw ceiling measured in the same
 * run — one pg transaction per survey writing the same rows (head, revision, audit) copied from a survey the
 * service stored, with as many transactions in flight as HTTP connections. Needs BENCH_DATABASE_URL or
 * TEST_DATABASE_URL (a server where the user may create databases); skipped with a note otherwise.
 */

const BUILDING = {
  name: "Bench forge",
  system: { voltageV: 400, frequencyHz: 50, phases: 3 },
  transformer: { kVA: 1000, impedancePct: 6 },
  utility: { faultMVA: 250 },
};
const SURVEY = {
  surveyedAt: "2024-06-03T09:00:00Z",
  surveyor: "Postgres bench",
  targetPF: 0.95,
  loads: Array.from({ length: 8 }, (_, i) => ({
    label: `Feeder ${i + 1}`,
    kind: "motor",
    measurement: { method: "kw_pf", kW: 20 + i, pf: 0.72 + i * 0.02, sense: "lagging" },
  })),
};
const POOL_SIZE = 10;

async function withAdmin<T>(url: string, fn: (c: pg.Client) => Promise<T>): Promise<T> {
  const c = new pg.Client({ connectionString: url });
  await c.connect();
  try {
    return await fn(c);
  } finally {
    await c.end();
  }
}

async function load(urls: string[], path: string, seconds: number, connections: number): Promise<{ rps: number; bad: number }> {
  const per = Math.max(1, Math.round(connections / urls.length));
  const runs = await Promise.all(
    urls.map((u) =>
      autocannon({
        url: `${u}${path}`,
        method: "POST",
        headers: { "content-type": "application/json", ...AUTH },
        body: JSON.stringify(SURVEY),
        connections: per,
        duration: seconds,
        workers: 1,
      }),
    ),
  );
  return { rps: runs.reduce((s, r) => s + r.requests.average, 0), bad: runs.reduce((s, r) => s + r.non2xx + r.errors + r.timeouts, 0) };
}

/** One transaction per survey, `inFlight` at once, copying a stored survey's rows under new ids. */
async function rawCeiling(url: string, template: string, seconds: number, inFlight: number): Promise<number> {
  const pool = new pg.Pool({ connectionString: url, max: inFlight });
  try {
    let n = 0;
    const until = performance.now() + seconds * 1000;
    const started = performance.now();
    const worker = async () => {
      while (performance.now() < until) {
        const client = await pool.connect();
        try {
          const id = newId("srv");
          const at = new Date().toISOString();
          await client.query("BEGIN");
          await client.query(
            `INSERT INTO surveys (id, org_id, building_id, created_at, latest_revision, surveyed_at, surveyed_at_utc, surveyor, kw, kvar, kva,
               displacement_pf, kvar_required, warning_count, installed_kvar_in_service, installed_kvar_delivered)
             SELECT $1, org_id, building_id, $2, latest_revision, surveyed_at, surveyed_at_utc, surveyor, kw, kvar, kva,
               displacement_pf, kvar_required, warning_count, installed_kvar_in_service, installed_kvar_delivered FROM surveys WHERE id = $3`,
            [id, at, template],
          );
          await client.query(
            `INSERT INTO survey_revisions (org_id, survey_id, n, reason, created_at, actor, inputs_json, result_json, engine_version,
               building_snapshot_json, kw, kvar, kva, displacement_pf, kvar_required, warning_count, installed_kvar_in_service, installed_kvar_delivered)
             SELECT org_id, $1, n, reason, $2, actor, inputs_json, result_json, engine_version, building_snapshot_json, kw, kvar, kva,
               displacement_pf, kvar_required, warning_count, installed_kvar_in_service, installed_kvar_delivered
             FROM survey_revisions WHERE survey_id = $3 AND n = 1`,
            [id, at, template],
          );
          await client.query(
            `INSERT INTO audit_log (org_id, actor, action, resource_type, resource_id, request_id, at)
             SELECT org_id, actor, action, resource_type, $1, request_id, $2 FROM audit_log WHERE resource_id = $3 ORDER BY id LIMIT 1`,
            [id, at, template],
          );
          await client.query("COMMIT");
          n++;
        } finally {
          client.release();
        }
      }
    };
    await Promise.all(Array.from({ length: inFlight }, worker));
    return n / ((performance.now() - started) / 1000);
  } finally {
    await pool.end();
  }
}

export async function benchPostgres(opts: { seconds: number; connections: number }): Promise<SectionResult> {
  const base = process.env.BENCH_DATABASE_URL || process.env.TEST_DATABASE_URL;
  if (!base) {
    return {
      rows: [{ section: "postgres", metric: "skipped", value: "-", detail: "no BENCH_DATABASE_URL or TEST_DATABASE_URL" }],
      notes: ['skipped: eval "$(scripts/test-services.sh start)" gives a throw-away PostgreSQL (TEST_DATABASE_URL); stop it after'],
    };
  }
  const name = `pfc_bench_${randomBytes(4).toString("hex")}`;
  await withAdmin(base, (c) => c.query(`CREATE DATABASE ${name}`));
  const u = new URL(base);
  u.pathname = `/${name}`;
  const url = u.toString();
  const servers: ServerProcess[] = [];
  try {
    const env = { DATABASE_URL: url, DATABASE_POOL_SIZE: String(POOL_SIZE), PFC_BOOTSTRAP_KEY: BENCH_KEY, LOG_LEVEL: "silent" };
    servers.push(...(await Promise.all([startServer(env), startServer(env)])));
    const [first, second] = servers;
    if (!first || !second) throw new Error("the bench servers did not start");
    const headers = { "content-type": "application/json", ...AUTH };
    const b = (await (await fetch(`${first.baseUrl}/v1/buildings`, { method: "POST", headers, body: JSON.stringify(BUILDING) })).json()) as {
      id: string;
    };
    const path = `/v1/buildings/${b.id}/surveys`;
    const s = (await (await fetch(`${first.baseUrl}${path}`, { method: "POST", headers, body: JSON.stringify(SURVEY) })).json()) as { id: string };
    if (!b.id || !s.id) throw new Error("the bench could not store its building and first survey");

    await load([first.baseUrl, second.baseUrl], path, 1, opts.connections); // warm-up, both instances
    const one = await load([first.baseUrl], path, opts.seconds, opts.connections);
    const two = await load([first.baseUrl, second.baseUrl], path, opts.seconds, opts.connections);
    const raw = await rawCeiling(url, s.id, opts.seconds, opts.connections);
    const bad = one.bad + two.bad;
    return {
      rows: [
        { section: "postgres", metric: "POST surveys, 1 instance, req/s", value: one.rps.toFixed(0) },
        { section: "postgres", metric: "POST surveys, 2 instances, req/s", value: two.rps.toFixed(0) },
        { section: "postgres", metric: "raw pg transaction per survey /s", value: raw.toFixed(0) },
        { section: "postgres", metric: "1 instance / raw", value: (one.rps / raw).toFixed(2) },
        { section: "postgres", metric: "2 instances / raw", value: (two.rps / raw).toFixed(2) },
        {
          section: "postgres",
          metric: "2 instances / 1 instance",
          value: (two.rps / one.rps).toFixed(2),
          ...(bad > 0 ? { detail: `${bad} non-2xx or errors` } : {}),
        },
      ],
      notes: [
        `PostgreSQL at ${u.host}, database ${name} (dropped after); ${opts.connections} connections, ${opts.seconds} s per run, pool ${POOL_SIZE} per instance`,
        `the raw ceiling copies the head, revision and audit rows of a stored survey in one transaction each, ${opts.connections} in flight`,
        "the instances and the database share this machine's cores, so two instances measure contention as much as scale-out",
      ],
    };
  } finally {
    await Promise.all(servers.map((x) => x.stop()));
    await withAdmin(base, (c) => c.query(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`));
  }
}
