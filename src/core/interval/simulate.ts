import { tanPhi } from "../conventions.js";
import { assertSeries, intervalPF, widen } from "./analyse.js";
import { CONTROLLER_RULE, createController, DEFAULT_LEADING_LIMIT_PF, type ControllerOptions } from "./controller.js";
import { billingPF, monthlyDemand, monthRuns, zoneOfSeries } from "./months.js";
import { percentiles } from "./percentiles.js";
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
 * all steps off; each change of a step's state is one switching operation.
 */
export function simulateController(series: IntervalSeries, bank: CapacitorBank, targetPF: number, opts: ControllerOptions = {}): ControllerSimulation {
  assertSeries(series);
  if (!(targetPF > 0 && targetPF <= 1)) throw new RangeError("targetPF must be in (0, 1]");
  const leadingLimitPF = opts.leadingLimitPF ?? DEFAULT_LEADING_LIMIT_PF;
  const controller = createController(bank, targetPF, { ...opts, leadingLimitPF });
  const n = series.length;
  const nSteps = bank.stepsKvar.length;
  const after = new Float64Array(n);
  const pfAfter = new Float64Array(n);
  const ops = new Float64Array(nSteps);
  const onCount = new Float64Array(nSteps);
  const tanTarget = tanPhi(targetPF);
  const tanLead = tanPhi(leadingLimitPF);
  let mask = 0;
  const qRange = { min: Infinity, max: -Infinity }, pfRange = { min: Infinity, max: -Infinity };
  let belowBefore = 0, belowAfter = 0, leadBefore = 0, leadAfter = 0, beyond = 0;
  for (let i = 0; i < n; i++) {
    const p = series.kW[i] as number, q = series.kvar[i] as number;
    const next = controller.decide(p, q, mask);
    if (next !== mask) {
      for (let changed = next ^ mask, s = 0; changed; s++, changed >>>= 1) if (changed & 1) ops[s]!++;
      mask = next;
    }
    for (let m = mask, s = 0; m; s++, m >>>= 1) if (m & 1) onCount[s]!++;
    const qa = q - controller.fixedKvar - controller.switchedKvar(mask);
    after[i] = qa;
    const f = intervalPF(p, qa);
    pfAfter[i] = f;
    widen(qRange, qa);
    widen(pfRange, f);
    // below target: lagging beyond P·tan(acos target); leading beyond the limit: more than P·tan(acos limit)
    if (q > p * tanTarget + 1e-9) belowBefore++;
    if (qa > p * tanTarget + 1e-9) belowAfter++;
    if (q < -1e-9) leadBefore++;
    if (qa < -1e-9) leadAfter++;
    if (qa < -p * tanLead - 1e-9) beyond++;
  }
  const zone = zoneOfSeries(series);
  const runs = monthRuns(series, zone);
  const before = monthlyDemand(series, series.kvar, runs, zone);
  const corrected = monthlyDemand(series, after, runs, zone);
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
    pfAfter: { percentiles: percentiles(pfAfter, n, undefined, pfRange) },
    kvarAfter: { percentiles: percentiles(after, n, undefined, qRange) },
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
