import { tanPhi } from "../conventions.js";
import { assertSeries, intervalPF } from "./analyse.js";
import { CONTROLLER_RULE, createController, DEFAULT_LEADING_LIMIT_PF, type ControllerOptions } from "./controller.js";
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

/**
 * Simulate an automatic bank on every interval of a sorted series (see CONTROLLER_RULE). The bank starts with
 * all steps off; each change of a step's state is one switching operation. The step combination of each interval
 * is kept (two bytes an interval); the corrected kvar and PF are recomputed from it for their percentiles.
 */
export function simulateController(series: IntervalSeries, bank: CapacitorBank, targetPF: number, opts: ControllerOptions = {}): ControllerSimulation {
  assertSeries(series);
  if (!(targetPF > 0 && targetPF <= 1)) throw new RangeError("targetPF must be in (0, 1]");
  const leadingLimitPF = opts.leadingLimitPF ?? DEFAULT_LEADING_LIMIT_PF;
  const controller = createController(bank, targetPF, { ...opts, leadingLimitPF });
  const n = series.length;
  const { kW, kvar } = series;
  const nSteps = bank.stepsKvar.length;
  const masks = new Uint16Array(n); // MAX_STEPS = 16
  const ops = new Float64Array(nSteps);
  const onCount = new Float64Array(nSteps);
  const tanTarget = tanPhi(targetPF);
  const tanLead = tanPhi(leadingLimitPF);
  const zone = zoneOfSeries(series);
  const runs = monthRuns(series, zone);
  const tallies = runs.map((run) => new MonthTally(run.start));
  let mask = 0;
  let qMin = Infinity, qMax = -Infinity, pfMin = Infinity, pfMax = -Infinity;
  let belowBefore = 0, belowAfter = 0, leadBefore = 0, leadAfter = 0, beyond = 0;
  for (let k = 0; k < runs.length; k++) {
    const { start, end } = runs[k]!;
    const tally = tallies[k]!;
    for (let i = start; i < end; i++) {
      const p = kW[i] as number, q = kvar[i] as number;
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
  }
  const std = percentileRanks(n);
  const kvarAt = new RankHistogram(n, std, { min: qMin, max: qMax });
  const pfAt = new RankHistogram(n, std, { min: pfMin, max: pfMax });
  for (let i = 0; i < n; i++) {
    const p = kW[i] as number;
    const qa = (kvar[i] as number) - controller.fixedKvar - controller.switchedKvar(masks[i] as number);
    kvarAt.count(qa);
    pfAt.count(intervalPF(p, qa));
  }
  kvarAt.startGathering();
  pfAt.startGathering();
  for (let i = 0; i < n; i++) {
    const p = kW[i] as number;
    const qa = (kvar[i] as number) - controller.fixedKvar - controller.switchedKvar(masks[i] as number);
    kvarAt.gather(qa);
    pfAt.gather(intervalPF(p, qa));
  }
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
      billingPFBefore: billingPF(kWh, monthly.reduce((s, m) => s + m.kvarhNetBefore, 0)),
      billingPFAfter: billingPF(kWh, monthly.reduce((s, m) => s + m.kvarhNetAfter, 0)),
    },
  };
}
