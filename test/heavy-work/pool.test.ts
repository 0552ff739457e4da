import { afterEach, describe, expect, it } from "vitest";
import { createHeavyWork, seriesTransfer, workerEntry, type HeavyWork } from "../../src/heavy-work/pool.js";
import { ProblemError } from "../../src/http/problem.js";

// Invented site: 480 V, one 200 kW motor at PF 0.75 on a 1000 kVA 5.75 % transformer.
const input = {
  system: { voltageV: 480, frequencyHz: 60, phases: 3 as const },
  targetPF: 0.95,
  loads: [{ label: "Pump", kind: "motor" as const, measurement: { method: "kw_pf" as const, kW: 200, pf: 0.75, sense: "lagging" as const } }],
  transformer: { kVA: 1000, impedancePct: 5.75 },
};
const scanTask = { input, options: { forceHarmonicStudy: true, harmonics: { includeScanSeries: true } } } as never;

let pool: HeavyWork | null = null;
afterEach(async () => {
  await pool?.close();
  pool = null;
});

describe("the heavy-work pool", () => {
  it("loads the worker from the sources through tsx here, and from dist/ when compiled", () => {
    expect(workerEntry("file:///app/src/heavy-work/pool.ts")).toEqual({
      filename: "file:///app/src/heavy-work/worker.ts",
      execArgv: ["--import", "tsx"],
    });
    expect(workerEntry("file:///app/dist/heavy-work/pool.js")).toEqual({ filename: "file:///app/dist/heavy-work/worker.js", execArgv: [] });
  });

  it("gives the same answer on a worker thread as inline", async () => {
    pool = createHeavyWork({ threads: 1, maxQueue: 4, retryAfterS: 3 });
    const inline = createHeavyWork({ threads: 0, maxQueue: 4, retryAfterS: 3 });
    const [a, b] = await Promise.all([pool.run("harmonicScan", scanTask), inline.run("harmonicScan", scanTask)]);
    expect(ArrayBuffer.isView(a) && ArrayBuffer.isView(b)).toBe(true);
    expect(Buffer.from(a as Uint8Array).equals(Buffer.from(b as Uint8Array))).toBe(true);
    expect(JSON.parse(Buffer.from(a as Uint8Array).toString("utf8")).study.withoutCapacitors.series.orders.length).toBeGreaterThan(100);
  });

  it("refuses a task beyond the queue bound with a 503 problem carrying Retry-After", async () => {
    pool = createHeavyWork({ threads: 1, maxQueue: 1, retryAfterS: 3 });
    const results = await Promise.allSettled([1, 2, 3, 4].map(() => pool!.run("harmonicScan", scanTask)));
    const refused = results.filter((r): r is PromiseRejectedResult => r.status === "rejected");
    expect(results.some((r) => r.status === "fulfilled")).toBe(true);
    expect(refused.length).toBeGreaterThanOrEqual(1);
    for (const r of refused) {
      expect(r.reason).toBeInstanceOf(ProblemError);
      const e = r.reason as ProblemError;
      expect(e.problem).toMatchObject({ status: 503, type: "/problems/overloaded" });
      expect(e.headers["retry-after"]).toBe("3");
    }
  });

  it("moves a series' distinct buffers", () => {
    const ts = new Float64Array(8);
    const shared = new Float64Array(16);
    const series = { timestampsMs: ts, kW: shared.subarray(0, 4), kvar: shared.subarray(4, 8), length: 4, intervalMinutes: 15 };
    expect(seriesTransfer(series)).toEqual([ts.buffer, shared.buffer]);
  });
});
