/** Power triangles before and after correction, side by side, drawn to one scale. */
import { fmt } from "../format.js";
import { GRID, INK, line, MUTED, text, type Chart, type Point, type Shape, type Stroke } from "./geometry.js";

export interface TriangleData {
  kW: number;
  /** Signed: > 0 lagging (drawn up), < 0 leading (drawn down). */
  kvar: number;
  kVA: number;
  pf: number;
}

export interface TriangleChartInput {
  before: TriangleData;
  after: TriangleData;
  /** kvar the bank supplies (before − after), drawn as a dashed segment on the after triangle. */
  bankKvar: number;
}

const W = 760;
const PANEL_W = W / 2;
const PAD = { left: 36, right: 128, top: 58, bottom: 54 };
/** Tallest and shortest drawing area: the chart's height follows the triangles so no space is wasted. */
const MAX_PLOT_H = 300;
const MIN_PLOT_H = 70;

const LEG: Stroke = { color: INK, width: 3 };
const HYP: Stroke = { color: "#0b3d91", width: 3 };
const BANK: Stroke = { color: "#8b0000", width: 2.5, dash: [7, 4] };

/** The one scale (chart units per kW/kvar) both triangles use: the larger triangle fills its panel. */
export function triangleScale(input: TriangleChartInput): { unitsPerKvar: number; topKvar: number; bottomKvar: number; height: number } {
  const ts = [input.before, input.after];
  const maxKW = Math.max(...ts.map((t) => t.kW), 1e-9);
  const topKvar = Math.max(0, ...ts.map((t) => t.kvar));
  const bottomKvar = Math.min(0, ...ts.map((t) => t.kvar));
  const width = PANEL_W - PAD.left - PAD.right;
  const spanKvar = topKvar - bottomKvar;
  const unitsPerKvar = spanKvar > 0 ? Math.min(width / maxKW, MAX_PLOT_H / spanKvar) : width / maxKW;
  const height = PAD.top + Math.max(MIN_PLOT_H, spanKvar * unitsPerKvar) + PAD.bottom;
  return { unitsPerKvar, topKvar, bottomKvar, height };
}

function arc(cx: number, cy: number, r: number, phi: number): Point[] {
  const pts: Point[] = [];
  const n = 24;
  for (let i = 0; i <= n; i++) {
    const t = (phi * i) / n;
    pts.push([cx + r * Math.cos(t), cy - r * Math.sin(t)]);
  }
  return pts;
}

function senseWord(kvar: number, kVA: number): string {
  if (Math.abs(kvar) <= Math.max(1e-9, kVA * 1e-9)) return "unity";
  return kvar > 0 ? "lagging" : "leading";
}

function panel(t: TriangleData, state: "before" | "after", x0: number, s: number, topKvar: number, bankKvar: number): Shape[] {
  const ox = x0 + PAD.left;
  const oy = PAD.top + topKvar * s;
  const px = ox + t.kW * s;
  const qy = oy - t.kvar * s;
  const tag = (role: string, value: number) => ({ role, data: { state, value: String(value) } });
  const phi = Math.atan2(t.kvar, t.kW);
  const shapes: Shape[] = [
    text(x0 + PANEL_W / 2, 22, state === "before" ? "Before correction" : "After correction", 14, "middle", { bold: true }),
    text(x0 + PANEL_W / 2, 40, `PF ${fmt.pf(t.pf)} ${senseWord(t.kvar, t.kVA)}`, 12, "middle"),
    line(ox, oy, px, oy, LEG, tag("kw-leg", t.kW)),
    line(px, oy, px, qy, LEG, tag("kvar-leg", t.kvar)),
    line(ox, oy, px, qy, HYP, tag("kva-leg", t.kVA)),
    text((ox + px) / 2, oy + (t.kvar >= 0 ? 18 : -8), `P ${fmt.power(t.kW)} kW`, 11, "middle"),
    text(px + 8, (oy + qy) / 2 + 4, `Q ${fmt.power(t.kvar)} kvar`, 11, "start"),
  ];
  // kVA label beside the hypotenuse's midpoint, on the side away from the right angle.
  const mx = (ox + px) / 2;
  const my = (oy + qy) / 2;
  const len = Math.hypot(px - ox, qy - oy) || 1;
  const nx = (qy - oy) / len;
  const ny = -(px - ox) / len;
  const flip = t.kvar >= 0 ? 1 : -1;
  shapes.push(text(mx + nx * 16 * flip - 8, my + ny * 16 * flip, `S ${fmt.power(t.kVA)} kVA`, 11, "end", { color: "#0b3d91" }));
  const r = Math.min(46, Math.max(18, 0.3 * t.kW * s));
  if (Math.abs(phi) > 1e-6) {
    shapes.push({
      kind: "polyline",
      points: arc(ox, oy, r, phi),
      stroke: { color: INK, width: 1.5 },
      role: "phi-arc",
      data: { state, degrees: String((phi * 180) / Math.PI) },
    });
  }
  const lr = r + 14;
  shapes.push(
    text(ox + lr * Math.cos(phi / 2), oy - lr * Math.sin(phi / 2) + 4, `φ ${fmt.degrees((phi * 180) / Math.PI)}°`, 11, "start", {
      role: "phi-label",
    }),
  );
  if (state === "after" && bankKvar > 1e-9) {
    const by = qy - bankKvar * s;
    shapes.push(line(px, qy, px, by, BANK, { role: "bank-kvar", data: { value: String(bankKvar) } }));
    shapes.push(line(ox, by, px, by, { color: GRID, width: 1, dash: [2, 3] }));
    shapes.push(text(px + 8, (qy + by) / 2 + 4, `bank ${fmt.power(bankKvar)} kvar`, 11, "start", { color: "#8b0000" }));
  }
  return shapes;
}

export function powerTriangleChart(input: TriangleChartInput): Chart {
  const { unitsPerKvar: s, topKvar, height: H } = triangleScale(input);
  const shapes: Shape[] = [
    line(PANEL_W, 10, PANEL_W, H - 30, { color: GRID, width: 1 }),
    ...panel(input.before, "before", 0, s, topKvar, 0),
    ...panel(input.after, "after", PANEL_W, s, topKvar, input.bankKvar),
    text(
      W / 2,
      H - 10,
      "Same scale in both triangles. P real power (kW), Q reactive power (kvar, up = lagging), S apparent power (kVA).",
      10,
      "middle",
      { color: MUTED },
    ),
  ];
  return {
    id: "power-triangle",
    title: "Power triangle before and after correction",
    description: `Before: ${fmt.power(input.before.kW)} kW, ${fmt.power(input.before.kvar)} kvar, ${fmt.power(input.before.kVA)} kVA, PF ${fmt.pf(input.before.pf)}. After: ${fmt.power(input.after.kW)} kW, ${fmt.power(input.after.kvar)} kvar, ${fmt.power(input.after.kVA)} kVA, PF ${fmt.pf(input.after.pf)}.`,
    width: W,
    height: H,
    shapes,
    data: { "units-per-kvar": String(s) },
  };
}
