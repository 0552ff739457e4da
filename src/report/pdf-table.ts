/** Tables in the PDF: a simple grid, wrapped cells, the header repeated on every page the table spans. */
import { type Flow, keepLines, type TextStyle } from "./pdf-flow.js";
import { pdfSafe } from "./pdf-text.js";
import type { Align } from "./types.js";

const PAD = 3;
const SLACK = 0.5;
const KEEP_ROWS = 14;
const CELL: TextStyle = { size: 7.5 };
const HEAD: TextStyle = { size: 7.5, bold: true };

/**
 * Column widths, in order of preference: every cell and header on one line; cells on one line with headers
 * wrapped at words; else each column's longest word plus a share of the rest by how much more it wants.
 */
export function columnWidths(flow: Flow, header: string[], rows: string[][], total: number): number[] {
  const n = header.length;
  const cell = new Array<number>(n).fill(0);
  const head = new Array<number>(n).fill(0);
  const headWord = new Array<number>(n).fill(0);
  const least = new Array<number>(n).fill(0);
  // SLACK: a word measured to fit its column still fits after the widths' float arithmetic.
  const widthOf = (t: string, s: TextStyle) => {
    flow.style(s);
    return flow.doc.widthOfString(pdfSafe(t)) + 2 * PAD + SLACK;
  };
  // pdfkit's line breaker measures each word with the space after it, and cuts a word that does not fit so.
  const longestWord = (t: string, s: TextStyle) =>
    Math.max(
      0,
      ...pdfSafe(t)
        .split(/\s+/)
        .map((w) => Math.min(widthOf(`${w} `, s), total / n)),
    );
  header.forEach((h, i) => {
    head[i] = widthOf(h, HEAD);
    headWord[i] = longestWord(h, HEAD);
    least[i] = headWord[i] as number;
  });
  rows.forEach((r) =>
    r.forEach((c, i) => {
      cell[i] = Math.max(cell[i] as number, widthOf(c, CELL));
      least[i] = Math.max(least[i] as number, longestWord(c, CELL));
    }),
  );
  const sum = (a: number[]) => a.reduce((x, y) => x + y, 0);
  const spread = (base: number[], want: number[]) => {
    const spare = Math.max(0, total - sum(base));
    const extra = want.map((w, i) => Math.max(0, w - (base[i] as number)));
    const sumExtra = sum(extra);
    const widths = sumExtra > 0 ? base.map((b, i) => b + Math.min(extra[i] as number, (spare * (extra[i] as number)) / sumExtra)) : base;
    const left = total - sum(widths);
    return widths.map((w) => w + left / n);
  };
  const oneLine = cell.map((c, i) => Math.max(c, head[i] as number));
  if (sum(oneLine) <= total) return spread(oneLine, oneLine);
  const cellsOneLine = cell.map((c, i) => Math.max(c, headWord[i] as number));
  if (sum(cellsOneLine) <= total) return spread(cellsOneLine, oneLine);
  const widths = spread(least, cellsOneLine);
  const scale = total / sum(widths);
  return widths.map((w) => w * scale);
}

function rowHeight(flow: Flow, cells: string[], widths: number[], s: TextStyle): number {
  return Math.max(...cells.map((c, i) => flow.height(c, (widths[i] as number) - 2 * PAD, s))) + 2 * PAD;
}

function drawRow(flow: Flow, y: number, cells: string[], widths: number[], align: Align[] | undefined, s: TextStyle, fill: string | null): void {
  const h = rowHeight(flow, cells, widths, s);
  const doc = flow.doc;
  let x = flow.left;
  cells.forEach((c, i) => {
    const w = widths[i] as number;
    if (fill) doc.rect(x, y, w, h).fill(fill);
    doc.rect(x, y, w, h).lineWidth(0.6).undash().strokeColor("#000000").stroke();
    flow.textAt(c, x + PAD, y + PAD, w - 2 * PAD, s, align?.[i] === "right" ? "right" : "left");
    x += w;
  });
}

/**
 * A table as boxes: its title and header row kept with the first rows; each row a box that repeats the header
 * when it starts a page; the rows of a short table chained so the table moves whole (as the HTML print keeps it).
 */
export function drawTable(flow: Flow, title: string | undefined, header: string[], rows: string[][], align?: Align[], note?: string): void {
  const widths = columnWidths(flow, header, rows, flow.width);
  const headH = rowHeight(flow, header, widths, HEAD);
  const titleH = title ? flow.height(title, flow.width, { size: 9, bold: true }) + 3 : 0;
  const drawHead = (y: number) => drawRow(flow, y, header, widths, align, HEAD, "#e0e0e0");
  flow.add({
    kind: "table-head",
    heightPt: titleH + headH,
    gapAfterPt: 0,
    ...(rows.length > 0 ? { keepWithNext: "always" as const } : {}),
    draw: (y) => {
      if (title) flow.textAt(title, flow.left, y, flow.width, { size: 9, bold: true });
      drawHead(y + titleH);
    },
  });
  const short = rows.length <= KEEP_ROWS;
  rows.forEach((r, k) => {
    const last = k === rows.length - 1;
    // A long table breaks between rows, but not after its first row or before its last.
    const keep = last ? (note ? "always" : undefined) : short ? (keepLines(k, rows.length) ?? "prefer") : keepLines(k, rows.length);
    flow.add({
      kind: "row",
      heightPt: rowHeight(flow, r, widths, CELL),
      gapAfterPt: 0,
      ...(keep ? { keepWithNext: keep } : {}),
      repeatHeightPt: headH,
      drawRepeat: drawHead,
      draw: (y) => drawRow(flow, y, r, widths, align, CELL, k % 2 === 1 ? "#f2f2f2" : null),
    });
  });
  flow.space(4);
  if (note) flow.paragraph(note, { size: 7.5 }, 0, 5, "table-note");
  flow.space(4);
}
