/**
 * POST /v1/interval-analyses end to end with a year of 1-minute data (525,600 rows, ~20 MB), against a bare pass
 * that only reads the same file and splits it into lines. ratio = upload / bare (goal ≤ 3×).
 * Run alone: npx tsx bench/interval.ts
 */
import { once } from "node:events";
import { createReadStream, createWriteStream, mkdtempSync, rmSync, statSync } from "node:fs";
import { request } from "node:http";
import type { AddressInfo } from "node:net";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { pathToFileURL } from "node:url";
import { buildApp } from "../src/app.js";
import { defaultConfig } from "../src/config.js";
import { AUTH, BENCH_CONFIG } from "./http.js";

const ROWS = 525_600;
const RUNS = 3;
const QUERY = "targetPF=0.95&timeZone=America/Chicago&fixedKvar=50&bankSteps=50,50,100,100&ctRatio=200&voltageV=480";

/** A synthetic plant: weekday shifts, a night base, noise from a seeded generator (mulberry32). */
async function writeYear(path: string): Promise<void> {
  let seed = 0x2f6b1d;
  const rand = () => {
    seed = (seed + 0x6d2b79f5) | 0;
    let t = Math.imul(seed ^ (seed >>> 15), 1 | seed);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const out = createWriteStream(path);
  out.write("Timestamp,Demand kW,kvar\n");
  const start = Date.UTC(2025, 0, 1);
  let buf = "";
  for (let i = 0; i < ROWS; i++) {
    const t = start + i * 60_000;
    const hour = (i % 1440) / 60;
    const weekday = Math.floor(i / 1440 + 3) % 7 < 5; // 2025-01-01 is a Wednesday
    const shift = weekday && hour >= 6 && hour < 22 ? 1 : 0;
    const kW = 180 + 420 * shift + 40 * rand();
    const kvar = 90 + 310 * shift + 30 * rand();
    buf += `${new Date(t).toISOString().slice(0, 19)}Z,${kW.toFixed(3)},${kvar.toFixed(3)}\n`;
    if (buf.length > 1 << 16) {
      if (!out.write(buf)) await once(out, "drain");
      buf = "";
    }
  }
  out.end(buf);
  await once(out, "finish");
}

/** Read the file and split it into lines, nothing else. */
async function bare(path: string): Promise<number> {
  const decoder = new TextDecoder();
  let carry = "";
  let lines = 0;
  for await (const chunk of createReadStream(path)) {
    const parts = (carry + decoder.decode(chunk as Buffer, { stream: true })).split("\n");
    carry = parts.pop() ?? "";
    lines += parts.length;
  }
  return lines + (carry ? 1 : 0);
}

function upload(port: number, path: string): Promise<{ status: number; body: string }> {
  return new Promise((resolve, reject) => {
    const req = request(
      { host: "127.0.0.1", port, method: "POST", path: `/v1/interval-analyses?${QUERY}`, headers: { "content-type": "text/csv", "content-length": statSync(path).size, ...AUTH } },
      (res) => {
        const chunks: Buffer[] = [];
        res.on("data", (c: Buffer) => chunks.push(c));
        res.on("end", () => resolve({ status: res.statusCode ?? 0, body: Buffer.concat(chunks).toString("utf8") }));
        res.on("error", reject);
      },
    );
    req.on("error", reject);
    createReadStream(path).pipe(req);
  });
}

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)] as number;

export async function benchInterval(): Promise<{ lines: string[]; uploadMs: number; bareMs: number; ratio: number; peakRssMB: number }> {
  const dir = mkdtempSync(join(tmpdir(), "pfc-bench-interval-"));
  const file = join(dir, "year.csv");
  const app = await buildApp({ config: defaultConfig({ DATABASE_PATH: join(dir, "bench.sqlite"), DEMO_DATA: "off", LOG_LEVEL: "silent", ...BENCH_CONFIG }), logger: false });
  try {
    await writeYear(file);
    const sizeMB = statSync(file).size / 1e6;
    await app.listen({ port: 0, host: "127.0.0.1" });
    const port = (app.server.address() as AddressInfo).port;
    let peak = process.memoryUsage().rss;
    const sampler = setInterval(() => (peak = Math.max(peak, process.memoryUsage().rss)), 10);
    const uploads: number[] = [];
    const bares: number[] = [];
    const cpus: number[] = [];
    let summary = "";
    for (let run = 0; run < RUNS; run++) {
      let t = performance.now();
      const lineCount = await bare(file);
      bares.push(performance.now() - t);
      if (lineCount !== ROWS + 1) throw new Error(`bare pass counted ${lineCount} lines`);
      t = performance.now();
      const cpu = process.cpuUsage();
      const res = await upload(port, file);
      uploads.push(performance.now() - t);
      const used = process.cpuUsage(cpu);
      cpus.push((used.user + used.system) / 1000);
      if (res.status !== 200) throw new Error(`upload answered ${res.status}: ${res.body.slice(0, 300)}`);
      const json = JSON.parse(res.body) as { input: { acceptedRows: number }; neededKvar: { hold95PctKvar: number }; simulation: { switching: { operationsPerDay: number } } };
      if (json.input.acceptedRows !== ROWS) throw new Error(`accepted ${json.input.acceptedRows} rows`);
      summary = `hold95 ${json.neededKvar.hold95PctKvar.toFixed(1)} kvar, ${json.simulation.switching.operationsPerDay.toFixed(1)} switchings/day, response ${(res.body.length / 1024).toFixed(0)} KiB`;
    }
    clearInterval(sampler);
    const maxRssMB = process.resourceUsage().maxRSS / 1024;
    const uploadMs = median(uploads);
    const bareMs = median(bares);
    const peakRssMB = Math.max(peak / 1048576, maxRssMB);
    const ratio = uploadMs / bareMs;
    const fmt = (xs: number[]) => xs.map((x) => x.toFixed(0)).join(", ");
    const lines = [
      `interval upload: ${ROWS} rows, ${sizeMB.toFixed(1)} MB, median of ${RUNS}`,
      `  POST /v1/interval-analyses end to end: ${uploadMs.toFixed(0)} ms (runs ${fmt(uploads)}; goal ≤ 1500 ms)`,
      `  bare read + split into lines:           ${bareMs.toFixed(0)} ms (runs ${fmt(bares)})`,
      `  upload CPU time (client and server share this process): ${median(cpus).toFixed(0)} ms (runs ${fmt(cpus)})`,
      `  ratio upload / bare: ${ratio.toFixed(2)}× (goal ≤ 3×)`,
      `  peak RSS: ${peakRssMB.toFixed(0)} MB (process maxRSS ${maxRssMB.toFixed(0)} MB; goal ≤ 250 MB)`,
      `  ${summary}`,
    ];
    return { lines, uploadMs, bareMs, ratio, peakRssMB };
  } finally {
    await app.close();
    rmSync(dir, { recursive: true, force: true });
  }
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const r = await benchInterval();
  console.log(r.lines.join("\n"));
}
