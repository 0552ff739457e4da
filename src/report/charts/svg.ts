/** The chart geometry as a standalone SVG string: viewBox-based, no external references, role="img" with a title. */
import { escapeHtml as esc, slug } from "../escape.js";
import type { Chart, Point, Shape, Stroke, Tagged } from "./geometry.js";

/** Up to 4 decimals, trailing zeros trimmed: enough that drawn lengths keep the data's ratios to ~1e-7. */
function n(v: number, digits = 4): string {
  const s = v.toFixed(digits);
  return s.includes(".") ? s.replace(/0+$/, "").replace(/\.$/, "") : s;
}

function strokeAttrs(s: Stroke | undefined): string {
  if (!s) return ' stroke="none"';
  const dash = s.dash && s.dash.length > 0 ? ` stroke-dasharray="${s.dash.map((d) => n(d)).join(" ")}"` : "";
  return ` stroke="${esc(s.color)}" stroke-width="${n(s.width)}"${dash}`;
}

function tagAttrs(t: Tagged): string {
  let out = t.role ? ` data-role="${esc(t.role)}"` : "";
  for (const [k, v] of Object.entries(t.data ?? {})) out += ` data-${slug(k)}="${esc(v)}"`;
  return out;
}

function pointsAttr(points: readonly Point[]): string {
  return points.map(([x, y]) => `${n(x, 2)},${n(y, 2)}`).join(" ");
}

function shapeSvg(s: Shape): string {
  switch (s.kind) {
    case "line":
      return `<line x1="${n(s.x1)}" y1="${n(s.y1)}" x2="${n(s.x2)}" y2="${n(s.y2)}"${strokeAttrs(s.stroke)} stroke-linecap="butt"${tagAttrs(s)}/>`;
    case "polyline":
      return `<polyline points="${pointsAttr(s.points)}" fill="none"${strokeAttrs(s.stroke)} stroke-linejoin="round"${tagAttrs(s)}/>`;
    case "polygon":
      return `<polygon points="${pointsAttr(s.points)}" fill="${esc(s.fill)}"${strokeAttrs(s.stroke)}${tagAttrs(s)}/>`;
    case "rect":
      return `<rect x="${n(s.x)}" y="${n(s.y)}" width="${n(s.w)}" height="${n(s.h)}" fill="${esc(s.fill ?? "none")}"${strokeAttrs(s.stroke)}${tagAttrs(s)}/>`;
    case "text": {
      const anchor = s.anchor === "start" ? "" : ` text-anchor="${s.anchor}"`;
      const weight = s.bold ? ' font-weight="bold"' : "";
      const fill = s.color ? ` fill="${esc(s.color)}"` : "";
      const rot = s.rotate ? ` transform="rotate(${n(s.rotate)} ${n(s.x)} ${n(s.y)})"` : "";
      return `<text x="${n(s.x, 2)}" y="${n(s.y, 2)}" font-size="${n(s.size)}"${anchor}${weight}${fill}${rot}${tagAttrs(s)}>${esc(s.text)}</text>`;
    }
  }
}

export function chartToSvg(chart: Chart): string {
  const id = `chart-${slug(chart.id)}`;
  const head =
    `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${n(chart.width)} ${n(chart.height)}" ` +
    `role="img" aria-labelledby="${id}-title ${id}-desc" class="chart" id="${id}" ` +
    `font-family="Helvetica, Arial, sans-serif" fill="#000000" preserveAspectRatio="xMidYMid meet"` +
    `${tagAttrs({ role: "chart", data: { chart: chart.id, ...(chart.data ?? {}) } })}>`;
  return [
    head,
    `<title id="${id}-title">${esc(chart.title)}</title>`,
    `<desc id="${id}-desc">${esc(chart.description)}</desc>`,
    `<rect x="0" y="0" width="${n(chart.width)}" height="${n(chart.height)}" fill="#ffffff" stroke="none"/>`,
    ...chart.shapes.map(shapeSvg),
    "</svg>",
  ].join("\n");
}
