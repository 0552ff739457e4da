/** The analysis half of an interval upload (the parse streams on the event loop; this runs on a worker thread). */
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

export function intervalAnswer({ bytes, series, report, options: o }: IntervalAnalysisTask): IntervalAnswer {
  const analysis = analyseIntervals(series, o.targetPF);
  const opts = o.leadingLimitPF !== undefined ? { leadingLimitPF: o.leadingLimitPF } : {};
  const sim = o.bank ? simulateController(series, o.bank, o.targetPF, opts) : null;
  return intervalResponse(bytes, report, analysis, sim, o);
}
