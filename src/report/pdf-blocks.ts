/** The report's blocks measured into PDF boxes: headings kept with what follows, long notes split by line. */
import { drawChart } from "./pdf-chart.js";
import { type Flow, keepLines, type TextStyle } from "./pdf-flow.js";
import type { Keep } from "./pdf-layout.js";
import { drawTable } from "./pdf-table.js";
import type { Block } from "./types.js";

export const BODY: TextStyle = { size: 9.5 };

export interface ChartCount {
  charts: number;
  /** Vector shapes drawn for charts (lines, polylines, rectangles, text). */
  chartPrimitives: number;
}

function rule(flow: Flow, y: number, widthPt: number, color: string): void {
  flow.doc.moveTo(flow.left, y).lineTo(flow.right, y).lineWidth(widthPt).undash().strokeColor(color).stroke();
}

/**
 * A key and its value, ruled below; a value taller than a third of the page goes line by line. `keepAfter`:
 * whether the row stays with the next one.
 */
function keyValue(flow: Flow, key: string, value: string, gapAfter: number, keepAfter: Keep | undefined): void {
  const KEY: TextStyle = { size: 9, bold: true };
  const VALUE: TextStyle = { size: 9 };
  const kw = flow.width * 0.38;
  const vw = flow.width - kw - 8;
  const vx = flow.left + kw + 8;
  const keyH = flow.height(key, kw, KEY);
  const parts = flow.pieces(value, vw, VALUE, flow.bodyHeight / 3);
  parts.forEach((part, i) => {
    const first = i === 0;
    const last = i === parts.length - 1;
    // 2 pt above the first line and below the last, as a one-box row has.
    const top = first ? 2 : 0;
    const h = (first ? Math.max(keyH, part.heightPt) : part.heightPt) + top + (last ? 2 : 0);
    const keep = last ? keepAfter : keepLines(i, parts.length);
    flow.add({
      kind: "key-value",
      heightPt: h,
      gapAfterPt: last ? gapAfter : 0,
      ...(keep ? { keepWithNext: keep } : {}),
      draw: (y) => {
        if (first) flow.textAt(key, flow.left, y + 2, kw, KEY);
        flow.textAt(part.text, vx, y + top, vw, VALUE);
        if (last) rule(flow, y + h, 0.4, "#888888");
      },
    });
  });
}

function keyValues(flow: Flow, items: { key: string; value: string }[], title?: string): void {
  if (title) flow.paragraph(title, { size: 10, bold: true }, 0, 3, "key-values-title", items.length > 0 ? "always" : undefined);
  // Like lines of a paragraph: no row alone at a page's foot or head.
  items.forEach((it, i) => keyValue(flow, it.key, it.value, i === items.length - 1 ? 6 : 0, keepLines(i, items.length)));
}

function callout(flow: Flow, title: string, text: string, reference?: string): void {
  const inner = flow.width - 22;
  const t = `CAUTION: ${title}`;
  const ref = reference ? `Reference: ${reference}` : "";
  const titleH = flow.height(t, inner, { size: 10, bold: true });
  const textH = flow.height(text, inner, BODY);
  const h = titleH + 3 + textH + (ref ? flow.height(ref, inner, { size: 8 }) + 2 : 0) + 12;
  flow.add({
    kind: "callout",
    heightPt: h,
    gapAfterPt: 6,
    draw: (top) => {
      const doc = flow.doc;
      doc.rect(flow.left, top, flow.width, h).lineWidth(1.5).undash().strokeColor("#000000").stroke();
      doc.rect(flow.left, top, 7, h).fill("#000000");
      let y = top + 6;
      flow.textAt(t, flow.left + 16, y, inner, { size: 10, bold: true });
      y += titleH + 3;
      flow.textAt(text, flow.left + 16, y, inner, BODY);
      y += textH + 2;
      if (ref) flow.textAt(ref, flow.left + 16, y, inner, { size: 8 });
    },
  });
}

function paragraphBlock(flow: Flow, text: string, tone: "normal" | "note" | "alert" | undefined): void {
  if (tone === "alert") {
    const s: TextStyle = { size: 9.5, bold: true };
    const h = flow.height(text, flow.width - 12, s) + 10;
    flow.add({
      kind: "alert",
      heightPt: h,
      gapAfterPt: 6,
      draw: (y) => {
        flow.doc.rect(flow.left, y, flow.width, h).lineWidth(1.5).undash().strokeColor("#000000").stroke();
        flow.textAt(text, flow.left + 6, y + 5, flow.width - 12, s);
      },
    });
  } else if (tone === "note") {
    const s: TextStyle = { size: 9 };
    const h = flow.height(text, flow.width - 10, s);
    flow.add({
      kind: "note",
      heightPt: h,
      gapAfterPt: 6,
      draw: (y) => {
        flow.doc.rect(flow.left, y, 3, h).fill("#555555");
        flow.textAt(text, flow.left + 10, y, flow.width - 10, s);
      },
    });
  } else flow.paragraph(text, BODY, 0, 6);
}

export function subheading(flow: Flow, text: string): void {
  const s: TextStyle = { size: 11.5, bold: true };
  const textH = flow.height(text, flow.width, s);
  flow.add({
    kind: "subheading",
    heightPt: 4 + textH + 1,
    gapAfterPt: 5,
    keepWithNext: "always",
    draw: (y) => {
      flow.textAt(text, flow.left, y + 4, flow.width, s);
      rule(flow, y + 4 + textH + 1, 1.2, "#000000");
    },
  });
}

export function block(flow: Flow, b: Block, count: ChartCount): void {
  switch (b.kind) {
    case "paragraph":
      return paragraphBlock(flow, b.text, b.tone);
    case "subheading":
      return subheading(flow, b.text);
    case "keyValues":
      return keyValues(flow, b.items, b.title);
    case "table":
      return drawTable(flow, b.title, b.header, b.rows, b.align, b.note);
    case "list":
      b.items.forEach((item, i) => {
        const s: TextStyle = { size: 9 };
        const keep = keepLines(i, b.items.length);
        flow.add({
          kind: "list-item",
          heightPt: flow.height(item, flow.width - 12, s),
          gapAfterPt: i === b.items.length - 1 ? 6 : 2,
          ...(keep ? { keepWithNext: keep } : {}),
          draw: (y) => {
            flow.textAt("•", flow.left + 2, y, 8, s);
            flow.textAt(item, flow.left + 12, y, flow.width - 12, s);
          },
        });
      });
      return;
    case "callout":
      return callout(flow, b.title, b.text, b.reference);
    case "chart": {
      const w = flow.width;
      const h = (b.chart.height * w) / b.chart.width;
      const caption = b.chart.description;
      const captionH = flow.height(caption, w, { size: 8 });
      flow.add({
        kind: "chart",
        heightPt: h + 3 + captionH,
        gapAfterPt: 10,
        draw: (y) => {
          count.chartPrimitives += drawChart(flow.doc, b.chart, flow.left, y, w);
          count.charts++;
          flow.textAt(caption, flow.left, y + h + 3, w, { size: 8 });
        },
      });
      return;
    }
  }
}
