/**
 * The heavy-work pool: large harmonic scans, report rendering and interval analyses run on worker threads
 * (piscina) so that the event loop keeps answering other requests. Threads start on the first task and stop when
 * idle. The worker loads the TypeScript sources through tsx's loader when this module itself runs from source
 * (vitest, tsx scripts), and the compiled dist/ files otherwise.
 */
import { Piscina } from "piscina";
import { problem, ProblemError } from "../http/problem.js";
import type { HeavyEnvelope, HeavyPayload, HeavyResult, HeavyTaskName } from "./tasks.js";
import type { IntervalSeries } from "../core/interval/series-types.js";

/** Young-generation size of each worker thread's heap, MB (measured against the interval bench's peak RSS). */
const YOUNG_GENERATION_MB = 8;

export interface HeavyWorkOptions {
  /** Worker threads; 0 runs every task inline on the calling thread. */
  threads: number;
  /** Tasks waiting for a thread beyond which a new task is refused (503). */
  maxQueue: number;
  /** Retry-After of that refusal, seconds. */
  retryAfterS: number;
  /** A thread idle this long exits, ms. */
  idleTimeoutMs?: number;
}

export interface HeavyWork {
  run<K extends HeavyTaskName>(name: K, payload: HeavyPayload<K>, transfer?: ArrayBuffer[]): Promise<HeavyResult<K>>;
  /** Stop the threads (app close). */
  close(): Promise<void>;
}

/** Where the worker's code is, and how a thread must start to load it. */
export function workerEntry(moduleUrl: string = import.meta.url): { filename: string; execArgv: string[] } {
  const fromSource = moduleUrl.endsWith(".ts");
  return {
    filename: new URL(fromSource ? "./worker.ts" : "./worker.js", moduleUrl).href,
    execArgv: fromSource ? ["--import", "tsx"] : [],
  };
}

export function busyProblem(detail: string, retryAfterS: number): ProblemError {
  return new ProblemError(problem(503, "overloaded", "The service is busy", detail), { "retry-after": String(retryAfterS) });
}

export function createHeavyWork(o: HeavyWorkOptions): HeavyWork {
  let pool: Piscina | null = null;
  const poolOf = (): Piscina => {
    pool ??= new Piscina({
      ...workerEntry(),
      minThreads: 0,
      maxThreads: o.threads,
      maxQueue: o.maxQueue,
      idleTimeout: o.idleTimeoutMs ?? 30_000,
      // A small young generation: a task's arrays are few and large (they live outside the V8 heap), so a big
      // nursery only adds resident memory per thread.
      resourceLimits: { maxYoungGenerationSizeMb: YOUNG_GENERATION_MB },
    });
    return pool;
  };
  return {
    async run(name, payload, transfer) {
      const envelope = { name, payload } as HeavyEnvelope<typeof name>;
      if (o.threads === 0) return (await (await import("./tasks.js")).runHeavyTask(envelope)) as HeavyResult<typeof name>;
      const p = poolOf();
      const full = () => busyProblem(`${p.queueSize} heavy tasks are waiting for a worker thread; the limit is ${o.maxQueue}`, o.retryAfterS);
      if (p.queueSize >= o.maxQueue) throw full();
      try {
        return (await p.run(envelope, transfer ? { transferList: transfer } : {})) as HeavyResult<typeof name>;
      } catch (err) {
        // piscina's own queue bound (it counts threads still starting as capacity) refuses the same way
        if (err instanceof Error && err.message === "Task queue is at limit") throw full();
        throw err;
      }
    },
    async close() {
      const p = pool;
      pool = null;
      await p?.destroy();
    },
  };
}

/** A series' buffers, to move (not copy) to the worker; distinct buffers only. */
export function seriesTransfer(series: IntervalSeries): ArrayBuffer[] {
  const buffers = [series.timestampsMs.buffer, series.kW.buffer, series.kvar.buffer].filter((b): b is ArrayBuffer => b instanceof ArrayBuffer);
  return [...new Set(buffers)];
}
