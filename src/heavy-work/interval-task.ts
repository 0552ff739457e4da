/**
 * The analysis half of an interval upload (the parse streams on the event loop). Its two parts — the demand
 * statistics and the controller simulation — read the same series and nothing of each other, so they run as two
 * tasks on two worker threads at once; the route joins them into the answer (intervalAnswer is the same in one go).
 */
import { analyseIntervals, type IntervalAnalysis } from "../core/interval/analyse.js";
import type { ParseReport } from "../core/interval/parser.js";
import type { CapacitorBank, IntervalSeries } from "../core/interval/series-types.js";
import { simulateController, type ControllerSimulation } from "../core/interval/simulate.js";
import type { IntervalRequestOptions } from "../http/interval/options.js";
import { intervalResponse } from "../http/interval/response.js";
import type { HeavyWork } from "./pool.js";

export interface IntervalAnalysisTask {
  bytes: number;
  series: IntervalSeries;
  report: ParseReport;
  options: IntervalRequestOptions;
}

export type IntervalAnswer = ReturnType<typeof intervalResponse>;

export interface IntervalStatisticsTask {
  series: IntervalSeries;
  targetPF: number;
}

export interface IntervalSimulationTask {
  series: IntervalSeries;
  bank: CapacitorBank;
  targetPF: number;
  leadingLimitPF?: number;
}

export function intervalStatistics(t: IntervalStatisticsTask): IntervalAnalysis {
  return analyseIntervals(t.series, t.targetPF);
}

export function intervalSimulation(t: IntervalSimulationTask): ControllerSimulation {
  return simulateController(t.series, t.bank, t.targetPF, t.leadingLimitPF !== undefined ? { leadingLimitPF: t.leadingLimitPF } : {});
}

/** The simulation's task for the request's options, or null when no bank is given. */
export function simulationTaskOf(series: IntervalSeries, o: IntervalRequestOptions): IntervalSimulationTask | null {
  if (!o.bank) return null;
  return { series, bank: o.bank, targetPF: o.targetPF, ...(o.leadingLimitPF !== undefined ? { leadingLimitPF: o.leadingLimitPF } : {}) };
}

/** The whole answer on one thread (the reference the split tasks are tested against). */
export function intervalAnswer({ bytes, series, report, options: o }: IntervalAnalysisTask): IntervalAnswer {
  const simulation = simulationTaskOf(series, o);
  return intervalResponse(bytes, report, intervalStatistics({ series, targetPF: o.targetPF }), simulation && intervalSimulation(simulation), o);
}

/**
 * intervalAnswer with its two parts as two heavy tasks at once (on two threads when the pool has them). Settles
 * only once both have, so that the caller may reuse the series' arrays as soon as it does.
 */
export async function intervalAnswerOnThreads(
  heavy: HeavyWork,
  { bytes, series, report, options: o }: IntervalAnalysisTask,
): Promise<IntervalAnswer> {
  const simulation = simulationTaskOf(series, o);
  const [statistics, simulated] = await Promise.allSettled([
    heavy.run("intervalStatistics", { series, targetPF: o.targetPF }),
    simulation ? heavy.run("intervalSimulation", simulation) : null,
  ]);
  if (statistics.status === "rejected") throw statistics.reason;
  if (simulated.status === "rejected") throw simulated.reason;
  return intervalResponse(bytes, report, statistics.value, simulated.value, o);
}
