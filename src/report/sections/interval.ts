/** Interval data: the reactive demand over time and the bank's levels against its duration curve. */
import { durationCurveChart, type StepLevel } from "../charts/index.js";
import { coveredSharePct, neededKvarCurve } from "../../core/interval/need-curve.js";
import { dateTime, fmt } from "../format.js";
import { designViewOf } from "./design.js";
import type { Block, ReportInput, Section } from "../types.js";

/** The bank's cumulative levels: the design's fixed part then each switched step, else the recommended stages. */
export function stepLevels(input: ReportInput): StepLevel[] {
  const d = designViewOf(input.result, input.design);
  if (d && d.steps.length > 0) {
    const out: StepLevel[] = [];
    let sum = 0;
    let switched = 0;
    for (const s of d.steps) {
      sum += s.effectiveKvar;
      if (s.role === "fixed") out.push({ label: "fixed", kvar: sum });
      else {
        switched++;
        const steps = switched === 1 ? "step 1" : `steps 1-${switched}`;
        out.push({ label: d.fixedKvar > 0 ? `fixed + ${steps}` : steps, kvar: sum });
      }
    }
    return out;
  }
  const b = input.result.recommendedBank ?? input.result.proposedBank;
  return b ? b.stages.map((s) => ({ label: `stage ${s.stage}`, kvar: s.cumulativeKvar })) : [];
}

export function intervalSection(input: ReportInput): Section {
  const s = input.interval;
  if (!s) {
    return {
      id: "interval",
      heading: "Reactive demand over time",
      blocks: [{ kind: "paragraph", text: "No interval data was analysed for this report: the bank is sized from the survey readings alone." }],
    };
  }
  const p = (o: Record<string, number>, k: string) => fmt.power(o[k]);
  const blocks: Block[] = [
    {
      kind: "keyValues",
      items: [
        {
          key: "Period",
          value: `${dateTime(s.firstTimestamp)} to ${dateTime(s.lastTimestamp)} (${fmt.num(s.coveredDays, 1)} days, ${s.intervalCount} intervals of ${s.intervalMinutes} min, ${s.timeZone})`,
        },
        { key: "Peak kW / mean kW", value: `${fmt.power(s.kW.max)} / ${fmt.power(s.kW.mean)} kW` },
        {
          key: "Reactive demand P5 / P50 / P95",
          value: `${p(s.kvar.percentiles, "P5")} / ${p(s.kvar.percentiles, "P50")} / ${p(s.kvar.percentiles, "P95")} kvar`,
        },
        {
          key: "Minimum reactive demand (fixed-part limit)",
          value: `${fmt.power(s.minimumReactiveDemand.minKvar)} kvar (P1 ${fmt.power(s.minimumReactiveDemand.p1Kvar)})`,
        },
        {
          key: "kvar to hold the target 95 % / 99 % / 100 % of the time",
          value: `${fmt.power(s.neededKvar.hold95PctKvar)} / ${fmt.power(s.neededKvar.hold99PctKvar)} / ${fmt.power(s.neededKvar.hold100PctKvar)} kvar`,
        },
        { key: "Intervals below the target PF / leading", value: `${s.pf.intervalsBelowTarget} / ${s.pf.intervalsLeading}` },
        { key: "Billing PF over the period", value: fmt.pf(s.total.billingPF) },
      ],
    },
  ];
  if (s.monthly.length > 0) {
    blocks.push({
      kind: "table",
      title: "Monthly demand",
      header: ["Month", "Peak kW", "Peak kVA", "kWh", "kvarh lagging", "Billing PF"],
      align: ["left", "right", "right", "right", "right", "right"],
      rows: s.monthly.map((m) => [
        m.month,
        fmt.power(m.peakKW),
        fmt.power(m.peakKVA),
        fmt.num(m.kWh, 0),
        fmt.num(m.kvarhLagging, 0),
        fmt.pf(m.billingPF),
      ]),
    });
  }
  if (s.durationCurve.kvar.length > 1 && s.loadPoints.count.length > 0) {
    const targetPF = input.result.correction.targetPF;
    const need = neededKvarCurve(s.loadPoints, targetPF);
    const levels = stepLevels(input);
    const top = levels.reduce((m, l) => Math.max(m, l.kvar), 0);
    blocks.push({
      kind: "chart",
      chart: durationCurveChart({
        need: { exceedancePct: need.exceedancePct, kvar: need.neededKvar },
        demand: { exceedancePct: s.durationCurve.exceedancePct, kvar: s.durationCurve.kvar },
        levels,
        targetPF,
        ...(levels.length > 0 ? { coveredPct: coveredSharePct(s.loadPoints, targetPF, top) } : {}),
      }),
    });
  }
  return { id: "interval", heading: "Reactive demand over time", blocks };
}
