/**
 * POST /v1/interval-analyses end to end with a year of 1-minute data (525,600 rows, ~20 MB), against a bare pass
 * that only reads the same file and splits it into lines. ratio = upload / bare (goal ≤ 3×). The server runs in a
 * child process, so its peak RSS is measured apart from this client's (goal ≤ 250 MB); BENCH_SERVER_FROM=dist
 * runs the compiled service (build first) as `npm start` does — node dist/server.js configured by environment, no
 * TypeScript loader in the process — instead of the sources through tsx (bench/interval-server.ts).
 * Run alone: npx tsx bench/interval.ts
 */
import { spawn, type ChildProcess } from "node:child_process";
import { once } from "node:events";
import { createReadStream, createWriteStream, mkdtempSync, readFileSync, rmSync, statSync } from "node:fs";
import { createServer, request } from "node:http";
import type { AddressInfo } from "node:net";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";
import { AUTH, BENCH_KEY } from "./http.js";

const ROWS = 525_600;
/** Uploads (and bare passes) measured; the median is reported. BENCH_INTERVAL_RUNS overrides. */
const RUNS = Number(process.env.BENCH_INTERVAL_RUNS || 3);
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
      {
        host: "127.0.0.1",
        port,
        method: "POST",
        path: `/v1/interval-analyses?${QUERY}`,
        headers: { "content-type": "text/csv", "content-length": statSync(path).size, ...AUTH },
      },
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

/** A TCP port free on the loopback now (the dist server is given its port, as in production). */
async function freePort(): Promise<number> {
  const probe = createServer();
  probe.listen(0, "127.0.0.1");
  await once(probe, "listening");
  const port = (probe.address() as AddressInfo).port;
  probe.close();
  await once(probe, "close");
  return port;
}

/** GET /health until it answers 200 (the dist server prints nothing when ready). */
async function healthy(port: number, child: ChildProcess): Promise<void> {
  for (let tries = 0; tries < 600; tries++) {
    if (child.exitCode !== null) throw new Error(`the bench server exited (${child.exitCode}) before listening`);
    const status = await new Promise<number>((resolve) => {
      const req = request({ host: "127.0.0.1", port, path: "/health" }, (res) => {
        res.resume();
        resolve(res.statusCode ?? 0);
      });
      req.on("error", () => resolve(0));
      req.end();
    });
    if (status === 200) return;
    await new Promise((r) => setTimeout(r, 50));
  }
  throw new Error("the bench server did not answer /health within 30 s");
}

/**
 * The server in a child process: the sources through tsx's loader (bench/interval-server.ts), like the rest of the
 * bench, or with BENCH_SERVER_FROM=dist the compiled service as production starts it (node dist/server.js).
 */
async function startServer(dir: string): Promise<{ child: ChildProcess; port: number }> {
  const env = { ...process.env, DATABASE_PATH: join(dir, "bench.sqlite"), PFC_BOOTSTRAP_KEY: BENCH_KEY };
  if (process.env.BENCH_SERVER_FROM === "dist") {
    const port = await freePort();
    const child = spawn(process.execPath, [fileURLToPath(new URL("../dist/server.js", import.meta.url))], {
      env: { ...env, PORT: String(port), HOST: "127.0.0.1", DEMO_DATA: "off", LOG_LEVEL: "silent", RATE_LIMIT_PER_MINUTE: "10000000" },
      stdio: ["ignore", "ignore", "inherit"],
    });
    await healthy(port, child);
    return { child, port };
  }
  const child = spawn(process.execPath, ["--import", "tsx", fileURLToPath(new URL("./interval-server.ts", import.meta.url))], {
    env,
    stdio: ["ignore", "pipe", "inherit"],
  });
  let out = "";
  const port = await new Promise<number>((resolve, reject) => {
    child.once("exit", (code) => reject(new Error(`the bench server exited (${code}) before listening`)));
    child.stdout?.on("data", (c: Buffer) => {
      out += c.toString("utf8");
      const m = /listening (\d+)/.exec(out);
      if (m) resolve(Number(m[1]));
    });
  });
  child.removeAllListeners("exit");
  return { child, port };
}

/** Peak resident set of a process, MB (Linux: VmHWM in /proc/<pid>/status; NaN elsewhere). */
function peakRssMB(pid: number): number {
  try {
    const m = /VmHWM:\s*(\d+) kB/.exec(readFileSync(`/proc/${pid}/status`, "utf8"));
    return m ? Number(m[1]) / 1024 : Number.NaN;
  } catch {
    return Number.NaN;
  }
}

/**
 * CPU time a process has used so far, all its threads, ms (Linux: utime + stime in /proc/<pid>/stat; NaN
 * elsewhere). Unlike the wall time, barely moved by other processes sharing the machine.
 */
function cpuMs(pid: number): number {
  try {
    const stat = readFileSync(`/proc/${pid}/stat`, "utf8");
    const fields = stat.slice(stat.lastIndexOf(")") + 2).split(" ");
    return ((Number(fields[11]) + Number(fields[12])) * 1000) / 100; // USER_HZ is 100 on Linux
  } catch {
    return Number.NaN;
  }
}

async function stop(child: ChildProcess): Promise<void> {
  if (child.exitCode !== null) return;
  const exited = once(child, "exit");
  child.kill("SIGTERM");
  await exited;
}

export async function benchInterval(): Promise<{ lines: string[]; uploadMs: number; bareMs: number; ratio: number; peakRssMB: number }> {
  const dir = mkdtempSync(join(tmpdir(), "pfc-bench-interval-"));
  const file = join(dir, "year.csv");
  let server: { child: ChildProcess; port: number } | null = null;
  try {
    await writeYear(file);
    const sizeMB = statSync(file).size / 1e6;
    server = await startServer(dir);
    const { child, port } = server;
    const startRssMB = peakRssMB(child.pid as number);
    const uploads: number[] = [];
    const bares: number[] = [];
    const serverCpu: number[] = [];
    let summary = "";
    for (let run = 0; run < RUNS; run++) {
      let t = performance.now();
      const lineCount = await bare(file);
      bares.push(performance.now() - t);
      if (lineCount !== ROWS + 1) throw new Error(`bare pass counted ${lineCount} lines`);
      const cpu = cpuMs(child.pid as number);
      t = performance.now();
      const res = await upload(port, file);
      uploads.push(performance.now() - t);
      serverCpu.push(cpuMs(child.pid as number) - cpu);
      if (res.status !== 200) throw new Error(`upload answered ${res.status}: ${res.body.slice(0, 300)}`);
      const json = JSON.parse(res.body) as {
        input: { acceptedRows: number };
        neededKvar: { hold95PctKvar: number };
        simulation: { switching: { operationsPerDay: number } };
      };
      if (json.input.acceptedRows !== ROWS) throw new Error(`accepted ${json.input.acceptedRows} rows`);
      summary = `hold95 ${json.neededKvar.hold95PctKvar.toFixed(1)} kvar, ${json.simulation.switching.operationsPerDay.toFixed(1)} switchings/day, response ${(res.body.length / 1024).toFixed(0)} KiB`;
    }
    const peak = peakRssMB(child.pid as number);
    const uploadMs = median(uploads);
    const bareMs = median(bares);
    const ratio = uploadMs / bareMs;
    const fmt = (xs: number[]) => xs.map((x) => x.toFixed(0)).join(", ");
    const lines = [
      `interval upload: ${ROWS} rows, ${sizeMB.toFixed(1)} MB, median of ${RUNS}; the server in its own process`,
      `  POST /v1/interval-analyses end to end: ${uploadMs.toFixed(0)} ms (runs ${fmt(uploads)}; goal ≤ 1500 ms)`,
      `  bare read + split into lines:           ${bareMs.toFixed(0)} ms (runs ${fmt(bares)})`,
      `  ratio upload / bare: ${ratio.toFixed(2)}× (goal ≤ 3×); the first upload starts the worker threads`,
      `  server CPU per upload, all threads: ${median(serverCpu).toFixed(0)} ms (runs ${fmt(serverCpu)})`,
      `  server peak RSS (VmHWM): ${peak.toFixed(0)} MB (${startRssMB.toFixed(0)} MB once listening; goal ≤ 250 MB)`,
      `  ${summary}`,
    ];
    return { lines, uploadMs, bareMs, ratio, peakRssMB: peak };
  } finally {
    if (server) await stop(server.child);
    rmSync(dir, { recursive: true, force: true });
  }
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const r = await benchInterval();
  console.log(r.lines.join("\n"));
}
