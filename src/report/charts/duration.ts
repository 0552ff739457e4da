/** Reactive-demand duration curve (kvar reached or exceeded in a share of the time) with the bank's cumulative levels. */
import { fmt } from "../format.js";
import { GRID, INK, line, linearScale, niceTicks, text, type Chart, type Point, type Shape } from "./geometry.js";

export interface StepLevel {
  label: string;
  kvar: number;
}

export interface DurationChartInput {
  exceedancePct: readonly number[];
  kvar: readonly number[];
  levels: readonly StepLevel[];
}

const W = 760;
const H = 360;
const PLOT = { left: 70, top: 40, right: 570, bottom: 300 };

export function durationCurveChart(input: DurationChartInput): Chart {
  const values = [...input.kvar, ...input.levels.map((l) => l.kvar), 0];
  const lo = Math.min(...values);
  const hi = Math.max(...values);
  const ticks = niceTicks(lo, hi === lo ? lo + 1 : hi, 6);
  const y0 = Math.min(lo, ticks[0] as number);
  const y1 = Math.max(hi, ticks[ticks.length - 1] as number);
  const x = linearScale(0, 100, PLOT.left, PLOT.right);
  const y = linearScale(y0, y1, PLOT.bottom, PLOT.top);
  const shapes: Shape[] = [
    { kind: "rect", x: PLOT.left, y: PLOT.top, w: PLOT.right - PLOT.left, h: PLOT.bottom - PLOT.top, stroke: { color: INK, width: 1 }, role: "plot-area", data: { x0: String(PLOT.left), x1: String(PLOT.right), y0: String(PLOT.bottom), y1: String(PLOT.top), k0: String(y0), k1: String(y1) } },
  ];
  shapes.push(text(PLOT.left, 20, "Reactive demand duration curve and the bank's cumulative levels", 13, "start", { bold: true }));
  for (const t of ticks) {
    shapes.push(line(PLOT.left, y(t), PLOT.right, y(t), { color: GRID, width: 0.8 }));
    shapes.push(text(PLOT.left - 6, y(t) + 4, fmt.num(t, 0), 10, "end"));
  }
  for (const p of [0, 10, 20, 30, 40, 50, 60, 70, 80, 90, 100]) {
    shapes.push(line(x(p), PLOT.bottom, x(p), PLOT.bottom + 5, { color: INK, width: 1 }));
    shapes.push(text(x(p), PLOT.bottom + 18, String(p), 10, "middle"));
  }
  shapes.push(text((PLOT.left + PLOT.right) / 2, PLOT.bottom + 40, "share of time the reactive demand is at least this, %", 11, "middle"));
  shapes.push(text(18, (PLOT.top + PLOT.bottom) / 2, "reactive demand, kvar", 11, "middle", { rotate: -90 }));
  if (y0 < 0) shapes.push(line(PLOT.left, y(0), PLOT.right, y(0), { color: INK, width: 1 }));
  const pts: Point[] = input.exceedancePct.map((e, i) => [x(e), y(input.kvar[i] as number)]);
  shapes.push({ kind: "polyline", points: pts, stroke: { color: INK, width: 2.2 }, role: "duration-curve", data: { points: String(pts.length) } });
  // Labels at the right, pushed apart so close levels stay readable.
  let lastLabelY = -Infinity;
  [...input.levels].sort((a, b) => b.kvar - a.kvar).forEach((l) => {
    shapes.push(line(PLOT.left, y(l.kvar), PLOT.right, y(l.kvar), { color: "#0b3d91", width: 1.2, dash: [6, 3] }, { role: "step-level", data: { kvar: String(l.kvar) } }));
    const ly = Math.max(y(l.kvar) + 4, lastLabelY + 11);
    lastLabelY = ly;
    shapes.push(text(PLOT.right + 6, ly, `${l.label}: ${fmt.power(l.kvar)} kvar`, 9.5, "start", { color: "#0b3d91" }));
  });
  return {
    id: "duration-curve",
    title: "Reactive demand duration curve with the bank's step levels",
    description: `kvar reached or exceeded against the share of intervals, from ${fmt.power(Math.max(...input.kvar))} kvar at the peak to ${fmt.power(Math.min(...input.kvar))} kvar at the minimum; dashed lines are the bank's cumulative levels.`,
    width: W,
    height: H,
    shapes,
  };
}
