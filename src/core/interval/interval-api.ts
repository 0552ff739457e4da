/** Interval-data analysis: streaming CSV parser, reactive-demand analysis, PF controller simulation, summary. */
export { analyseIntervals, intervalPF, loadPointsOf, type IntervalAnalysis } from "./analyse.js";
export {
  ckSettingA,
  CONTROLLER_RULE,
  createController,
  DEFAULT_LEADING_LIMIT_PF,
  DEFAULT_RESPONSE_THRESHOLD,
  MAX_STEPS,
  validateBank,
  type Controller,
  type ControllerOptions,
} from "./controller.js";
export {
  createIntervalParser,
  DEFAULT_MAX_BAD_ROW_FRACTION,
  DEFAULT_MAX_ROWS,
  type IntervalParser,
  type ParseFatal,
  type ParseOptions,
  type ParseOutcome,
  type ParseReport,
} from "./parser.js";
export { billingPF, monthlyDemand, monthRuns } from "./months.js";
export { durationCurve, nearestRank, percentiles, STANDARD_PERCENTILES, valuesAtRanks } from "./percentiles.js";
export { simulateController, type ControllerSimulation, type MonthlyCorrection } from "./simulate.js";
export { roughControllerEstimate, summarise, SUMMARY_VERSION, type IntervalSummary, type RoughControllerEstimate } from "./summary.js";
export type { CapacitorBank, DurationCurve, IntervalSeries, LoadPoints, MonthlyDemand, Percentiles, RowError } from "./series-types.js";
export { zoneFor, type Zone } from "./zone.js";
