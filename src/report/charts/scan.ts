/** |Z(h)| against harmonic order, one line per stage, with the site's harmonic orders marked. */
import { fmt } from "../format.js";
import {
  GRID,
  INK,
  legendEntry,
  line,
  linearScale,
  logScale,
  MUTED,
  niceTicks,
  seriesStyle,
  simplify,
  text,
  type Chart,
  type Point,
  type Shape,
} from "./geometry.js";

export interface ScanLine {
  label: string;
  orders: readonly number[];
  impedanceOhm: readonly number[];
  /** "stage" lines are the bank's stages; "bus" is the bus without capacitors (drawn thin and grey). */
  kind: "stage" | "bus";
  stageNumber?: number;
}

export interface ScanChartInput {
  id: string;
  title: string;
  lines: ScanLine[];
  /** Harmonic orders the site's sources produce: vertical marker lines. */
  markerOrders: readonly number[];
  fromOrder?: number;
  toOrder?: number;
}

const W = 760;
const PLOT = { left: 64, top: 52, right: 560, bottom: 330 };
const MANTISSAS = [1, 2, 5] as const;

/** 1-2-5 bounds around [lo, hi]: the log axis spans what the data needs, not whole decades. */
export function logBounds(lo: number, hi: number): [number, number] {
  const below = (v: number) => {
    const e = Math.floor(Math.log10(v));
    const m = [...MANTISSAS].reverse().find((k) => k * 10 ** e <= v * (1 + 1e-12)) ?? 1;
    return m * 10 ** e;
  };
  const above = (v: number) => {
    const e = Math.floor(Math.log10(v));
    const m = MANTISSAS.find((k) => k * 10 ** e >= v * (1 - 1e-12));
    return m === undefined ? 10 ** (e + 1) : m * 10 ** e;
  };
  const a = below(lo);
  const b = above(hi);
  return [a, b > a ? b : a * 2];
}

function tickLabel(v: number): string {
  return v >= 1 ? String(Number(v.toPrecision(3))) : String(Number(v.toPrecision(1)));
}
const LEGEND_X = 578;

export function impedanceScanChart(input: ScanChartInput): Chart {
  const h0 = input.fromOrder ?? 1;
  const h1 = input.toOrder ?? Math.max(h0 + 1, ...input.lines.map((l) => l.orders[l.orders.length - 1] ?? h0));
  let zMin = Infinity;
  let zMax = 0;
  for (const l of input.lines)
    l.orders.forEach((h, i) => {
      const z = l.impedanceOhm[i] as number;
      if (h < h0 || h > h1 || !(z > 0)) return;
      zMin = Math.min(zMin, z);
      zMax = Math.max(zMax, z);
    });
  if (!(zMax > 0)) ((zMin = 0.001), (zMax = 1));
  const [d0, d1] = logBounds(zMin, zMax);
  const x = linearScale(h0, h1, PLOT.left, PLOT.right);
  const y = logScale(d0, d1, PLOT.bottom, PLOT.top);
  const legendRows = input.lines.length;
  const height = Math.max(PLOT.bottom + 50, PLOT.top + 24 + legendRows * 18);
  const shapes: Shape[] = [
    {
      kind: "rect",
      x: PLOT.left,
      y: PLOT.top,
      w: PLOT.right - PLOT.left,
      h: PLOT.bottom - PLOT.top,
      stroke: { color: INK, width: 1 },
      role: "plot-area",
      data: {
        x0: String(PLOT.left),
        x1: String(PLOT.right),
        h0: String(h0),
        h1: String(h1),
        y0: String(PLOT.bottom),
        y1: String(PLOT.top),
        z0: String(y.domain[0]),
        z1: String(y.domain[1]),
        "y-axis": "log10",
      },
    },
  ];
  shapes.push(text(PLOT.left, 18, input.title, 13, "start", { bold: true }));
  for (let e = Math.floor(Math.log10(d0)); e <= Math.ceil(Math.log10(d1)); e++) {
    for (const m of MANTISSAS) {
      const v = m * 10 ** e;
      if (v < d0 * (1 - 1e-9) || v > d1 * (1 + 1e-9)) continue;
      shapes.push(line(PLOT.left, y(v), PLOT.right, y(v), { color: GRID, width: m === 1 ? 0.9 : 0.5, ...(m === 1 ? {} : { dash: [2, 3] }) }));
      shapes.push(text(PLOT.left - 6, y(v) + 4, tickLabel(v), 10, "end"));
    }
  }
  for (const h of niceTicks(h0, h1, 10)) {
    shapes.push(line(x(h), PLOT.bottom, x(h), PLOT.bottom + 5, { color: INK, width: 1 }));
    shapes.push(text(x(h), PLOT.bottom + 18, String(h), 10, "middle"));
  }
  shapes.push(text((PLOT.left + PLOT.right) / 2, PLOT.bottom + 38, "harmonic order h", 11, "middle"));
  shapes.push(text(16, (PLOT.top + PLOT.bottom) / 2, "|Z| at the bus, ohm (log)", 11, "middle", { rotate: -90 }));
  const markers = [...new Set(input.markerOrders)].filter((h) => h >= h0 && h <= h1).sort((a, b) => a - b);
  for (const h of markers) {
    shapes.push(
      line(
        x(h),
        PLOT.top,
        x(h),
        PLOT.bottom,
        { color: "#8b0000", width: 0.9, dash: [3, 3] },
        { role: "harmonic-marker", data: { order: String(h) } },
      ),
    );
    shapes.push(text(x(h), PLOT.top - 6, String(h), 9, "middle", { color: "#8b0000" }));
  }
  let stageIndex = 0;
  input.lines.forEach((l, i) => {
    const style = l.kind === "bus" ? { color: MUTED, width: 1, dash: [1, 2] } : seriesStyle(stageIndex++);
    const pts: Point[] = [];
    l.orders.forEach((h, k) => {
      if (h >= h0 && h <= h1) pts.push([x(h), y(l.impedanceOhm[k] as number)]);
    });
    const data: Record<string, string> = { label: l.label, points: String(pts.length) };
    if (l.stageNumber !== undefined) data.stage = String(l.stageNumber);
    shapes.push({ kind: "polyline", points: simplify(pts, 0.25), stroke: style, role: l.kind === "bus" ? "scan-bus" : "scan-stage", data });
    shapes.push(...legendEntry(LEGEND_X, PLOT.top + 10 + i * 18, style, l.label));
  });
  shapes.push(text(LEGEND_X, PLOT.top + 14 + legendRows * 18, "dashed red: orders the", 9, "start", { color: "#8b0000" }));
  shapes.push(text(LEGEND_X, PLOT.top + 26 + legendRows * 18, "site's sources produce", 9, "start", { color: "#8b0000" }));
  const orders = markers.length > 0 ? markers.join(", ") : "none";
  return {
    id: input.id,
    title: input.title,
    description: `Impedance seen at the capacitor bus against harmonic order, ${input.lines.length} line(s), orders ${fmt.num(h0, 0)} to ${fmt.num(h1, 0)}; source harmonic orders marked: ${orders}. Peaks are parallel resonances.`,
    width: W,
    height,
    shapes,
  };
}
