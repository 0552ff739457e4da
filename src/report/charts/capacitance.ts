/** Capacitance of each installed step across the building's surveys, with the degraded and failed lines. */
import { fmt } from "../format.js";
import { GRID, INK, MUTED, legendEntry, line, linearScale, niceTicks, seriesStyle, text, type Chart, type Point, type Shape } from "./geometry.js";

export interface CapacitanceLine {
  /** e.g. "Wall bank step 2". */
  label: string;
  /** One value per survey (same order as `surveys`); null where the step was not measured. */
  pct: readonly (number | null)[];
}

export interface CapacitanceChartInput {
  /** Survey dates, oldest first, as the x axis labels. */
  surveys: readonly string[];
  lines: readonly CapacitanceLine[];
  degradedBelowPct: number;
  failedBelowPct: number;
}

const W = 760;
const PLOT = { left: 70, top: 40, right: 560, bottom: 300 };

export function capacitanceChart(input: CapacitanceChartInput): Chart {
  const values = input.lines.flatMap((l) => l.pct.filter((v): v is number => v !== null));
  const lo = Math.min(input.failedBelowPct - 10, ...values);
  const hi = Math.max(110, ...values);
  const ticks = niceTicks(lo, hi, 6);
  const y0 = Math.min(lo, ticks[0] as number);
  const y1 = Math.max(hi, ticks[ticks.length - 1] as number);
  const n = input.surveys.length;
  const x = linearScale(0, Math.max(1, n - 1), PLOT.left + 20, PLOT.right - 20);
  const y = linearScale(y0, y1, PLOT.bottom, PLOT.top);
  const H = PLOT.bottom + 60 + Math.max(0, input.lines.length - 6) * 14;
  const shapes: Shape[] = [
    {
      kind: "rect",
      x: PLOT.left,
      y: PLOT.top,
      w: PLOT.right - PLOT.left,
      h: PLOT.bottom - PLOT.top,
      stroke: { color: INK, width: 1 },
      role: "plot-area",
      data: { y0: String(y0), y1: String(y1) },
    },
    text(PLOT.left, 20, "Capacitance of each installed step, survey by survey", 13, "start", { bold: true }),
  ];
  for (const t of ticks) {
    shapes.push(line(PLOT.left, y(t), PLOT.right, y(t), { color: GRID, width: 0.8 }));
    shapes.push(text(PLOT.left - 6, y(t) + 4, fmt.num(t, 0), 10, "end"));
  }
  input.surveys.forEach((s, i) => {
    shapes.push(line(x(i), PLOT.bottom, x(i), PLOT.bottom + 5, { color: INK, width: 1 }));
    shapes.push(text(x(i), PLOT.bottom + 18, s, 9.5, "middle"));
  });
  shapes.push(text(18, (PLOT.top + PLOT.bottom) / 2, "capacitance, % of rated", 11, "middle", { rotate: -90 }));
  for (const [pct, label] of [
    [input.degradedBelowPct, "degraded below"],
    [input.failedBelowPct, "failed below"],
  ] as const) {
    shapes.push(
      line(PLOT.left, y(pct), PLOT.right, y(pct), { color: "#8b0000", width: 1, dash: [5, 3] }, { role: "threshold", data: { pct: String(pct) } }),
    );
    shapes.push(text(PLOT.right - 4, y(pct) - 4, `${label} ${pct} %`, 9, "end", { color: "#8b0000" }));
  }
  input.lines.forEach((l, i) => {
    const style = seriesStyle(i);
    const pts: Point[] = [];
    l.pct.forEach((v, k) => {
      if (v !== null) pts.push([x(k), y(v)]);
    });
    if (pts.length > 1)
      shapes.push({ kind: "polyline", points: pts, stroke: style, role: "step-series", data: { step: l.label, points: String(pts.length) } });
    for (const [px, py] of pts)
      shapes.push({ kind: "rect", x: px - 2.5, y: py - 2.5, w: 5, h: 5, fill: style.color, role: "step-point", data: { step: l.label } });
    shapes.push(...legendEntry(PLOT.right + 12, PLOT.top + 10 + i * 14, style, l.label, { role: "legend" }));
  });
  if (values.length === 0)
    shapes.push(text((PLOT.left + PLOT.right) / 2, (PLOT.top + PLOT.bottom) / 2, "no step currents were measured", 11, "middle", { color: MUTED }));
  const last = input.lines.map((l) => ({ label: l.label, v: [...l.pct].reverse().find((v) => v !== null) ?? null })).filter((l) => l.v !== null);
  return {
    id: "installed-capacitance",
    title: "Capacitance per installed step across surveys",
    description: `Measured capacitance in percent of rated for ${input.lines.length} steps over ${n} surveys (${input.surveys[0] ?? ""} to ${input.surveys[n - 1] ?? ""}); dashed lines mark ${input.degradedBelowPct} % (degraded) and ${input.failedBelowPct} % (failed). Latest: ${last.map((l) => `${l.label} ${fmt.pct(l.v)} %`).join(", ") || "none measured"}.`,
    width: W,
    height: H,
    shapes,
  };
}
