import type { IntervalAnalysis } from "../../core/interval/analyse.js";
import { ckSettingA } from "../../core/interval/controller.js";
import type { ParseReport } from "../../core/interval/parser.js";
import type { ControllerSimulation } from "../../core/interval/simulate.js";
import { summarise } from "../../core/interval/summary.js";
import { ENGINE_VERSION } from "../../core/pipeline/engine-version.js";
import type { IntervalRequestOptions } from "./options.js";

interface Warning {
  code: string;
  message: string;
}

function warningsOf(r: ParseReport, a: IntervalAnalysis, timeZoneGiven: boolean): Warning[] {
  const w: Warning[] = [];
  const steps = r.steps;
  if (r.badRows.count > 0) w.push({ code: "bad_rows_skipped", message: `${r.badRows.count} bad rows were left out (see quality.badRows)` });
  if (r.duplicates.count > 0)
    w.push({
      code: "duplicate_timestamps",
      message: `${r.duplicates.count} rows repeat an earlier timestamp; the first row of each timestamp was kept`,
    });
  if (r.outOfOrder.count > 0)
    w.push({ code: "out_of_order", message: `${r.outOfOrder.count} rows are earlier than the row before them; the series was sorted by time` });
  if (steps && steps.gaps.count > 0)
    w.push({
      code: "gaps",
      message: `${steps.gaps.missingIntervals} intervals are missing in ${steps.gaps.count} gaps; figures cover the intervals present`,
    });
  if (steps && steps.irregularSteps.count > 0)
    w.push({
      code: "irregular_steps",
      message: `${steps.irregularSteps.count} steps between rows are not a whole number of ${a.intervalMinutes}-minute intervals`,
    });
  if (!timeZoneGiven) w.push({ code: "time_zone_assumed", message: `no timeZone given: months are counted in ${a.timeZone}` });
  if (r.interval && r.interval.source === "given" && Math.abs(r.interval.minutes - r.interval.detectedMinutes) > 1e-9) {
    w.push({
      code: "interval_override",
      message: `intervalMinutes ${r.interval.minutes} given; the median step is ${r.interval.detectedMinutes} min`,
    });
  }
  return w;
}

/** C/k of the smallest step, when the CT ratio and voltage are given and a bank has steps. */
function controllerSetting(o: IntervalRequestOptions): { ctRatio: number; voltageV: number; smallestStepKvar: number; ckA: number } | null {
  if (o.ctRatio === undefined || o.voltageV === undefined || !o.bank || o.bank.stepsKvar.length === 0) return null;
  const smallest = Math.min(...o.bank.stepsKvar);
  return { ctRatio: o.ctRatio, voltageV: o.voltageV, smallestStepKvar: smallest, ckA: ckSettingA(smallest, o.voltageV, o.ctRatio) };
}

/** The JSON answer of POST /v1/interval-analyses. */
export function intervalResponse(bytes: number, r: ParseReport, a: IntervalAnalysis, sim: ControllerSimulation | null, o: IntervalRequestOptions) {
  return {
    engineVersion: ENGINE_VERSION,
    input: {
      bytes,
      lines: r.lines,
      dataRows: r.dataRows,
      acceptedRows: r.acceptedRows,
      blankLines: r.blankLines,
      preambleLines: r.preambleLines,
      delimiter: r.delimiter,
      header: r.header,
      columns: r.columns,
      method: r.method,
      timeZone: r.timeZone,
      notes: r.notes,
    },
    quality: {
      badRows: r.badRows,
      duplicates: r.duplicates,
      outOfOrder: r.outOfOrder,
      gaps: r.steps?.gaps ?? null,
      irregularSteps: r.steps?.irregularSteps ?? null,
    },
    interval: {
      ...r.interval,
      count: a.intervalCount,
      firstTimestamp: a.firstTimestamp,
      lastTimestamp: a.lastTimestamp,
      coveredDays: a.coveredDays,
    },
    targetPF: a.targetPF,
    reactiveDemand: {
      percentilesKvar: a.kvar.percentiles,
      meanKvar: a.kvar.mean,
      minimum: a.minimumReactiveDemand,
      durationCurve: a.kvar.durationCurve,
    },
    neededKvar: a.neededKvar,
    kW: a.kW,
    pf: a.pf,
    monthly: a.monthly,
    total: a.total,
    simulation: sim ? { ...sim, controllerSetting: controllerSetting(o) } : null,
    summary: summarise(a),
    warnings: warningsOf(r, a, o.parse.timeZone !== undefined),
  };
}
