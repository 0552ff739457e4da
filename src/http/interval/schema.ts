import { z } from "zod";

/** Response schema of POST /v1/interval-analyses: documentation only (the answer is built in code). */
const percentiles = z.record(z.string(), z.number()).describe("nearest-rank percentiles keyed P0, P1, P5, …, P100");
const curve = z.object({ exceedancePct: z.array(z.number()), kvar: z.array(z.number()) });
const month = z.object({
  month: z.string(),
  intervals: z.number(),
  peakKW: z.number(),
  peakKWAt: z.string(),
  peakKWKvar: z.number().describe("kvar of the interval with the peak kW"),
  peakKVA: z.number(),
  peakKVAAt: z.string(),
  kWh: z.number(),
  kvarhLagging: z.number(),
  kvarhLeading: z.number(),
  billingPF: z.number(),
  billingPFLaggingOnly: z.number(),
});
const rowError = z.object({ line: z.number(), column: z.string(), reason: z.string(), value: z.string().optional() });

export const intervalResultSchema = z.object({
  engineVersion: z.string(),
  input: z.object({
    bytes: z.number(),
    lines: z.number(),
    dataRows: z.number(),
    acceptedRows: z.number(),
    blankLines: z.number(),
    preambleLines: z.number(),
    delimiter: z.string(),
    header: z.array(z.string()),
    columns: z.record(z.string(), z.string()),
    method: z.enum(["kW_kvar", "kW_pf", "kW_kVA"]),
    timeZone: z.string(),
    notes: z.array(z.string()),
  }),
  quality: z.object({
    badRows: z.object({
      count: z.number(),
      fraction: z.number(),
      limitFraction: z.number(),
      byReason: z.record(z.string(), z.number()),
      first: z.array(rowError),
    }),
    duplicates: z.object({
      count: z.number(),
      first: z.array(z.object({ line: z.number(), firstLine: z.number(), timestamp: z.string(), sameValues: z.boolean() })),
    }),
    outOfOrder: z.object({ count: z.number(), first: z.array(z.object({ line: z.number(), timestamp: z.string(), previousTimestamp: z.string() })) }),
    gaps: z.object({
      count: z.number(),
      missingIntervals: z.number(),
      first: z.array(z.object({ line: z.number(), from: z.string(), to: z.string(), missingIntervals: z.number() })),
    }),
    irregularSteps: z.object({
      count: z.number(),
      first: z.array(z.object({ line: z.number(), from: z.string(), to: z.string(), minutes: z.number() })),
    }),
  }),
  interval: z.object({
    minutes: z.number(),
    detectedMinutes: z.number(),
    source: z.enum(["detected", "given"]),
    count: z.number(),
    firstTimestamp: z.string(),
    lastTimestamp: z.string(),
    coveredDays: z.number(),
  }),
  targetPF: z.number(),
  reactiveDemand: z.object({
    percentilesKvar: percentiles,
    meanKvar: z.number(),
    minimum: z.object({ minKvar: z.number(), p1Kvar: z.number(), p5Kvar: z.number() }).describe("the fixed-part limit"),
    durationCurve: curve,
  }),
  neededKvar: z.object({ percentiles, hold95PctKvar: z.number(), hold99PctKvar: z.number(), hold100PctKvar: z.number() }),
  kW: z.object({ percentiles, max: z.number(), mean: z.number() }),
  pf: z.object({ percentiles, intervalsBelowTarget: z.number(), intervalsLeading: z.number() }),
  monthly: z.array(month),
  total: z.object({ kWh: z.number(), kvarhLagging: z.number(), kvarhLeading: z.number(), billingPF: z.number() }),
  simulation: z.record(z.string(), z.unknown()).nullable().describe("the simulated controller when fixedKvar or bankSteps is given"),
  summary: z.record(z.string(), z.unknown()).describe("IntervalSummary: the figures without the series, for storing with a building"),
  warnings: z.array(z.object({ code: z.string(), message: z.string() })),
});

/** Responses of the analyses stored with a building (documentation; the answers are built in src/http/views.ts). */
const summaryDoc = intervalResultSchema.shape.summary;

export const intervalAnalysisCreatedSchema = z.object({
  id: z.string(),
  buildingId: z.string(),
  createdAt: z.string(),
  ...intervalResultSchema.shape,
});

export const storedIntervalAnalysisSchema = z.object({
  id: z.string(),
  buildingId: z.string(),
  createdAt: z.string(),
  actor: z.string(),
  targetPF: z.number(),
  intervalCount: z.number().int(),
  intervalMinutes: z.number(),
  firstTimestamp: z.string(),
  lastTimestamp: z.string(),
  summary: summaryDoc,
});

export const intervalAnalysisPageSchema = z.object({
  buildingId: z.string(),
  items: z.array(
    z.object({
      id: z.string(),
      createdAt: z.string(),
      targetPF: z.number(),
      intervalCount: z.number().int(),
      intervalMinutes: z.number(),
      firstTimestamp: z.string(),
      lastTimestamp: z.string(),
      hold99PctKvar: z.number().describe("kvar that holds the target PF in 99 % of intervals"),
      minKvar: z.number().describe("minimum reactive demand: the fixed-part limit"),
    }),
  ),
  nextCursor: z.string().nullable().describe("pass as ?cursor= for the next page; null on the last page"),
});
