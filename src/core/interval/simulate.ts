import { tanPhi } from "../conventions.js";
import { assertSeries, BLOCK, intervalPF } from "./analyse.js";
import { CONTROLLER_RULE, createController, DEFAULT_LEADING_LIMIT_PF, type Controller, type ControllerOptions } from "./controller.js";
import { billingPF, MonthTally, monthlyDemand, monthlyDemandOf, monthRuns, zoneOfSeries } from "./months.js";
import { labelled, percentileRanks, RankHistogram, STANDARD_PERCENTILES } from "./percentiles.js";
import type { CapacitorBank, IntervalSeries, Percentiles } from "./series-types.js";

export interface MonthlyCorrection {
  month: string;
  kWh: number;
  kvarhNetBefore: number;
  kvarhNetAfter: number;
  kvarhLaggingAfter: number;
  kvarhLeadingAfter: number;
  billingPFBefore: number;
  billingPFAfter: number;
  billingPFLaggingOnlyBefore: number;
  billingPFLaggingOnlyAfter: number;
  peakKVABefore: number;
  peakKVAAfter: number;
  /** PF of the interval with the peak kW, after correction. */
  pfAtPeakKWAfter: number;
}

export interface ControllerSimulation {
  bank: CapacitorBank;
  targetPF: number;
  leadingLimitPF: number;
  /** Response threshold, kvar (a share of the smallest step). */
  responseThresholdKvar: number;
  rule: string;
  intervals: number;
  /** PF magnitude P/S after correction, whatever its sense (leading intervals are counted separately). */
  pfAfter: { percentiles: Percentiles };
  /** Signed kvar after correction (< 0 leading). */
  kvarAfter: { percentiles: Percentiles };
  intervalsBelowTarget: { before: number; after: number };
  intervalsLeading: { before: number; after: number; afterBeyondLimit: number };
  switching: {
    days: number;
    totalOperations: number;
    operationsPerDay: number;
    perStep: { step: number; kvar: number; operations: number; operationsPerDay: number; onPct: number }[];
  };
  monthly: MonthlyCorrection[];
  total: { billingPFBefore: number; billingPFAfter: number };
}

/** The running state and counts of a simulation, carried from month to month. */
class Run {
  mask = 0;
  qMin = Infinity;
  qMax = -Infinity;
  pfMin = Infinity;
  pfMax = -Infinity;
  belowBefore = 0;
  belowAfter = 0;
  leadBefore = 0;
  leadAfter = 0;
  beyond = 0;
  constructor(
    readonly controller: Controller,
    readonly masks: Uint16Array,
    readonly ops: Float64Array,
    readonly onCount: Float64Array,
    readonly tanTarget: number,
    readonly tanLead: number,
  ) {}
}

/**
 * The controller over one month's intervals (the hot loops live in small functions called many times: compiled
 * once and reused, rather than compiled on the fly inside one long function).
 */
function simulateMonth(r: Run, tally: MonthTally, kW: Float64Array, kvar: Float64Array, start: number, end: number): void {
  const { controller, masks, ops, onCount, tanTarget, tanLead } = r;
  let { mask, qMin, qMax, pfMin, pfMax, belowBefore, belowAfter, leadBefore, leadAfter, beyond } = r;
  for (let i = start; i < end; i++) {
    const p = kW[i] as number,
      q = kvar[i] as number;
    const next = controller.decide(p, q, mask);
    if (next !== mask) {
      for (let changed = next ^ mask, s = 0; changed; s++, changed >>>= 1) if (changed & 1) ops[s]!++;
      mask = next;
    }
    masks[i] = mask;
    for (let m = mask, s = 0; m; s++, m >>>= 1) if (m & 1) onCount[s]!++;
    const qa = q - controller.fixedKvar - controller.switchedKvar(mask);
    const f = intervalPF(p, qa);
    if (qa < qMin) qMin = qa;
    if (qa > qMax) qMax = qa;
    if (f < pfMin) pfMin = f;
    if (f > pfMax) pfMax = f;
    // below target: lagging beyond P·tan(acos target); leading beyond the limit: more than P·tan(acos limit)
    if (q > p * tanTarget + 1e-9) belowBefore++;
    if (qa > p * tanTarget + 1e-9) belowAfter++;
    if (q < -1e-9) leadBefore++;
    if (qa < -1e-9) leadAfter++;
    if (qa < -p * tanLead - 1e-9) beyond++;
    tally.add(i, p, qa);
  }
  Object.assign(r, { mask, qMin, qMax, pfMin, pfMax, belowBefore, belowAfter, leadBefore, leadAfter, beyond });
}

/** One RankHistogram pass over the corrected kvar (pf false) or PF (pf true), recomputed from the kept combinations. */
function feedCorrected(
  h: RankHistogram,
  gather: boolean,
  pf: boolean,
  r: Run,
  kW: Float64Array,
  kvar: Float64Array,
  n: number,
  block: Float64Array,
): void {
  for (let from = 0; from < n; from += BLOCK) {
    const length = Math.min(BLOCK, n - from);
    correctedBlock(block, pf, r, kW, kvar, from, length); // a function of its own: see feed() in analyse.ts
    if (gather) h.gatherSome(block, length);
    else h.countSome(block, length);
  }
}

/** block[j] = the corrected kvar (or PF) of interval from + j. */
function correctedBlock(block: Float64Array, pf: boolean, r: Run, kW: Float64Array, kvar: Float64Array, from: number, length: number): void {
  const { controller, masks } = r;
  for (let j = 0; j < length; j++) {
    const i = from + j;
    const qa = (kvar[i] as number) - controller.fixedKvar - controller.switchedKvar(masks[i] as number);
    block[j] = pf ? intervalPF(kW[i] as number, qa) : qa;
  }
}

/**
 * Simulate an automatic bank on every interval of a sorted series (see CONTROLLER_RULE). The bank starts with
 * all steps off; each change of a step's state is one switching operation. The step combination of each interval
 * is kept (two bytes an interval); the corrected kvar and PF are recomputed from it for their percentiles.
 */
export function simulateController(
  series: IntervalSeries,
  bank: CapacitorBank,
  targetPF: number,
  opts: ControllerOptions = {},
): ControllerSimulation {
  assertSeries(series);
  if (!(targetPF > 0 && targetPF <= 1)) throw new RangeError("targetPF must be in (0, 1]");
  const leadingLimitPF = opts.leadingLimitPF ?? DEFAULT_LEADING_LIMIT_PF;
  const controller = createController(bank, targetPF, { ...opts, leadingLimitPF });
  const n = series.length;
  const { kW, kvar } = series;
  const nSteps = bank.stepsKvar.length;
  const ops = new Float64Array(nSteps);
  const onCount = new Float64Array(nSteps);
  const r = new Run(controller, new Uint16Array(n) /* MAX_STEPS = 16 */, ops, onCount, tanPhi(targetPF), tanPhi(leadingLimitPF));
  const zone = zoneOfSeries(series);
  const runs = monthRuns(series, zone);
  const tallies = runs.map((run) => new MonthTally(run.start));
  runs.forEach((run, k) => simulateMonth(r, tallies[k]!, kW, kvar, run.start, run.end));
  const { belowBefore, belowAfter, leadBefore, leadAfter, beyond } = r;
  const std = percentileRanks(n);
  const kvarAt = new RankHistogram(n, std, { min: r.qMin, max: r.qMax });
  const pfAt = new RankHistogram(n, std, { min: r.pfMin, max: r.pfMax });
  const block = new Float64Array(BLOCK);
  feedCorrected(kvarAt, false, false, r, kW, kvar, n, block);
  feedCorrected(pfAt, false, true, r, kW, kvar, n, block);
  kvarAt.startGathering();
  pfAt.startGathering();
  feedCorrected(kvarAt, true, false, r, kW, kvar, n, block);
  feedCorrected(pfAt, true, true, r, kW, kvar, n, block);
  const before = monthlyDemand(series, kvar, runs, zone);
  const corrected = monthlyDemandOf(series, null, runs, zone, tallies);
  const monthly = before.map((b, k): MonthlyCorrection => {
    const a = corrected[k]!;
    return {
      month: b.month,
      kWh: b.kWh,
      kvarhNetBefore: b.kvarhLagging - b.kvarhLeading,
      kvarhNetAfter: a.kvarhLagging - a.kvarhLeading,
      kvarhLaggingAfter: a.kvarhLagging,
      kvarhLeadingAfter: a.kvarhLeading,
      billingPFBefore: b.billingPF,
      billingPFAfter: a.billingPF,
      billingPFLaggingOnlyBefore: b.billingPFLaggingOnly,
      billingPFLaggingOnlyAfter: a.billingPFLaggingOnly,
      peakKVABefore: b.peakKVA,
      peakKVAAfter: a.peakKVA,
      pfAtPeakKWAfter: intervalPF(a.peakKW, a.peakKWKvar),
    };
  });
  const kWh = monthly.reduce((s, m) => s + m.kWh, 0);
  const days = (n * series.intervalMinutes) / 1440;
  const totalOps = ops.reduce((s, v) => s + v, 0);
  return {
    bank: { fixedKvar: bank.fixedKvar, stepsKvar: [...bank.stepsKvar] },
    targetPF,
    leadingLimitPF,
    responseThresholdKvar: controller.thresholdKvar,
    rule: CONTROLLER_RULE,
    intervals: n,
    pfAfter: { percentiles: labelled(STANDARD_PERCENTILES, pfAt.finish()) },
    kvarAfter: { percentiles: labelled(STANDARD_PERCENTILES, kvarAt.finish()) },
    intervalsBelowTarget: { before: belowBefore, after: belowAfter },
    intervalsLeading: { before: leadBefore, after: leadAfter, afterBeyondLimit: beyond },
    switching: {
      days,
      totalOperations: totalOps,
      operationsPerDay: totalOps / days,
      perStep: bank.stepsKvar.map((kvar, s) => ({
        step: s + 1,
        kvar,
        operations: ops[s] as number,
        operationsPerDay: (ops[s] as number) / days,
        onPct: ((onCount[s] as number) / n) * 100,
      })),
    },
    monthly,
    total: {
      billingPFBefore: billingPF(
        kWh,
        monthly.reduce((s, m) => s + m.kvarhNetBefore, 0),
      ),
      billingPFAfter: billingPF(
        kWh,
        monthly.reduce((s, m) => s + m.kvarhNetAfter, 0),
      ),
    },
  };
}
