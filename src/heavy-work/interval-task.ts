/** The analysis half of an interval upload (the parse streams on the event loop; this runs on a worker thread). */
import { Piscina } from "piscina";
import { analyseIntervals } from "../core/interval/analyse.js";
import type { ParseReport } from "../core/interval/parser.js";
import type { IntervalSeries } from "../core/interval/series-types.js";
import { simulateController } from "../core/interval/simulate.js";
import type { IntervalRequestOptions } from "../http/interval/options.js";
import { intervalResponse } from "../http/interval/response.js";

export interface IntervalAnalysisTask {
  bytes: number;
  series: IntervalSeries;
  report: ParseReport;
  options: IntervalRequestOptions;
}

export type IntervalAnswer = ReturnType<typeof intervalResponse>;

/** The answer, and the series' column arrays handed back for the next upload's parse (see column-pool.ts). */
export interface IntervalResult {
  answer: IntervalAnswer;
  columns: Float64Array[];
}

export function intervalAnswer({ bytes, series, report, options: o }: IntervalAnalysisTask): IntervalAnswer {
  const analysis = analyseIntervals(series, o.targetPF);
  const opts = o.leadingLimitPF !== undefined ? { leadingLimitPF: o.leadingLimitPF } : {};
  const sim = o.bank ? simulateController(series, o.bank, o.targetPF, opts) : null;
  return intervalResponse(bytes, report, analysis, sim, o);
}

/** intervalAnswer, with the column arrays moved back (not copied) when it runs on a worker thread. */
export function intervalResult(task: IntervalAnalysisTask): IntervalResult {
  const s = task.series;
  const result: IntervalResult = { answer: intervalAnswer(task), columns: [s.timestampsMs, s.kW, s.kvar] };
  if (!Piscina.isWorkerThread) return result;
  const buffers = [...new Set(result.columns.map((c) => c.buffer))].filter((b): b is ArrayBuffer => b instanceof ArrayBuffer);
  return Piscina.move({ [Piscina.transferableSymbol]: buffers, [Piscina.valueSymbol]: result } as never) as unknown as IntervalResult;
}
