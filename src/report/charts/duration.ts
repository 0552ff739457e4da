/**
 * The kvar needed to reach the target PF as a duration curve (kvar reached or exceeded in a share of the time), with
 * the bank's cumulative levels and the share of time the full bank covers the need; the reactive demand itself is
 * drawn lighter, for context.
 */
import { fmt } from "../format.js";
import { GRID, INK, line, linearScale, niceTicks, text, type Chart, type Point, type Shape } from "./geometry.js";

export interface StepLevel {
  label: string;
  kvar: number;
}

export interface DurationChartInput {
  /** The need to reach the target PF: the curve the bank's levels are read against. */
  need: { exceedancePct: readonly number[]; kvar: readonly number[] };
  /** The reactive demand (before correction), drawn lighter. */
  demand?: { exceedancePct: readonly number[]; kvar: readonly number[] };
  levels: readonly StepLevel[];
  targetPF: number;
  /** Share of intervals, percent, whose need the whole bank covers (marked on the chart). */
  coveredPct?: number;
}

const W = 760;
const H = 380;
const PLOT = { left: 70, top: 40, right: 570, bottom: 300 };
const LEVEL = "#0b3d91";
const LIGHT = "#9a9a9a";
const COVER = "#8b0000";

export function durationCurveChart(input: DurationChartInput): Chart {
  const values = [...input.need.kvar, ...(input.demand?.kvar ?? []), ...input.levels.map((l) => l.kvar), 0];
  const lo = Math.min(...values);
  const hi = Math.max(...values);
  const ticks = niceTicks(lo, hi === lo ? lo + 1 : hi, 6);
  const y0 = Math.min(lo, ticks[0] as number);
  const y1 = Math.max(hi, ticks[ticks.length - 1] as number);
  const x = linearScale(0, 100, PLOT.left, PLOT.right);
  const y = linearScale(y0, y1, PLOT.bottom, PLOT.top);
  const shapes: Shape[] = [
    {
      kind: "rect",
      x: PLOT.left,
      y: PLOT.top,
      w: PLOT.right - PLOT.left,
      h: PLOT.bottom - PLOT.top,
      stroke: { color: INK, width: 1 },
      role: "plot-area",
      data: { x0: String(PLOT.left), x1: String(PLOT.right), y0: String(PLOT.bottom), y1: String(PLOT.top), k0: String(y0), k1: String(y1) },
    },
  ];
  shapes.push(
    text(PLOT.left, 20, `kvar needed to reach PF ${fmt.pf(input.targetPF)}, against the bank's cumulative levels`, 13, "start", { bold: true }),
  );
  for (const t of ticks) {
    shapes.push(line(PLOT.left, y(t), PLOT.right, y(t), { color: GRID, width: 0.8 }));
    shapes.push(text(PLOT.left - 6, y(t) + 4, fmt.num(t, 0), 10, "end"));
  }
  for (const p of [0, 10, 20, 30, 40, 50, 60, 70, 80, 90, 100]) {
    shapes.push(line(x(p), PLOT.bottom, x(p), PLOT.bottom + 5, { color: INK, width: 1 }));
    shapes.push(text(x(p), PLOT.bottom + 18, String(p), 10, "middle"));
  }
  shapes.push(text((PLOT.left + PLOT.right) / 2, PLOT.bottom + 40, "share of time the kvar is at least this, %", 11, "middle"));
  shapes.push(text(18, (PLOT.top + PLOT.bottom) / 2, "kvar", 11, "middle", { rotate: -90 }));
  if (y0 < 0) shapes.push(line(PLOT.left, y(0), PLOT.right, y(0), { color: INK, width: 1 }));
  if (input.demand && input.demand.kvar.length > 1) {
    const d = input.demand;
    const pts: Point[] = d.exceedancePct.map((e, i) => [x(e), y(d.kvar[i] as number)]);
    shapes.push({ kind: "polyline", points: pts, stroke: { color: LIGHT, width: 1.4 }, role: "demand-curve", data: { points: String(pts.length) } });
  }
  const needPts: Point[] = input.need.exceedancePct.map((e, i) => [x(e), y(input.need.kvar[i] as number)]);
  shapes.push({
    kind: "polyline",
    points: needPts,
    stroke: { color: INK, width: 2.4 },
    role: "need-curve",
    data: { points: String(needPts.length) },
  });
  // Labels at the right, pushed apart so close levels stay readable.
  let lastLabelY = -Infinity;
  [...input.levels]
    .sort((a, b) => b.kvar - a.kvar)
    .forEach((l) => {
      shapes.push(
        line(
          PLOT.left,
          y(l.kvar),
          PLOT.right,
          y(l.kvar),
          { color: LEVEL, width: 1.2, dash: [6, 3] },
          { role: "step-level", data: { kvar: String(l.kvar) } },
        ),
      );
      const ly = Math.max(y(l.kvar) + 4, lastLabelY + 11);
      lastLabelY = ly;
      shapes.push(text(PLOT.right + 6, ly, `${l.label}: ${fmt.power(l.kvar)} kvar`, 9.5, "start", { color: LEVEL }));
    });
  if (input.coveredPct !== undefined && input.levels.length > 0) {
    // the need exceeds the full bank in (100 − covered) % of the time: the mark stands at that exceedance
    const at = 100 - input.coveredPct;
    shapes.push(
      line(
        x(at),
        PLOT.top,
        x(at),
        PLOT.bottom,
        { color: COVER, width: 1.2, dash: [2, 3] },
        { role: "coverage", data: { coveredPct: String(input.coveredPct) } },
      ),
    );
    const label = `bank covers the need ${fmt.num(input.coveredPct, 1)} % of the time`;
    shapes.push(
      text(Math.min(x(at) + 6, PLOT.right - 4), PLOT.top + 14, label, 10, x(at) + 6 > PLOT.right - 200 ? "end" : "start", { color: COVER }),
    );
  }
  shapes.push(line(PLOT.left, PLOT.bottom + 56, PLOT.left + 24, PLOT.bottom + 56, { color: INK, width: 2.4 }));
  shapes.push(text(PLOT.left + 30, PLOT.bottom + 60, "kvar needed to reach the target", 10, "start"));
  if (input.demand) {
    shapes.push(line(PLOT.left + 230, PLOT.bottom + 56, PLOT.left + 254, PLOT.bottom + 56, { color: LIGHT, width: 1.4 }));
    shapes.push(text(PLOT.left + 260, PLOT.bottom + 60, "reactive demand (before correction)", 10, "start"));
  }
  const maxNeed = Math.max(...input.need.kvar);
  return {
    id: "duration-curve",
    title: "kvar needed to reach the target, with the bank's step levels",
    description: `kvar needed to reach PF ${fmt.pf(input.targetPF)} against the share of intervals, from ${fmt.power(maxNeed)} kvar in the worst interval; dashed lines are the bank's cumulative levels${input.coveredPct !== undefined ? `; the full bank covers the need in ${fmt.num(input.coveredPct, 1)} % of the intervals` : ""}.`,
    width: W,
    height: H,
    shapes,
  };
}
