/**
 * A small chart geometry: the chart builders produce it, the SVG writer and the PDF writer draw it.
 * Coordinates are in the chart's own units (its viewBox), y down, text y is the baseline.
 */

export type Point = readonly [number, number];

export interface Stroke {
  color: string;
  width: number;
  /** Dash pattern in chart units (on, off, on, off…); absent or empty: solid. */
  dash?: readonly number[];
}

/** Data attributes for tests and readers: role plus free key-value pairs (written as data-*). */
export interface Tagged {
  role?: string;
  data?: Record<string, string>;
}

export type Shape =
  | ({ kind: "line"; x1: number; y1: number; x2: number; y2: number; stroke: Stroke } & Tagged)
  | ({ kind: "polyline"; points: readonly Point[]; stroke: Stroke } & Tagged)
  | ({ kind: "polygon"; points: readonly Point[]; fill: string; stroke?: Stroke } & Tagged)
  | ({ kind: "rect"; x: number; y: number; w: number; h: number; fill?: string; stroke?: Stroke } & Tagged)
  | ({
      kind: "text";
      x: number;
      y: number;
      text: string;
      size: number;
      anchor: "start" | "middle" | "end";
      bold?: boolean;
      color?: string;
      /** Degrees, clockwise, about (x, y). */
      rotate?: number;
    } & Tagged);

export interface Chart {
  id: string;
  title: string;
  /** A sentence saying what the chart shows, for screen readers and the PDF caption. */
  description: string;
  width: number;
  height: number;
  shapes: Shape[];
  data?: Record<string, string>;
}

export const INK = "#000000";
export const GRID = "#b0b0b0";
export const MUTED = "#444444";

/** Line styles told apart by dash pattern first (black-and-white print), colour second. */
export const SERIES_STYLES: readonly Stroke[] = [
  { color: "#000000", width: 1.8 },
  { color: "#0b3d91", width: 1.8, dash: [9, 4] },
  { color: "#8b0000", width: 1.8, dash: [2, 3] },
  { color: "#005a32", width: 1.8, dash: [10, 3, 2, 3] },
  { color: "#4b0082", width: 1.8, dash: [16, 5] },
  { color: "#7a4a00", width: 1.8, dash: [6, 3, 2, 3, 2, 3] },
  { color: "#000000", width: 1.2, dash: [4, 4] },
  { color: "#0b3d91", width: 2.6, dash: [1, 3] },
  { color: "#8b0000", width: 1.2, dash: [12, 3, 4, 3] },
  { color: "#005a32", width: 2.4 },
];

export function seriesStyle(i: number): Stroke {
  return SERIES_STYLES[i % SERIES_STYLES.length] as Stroke;
}

export interface Scale {
  (v: number): number;
  domain: readonly [number, number];
  range: readonly [number, number];
}

export function linearScale(d0: number, d1: number, r0: number, r1: number): Scale {
  const span = d1 - d0 || 1;
  const f = ((v: number) => r0 + ((v - d0) / span) * (r1 - r0)) as Scale;
  return Object.assign(f, { domain: [d0, d1] as const, range: [r0, r1] as const });
}

/** Log10 scale; values at or below 0 are drawn at the bottom of the domain. */
export function logScale(d0: number, d1: number, r0: number, r1: number): Scale {
  const l0 = Math.log10(d0);
  const span = Math.log10(d1) - l0 || 1;
  const f = ((v: number) => r0 + ((Math.log10(Math.max(v, d0)) - l0) / span) * (r1 - r0)) as Scale;
  return Object.assign(f, { domain: [d0, d1] as const, range: [r0, r1] as const });
}

/** About `count` round tick values covering [lo, hi] (steps of 1, 2 or 5 × 10^k). */
export function niceTicks(lo: number, hi: number, count = 6): number[] {
  if (!(hi > lo)) return [lo];
  const raw = (hi - lo) / Math.max(1, count);
  const mag = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 5, 10].map((m) => m * mag).find((s) => s >= raw) ?? 10 * mag;
  const out: number[] = [];
  for (let v = Math.ceil(lo / step - 1e-9) * step; v <= hi + step * 1e-9; v += step) out.push(Math.abs(v) < step * 1e-9 ? 0 : v);
  return out;
}

/** Ramer–Douglas–Peucker in chart units: drops points within `tolerance` of the simplified line. */
export function simplify(points: readonly Point[], tolerance = 0.3): Point[] {
  if (points.length <= 2) return [...points];
  const keep = new Uint8Array(points.length);
  keep[0] = 1;
  keep[points.length - 1] = 1;
  const stack: [number, number][] = [[0, points.length - 1]];
  while (stack.length > 0) {
    const [a, b] = stack.pop() as [number, number];
    const [ax, ay] = points[a] as Point;
    const [bx, by] = points[b] as Point;
    const dx = bx - ax;
    const dy = by - ay;
    const len = Math.hypot(dx, dy);
    let worst = -1;
    let worstD = tolerance;
    for (let i = a + 1; i < b; i++) {
      const [px, py] = points[i] as Point;
      const d = len === 0 ? Math.hypot(px - ax, py - ay) : Math.abs(dy * px - dx * py + bx * ay - by * ax) / len;
      if (d > worstD) ((worst = i), (worstD = d));
    }
    if (worst >= 0) {
      keep[worst] = 1;
      stack.push([a, worst], [worst, b]);
    }
  }
  return points.filter((_, i) => keep[i] === 1);
}

export function text(
  x: number,
  y: number,
  s: string,
  size = 11,
  anchor: "start" | "middle" | "end" = "start",
  extra: Partial<Extract<Shape, { kind: "text" }>> = {},
): Shape {
  return { kind: "text", x, y, text: s, size, anchor, ...extra };
}

export function line(x1: number, y1: number, x2: number, y2: number, stroke: Stroke, tag: Tagged = {}): Shape {
  return { kind: "line", x1, y1, x2, y2, stroke, ...tag };
}

/** Short sample of a series style, for legends. */
export function legendEntry(x: number, y: number, style: Stroke, label: string, tag: Tagged = {}): Shape[] {
  return [line(x, y - 4, x + 34, y - 4, style, tag), text(x + 40, y, label, 10)];
}
