/**
 * `npm run bench`: every section in turn, then one summary table.
 * Knobs: BENCH_SECONDS (10), BENCH_CONNECTIONS (10), BENCH_WARMUP_SECONDS (3) for the HTTP sections;
 * BENCH_LOAD_SECONDS (60) for the mixed load at 100 connections;
 * BENCH_ONLY=name,name to run some sections; BENCH_DATABASE_URL (or TEST_DATABASE_URL) for the postgres section; BENCH_STRICT=1 exits 1 when a goal is missed.
 * Add a section: a module exporting an async function (knobs) => SectionResult, listed in SECTIONS.
 */
import { benchHarmonicScan, SCAN_MS_GOAL } from "./harmonic-scan.js";
import { knobsFromEnv } from "./http.js";
import type { BenchSection, SummaryRow } from "./section.js";
import { benchSizing } from "./sizing.js";
import { benchSurveys } from "./surveys.js";
import { benchInterval } from "./interval.js";
import { benchLoad } from "./load.js";
import { benchPostgres } from "./postgres.js";

function loadSeconds(env: NodeJS.ProcessEnv): number {
  const raw = env.BENCH_LOAD_SECONDS;
  if (raw === undefined || raw === "") return 60;
  const n = Number(raw);
  if (!Number.isInteger(n) || n < 1) throw new Error(`BENCH_LOAD_SECONDS must be an integer ≥ 1, got ${JSON.stringify(raw)}`);
  return n;
}

const SECTIONS: BenchSection[] = [
  { name: "sizing", run: benchSizing },
  {
    name: "surveys",
    run: async (knobs) => {
      const r = await benchSurveys({ seconds: knobs.seconds, connections: knobs.connections });
      return {
        rows: [
          { section: "surveys", metric: "POST surveys (20 loads) req/s", value: r.httpRps.toFixed(0) },
          { section: "surveys", metric: "raw transaction per survey /s", value: r.rawTxPerSec.toFixed(0) },
          { section: "surveys", metric: "bare route req/s", value: (r.bareRps ?? NaN).toFixed(0) },
          { section: "surveys", metric: "stored surveys/s (HTTP, group commit)", value: r.storedPerSec.toFixed(0) },
          { section: "surveys", metric: "http / combined ceiling", value: r.ratio.toFixed(2) },
          {
            section: "surveys",
            metric: "stored surveys / raw ceiling",
            value: r.storedOverRaw.toFixed(2),
            goal: "≥ 1.0",
            pass: r.storedOverRaw >= 1.0,
          },
        ],
        notes: r.lines,
      };
    },
  },
  {
    name: "harmonic-scan",
    run: async () => {
      const r = await benchHarmonicScan();
      return {
        rows: [
          {
            section: "harmonic-scan",
            metric: `scan ${r.points} points × ${r.stages} stages, median ms`,
            value: r.msPerScan.toFixed(2),
            goal: `≤ ${SCAN_MS_GOAL}`,
            pass: r.msPerScan <= SCAN_MS_GOAL,
          },
        ],
        notes: r.lines,
      };
    },
  },
  {
    name: "interval",
    run: async () => {
      const r = await benchInterval();
      return {
        rows: [
          {
            section: "interval",
            metric: "525,600-row upload end to end, ms",
            value: r.uploadMs.toFixed(0),
            goal: "≤ 1500",
            pass: r.uploadMs <= 1500,
          },
          {
            section: "interval",
            metric: "server peak RSS (own process), MB",
            value: r.peakRssMB.toFixed(0),
            goal: "≤ 250",
            pass: r.peakRssMB <= 250,
          },
          { section: "interval", metric: "upload / bare line split", value: r.ratio.toFixed(1), goal: "≤ 3", pass: r.ratio <= 3 },
        ],
        notes: r.lines,
      };
    },
  },
  { name: "load", run: () => benchLoad({ seconds: loadSeconds(process.env) }) },
  { name: "postgres", run: (knobs) => benchPostgres({ seconds: knobs.seconds, connections: knobs.connections }) },
];

function table(rows: SummaryRow[]): string {
  const head = ["section", "metric", "value", "goal", "ok", "detail"];
  const cells = rows.map((r) => [r.section, r.metric, r.value, r.goal ?? "", r.pass === undefined ? "" : r.pass ? "yes" : "NO", r.detail ?? ""]);
  const widths = head.map((h, i) => Math.max(h.length, ...cells.map((c) => (c[i] ?? "").length)));
  const line = (c: string[]) =>
    c
      .map((x, i) => x.padEnd(widths[i] ?? 0))
      .join("  ")
      .trimEnd();
  return [line(head), line(widths.map((w) => "-".repeat(w))), ...cells.map(line)].join("\n");
}

async function main(): Promise<number> {
  const knobs = knobsFromEnv(process.env);
  const only = process.env.BENCH_ONLY?.split(",")
    .map((s) => s.trim())
    .filter(Boolean);
  const chosen = only?.length ? SECTIONS.filter((s) => only.includes(s.name)) : SECTIONS;
  if (only?.length && chosen.length !== only.length) {
    process.stderr.write(`unknown section in BENCH_ONLY; known: ${SECTIONS.map((s) => s.name).join(", ")}\n`);
    return 2;
  }
  const rows: SummaryRow[] = [];
  const notes: string[] = [];
  let failed = false;
  for (const section of chosen) {
    process.stdout.write(`running ${section.name}…\n`);
    try {
      const r = await section.run(knobs);
      rows.push(...r.rows);
      notes.push(...(r.notes ?? []).map((n) => `${section.name}: ${n}`));
    } catch (err) {
      failed = true;
      rows.push({ section: section.name, metric: "error", value: "-", pass: false, detail: (err as Error).message });
    }
  }
  process.stdout.write(`\n${table(rows)}\n`);
  if (notes.length) process.stdout.write(`\n${notes.join("\n")}\n`);
  const missed = rows.some((r) => r.pass === false);
  return failed || (missed && process.env.BENCH_STRICT === "1") ? 1 : 0;
}

process.exitCode = await main();
