import { performance } from "node:perf_hooks";
import { twentyLoadBody } from "./bodies.js";
import { size } from "../src/core/pipeline/size.js";
import { sizingRequestSchema } from "../src/http/schemas/sizing.js";
import type { SizingInput } from "../src/core/inputs.js";

/** Goal: the engine's size() for the bench's 20-load body with its harmonic study, in ms. */
export const ENGINE_MS_GOAL = 0.2;

/**
 * The bench body with its drives (every sixth load, as issue 16 measured it): they are harmonic sources, so the
 * sizing runs its harmonic study (the bus, every stage of the recommended and proposed banks, a detuned proposal).
 */
export function twentyLoadBodyWithDrives(): Record<string, unknown> {
  const body = twentyLoadBody() as { loads: { kind?: string }[] };
  body.loads.forEach((l, i) => {
    if (i % 6 === 3) l.kind = "drive";
  });
  return body;
}

/** Median of `batches` timings of `perBatch` calls, ms per call, after a warm-up. */
function msPerCall(f: () => unknown, perBatch: number, batches = 15, warmup = 2000): number {
  for (let i = 0; i < warmup; i++) f();
  const t: number[] = [];
  for (let b = 0; b < batches; b++) {
    const t0 = performance.now();
    for (let i = 0; i < perBatch; i++) f();
    t.push((performance.now() - t0) / perBatch);
  }
  t.sort((a, b) => a - b);
  return t[Math.floor(t.length / 2)] ?? NaN;
}

let sink = 0;

/**
 * The floor the engine is compared with: one pass of plain arithmetic over the same loads, each reading to its
 * kW and kvar and the site's sums (what any sizing must do at least), no objects allocated.
 */
function arithmeticLoop(input: SizingInput, voltageV: number): number {
  let kW = 0;
  let kvar = 0;
  for (const load of input.loads) {
    const m = load.measurement;
    const q = load.quantity ?? 1;
    let p = 0;
    let r = 0;
    if (m.method === "kw_kva") {
      p = m.kW;
      r = Math.sqrt(Math.max(0, m.kVA * m.kVA - p * p));
    } else if (m.method === "kw_kvar") {
      p = m.kW;
      r = m.kvar;
    } else if (m.method === "kw_pf") {
      p = m.kW;
      r = p * Math.tan(Math.acos(m.pf));
    } else if (m.method === "v_i_kw") {
      p = m.kW;
      const s = (Math.sqrt(3) * m.volts * m.amps) / 1000;
      r = Math.sqrt(Math.max(0, s * s - p * p));
    } else {
      const s = (Math.sqrt(3) * m.volts * m.amps) / 1000;
      p = s * m.pf;
      r = s * Math.sin(Math.acos(m.pf));
    }
    kW += q * p;
    kvar += q * r;
  }
  return kW + kvar + voltageV;
}

export interface EngineBench {
  studyMs: number;
  plainMs: number;
  loopMs: number;
  studyRatio: number;
}

/** size() with and without the harmonic study, and the arithmetic loop, in one process, one after another. */
export function benchEngine(): EngineBench {
  const studied = sizingRequestSchema.parse(twentyLoadBodyWithDrives());
  const plain = sizingRequestSchema.parse(twentyLoadBody());
  const check = size(studied);
  if (!check.ok || !check.result.harmonics) throw new Error("the bench body with drives must size and run its harmonic study");
  const studyMs = msPerCall(() => size(studied), 200);
  const plainMs = msPerCall(() => size(plain), 200);
  const loopMs = msPerCall(() => (sink += arithmeticLoop(studied, 480)), 20_000, 15, 20_000);
  return { studyMs, plainMs, loopMs, studyRatio: studyMs / loopMs };
}

export const engineSink = () => sink;
