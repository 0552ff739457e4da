/** Draws the chart geometry with pdfkit's vector primitives (lines, paths, text): no raster images. */
import type { Chart, Point, Shape, Stroke } from "./charts/geometry.js";
import { BOLD, FONT } from "./pdf-fonts.js";
import { pdfSafe } from "./pdf-text.js";

type Doc = PDFKit.PDFDocument;
type DashFn = (length: number | number[], options?: { space?: number; phase?: number }) => Doc;

function applyStroke(doc: Doc, s: Stroke): void {
  doc.lineWidth(s.width).strokeColor(s.color).lineCap("butt").lineJoin("round");
  const dash = doc.dash as unknown as DashFn;
  if (s.dash && s.dash.length > 0) dash.call(doc, [...s.dash]);
  else doc.undash();
}

function path(doc: Doc, points: readonly Point[], close: boolean): void {
  points.forEach(([x, y], i) => (i === 0 ? doc.moveTo(x, y) : doc.lineTo(x, y)));
  if (close) doc.closePath();
}

/** One shape; returns 1 (a primitive drawn) or 0. */
function drawShape(doc: Doc, s: Shape): number {
  switch (s.kind) {
    case "line":
      applyStroke(doc, s.stroke);
      doc.moveTo(s.x1, s.y1).lineTo(s.x2, s.y2).stroke();
      return 1;
    case "polyline":
      if (s.points.length < 2) return 0;
      applyStroke(doc, s.stroke);
      path(doc, s.points, false);
      doc.stroke();
      return 1;
    case "polygon":
      path(doc, s.points, true);
      if (s.stroke) {
        applyStroke(doc, s.stroke);
        doc.fillAndStroke(s.fill, s.stroke.color);
      } else doc.fill(s.fill);
      return 1;
    case "rect":
      doc.rect(s.x, s.y, s.w, s.h);
      if (s.fill && s.fill !== "none" && s.stroke) {
        applyStroke(doc, s.stroke);
        doc.fillAndStroke(s.fill, s.stroke.color);
      } else if (s.fill && s.fill !== "none") doc.fill(s.fill);
      else if (s.stroke) {
        applyStroke(doc, s.stroke);
        doc.stroke();
      }
      return 1;
    case "text": {
      const t = pdfSafe(s.text);
      doc
        .font(s.bold ? BOLD : FONT)
        .fontSize(s.size)
        .fillColor(s.color ?? "#000000");
      const w = doc.widthOfString(t);
      const dx = s.anchor === "middle" ? -w / 2 : s.anchor === "end" ? -w : 0;
      doc.save();
      if (s.rotate) doc.rotate(s.rotate, { origin: [s.x, s.y] });
      doc.text(t, s.x + dx, s.y, { lineBreak: false, baseline: "alphabetic" });
      doc.restore();
      return 1;
    }
  }
}

/** Draw `chart` with its top-left at (x, y), `width` points wide; returns the primitives drawn. */
export function drawChart(doc: Doc, chart: Chart, x: number, y: number, width: number): number {
  const k = width / chart.width;
  let count = 0;
  doc.save();
  doc.translate(x, y).scale(k);
  doc
    .rect(0, 0, chart.width, chart.height)
    .lineWidth(1 / k)
    .undash()
    .strokeColor("#000000")
    .stroke();
  for (const s of chart.shapes) count += drawShape(doc, s);
  doc.restore();
  doc.undash().lineWidth(1).strokeColor("#000000").fillColor("#000000");
  return count;
}
