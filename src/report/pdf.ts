/**
 * The report model as a PDF (pdfkit, embedded DejaVu Sans): the same sections, grid tables, charts as vectors.
 * Blocks are measured into boxes, laid out on pages (headings kept with what follows), then drawn.
 */
import PDFDocument from "pdfkit";
import { block, type ChartCount } from "./pdf-blocks.js";
import { BOLD, FONT, registerFonts } from "./pdf-fonts.js";
import { Flow, type TextStyle } from "./pdf-flow.js";
import type { Frame, LayoutBox } from "./pdf-layout.js";
import { pdfSafe } from "./pdf-text.js";
import type { ReportModel } from "./types.js";

export interface PdfOptions {
  /** Paper; default A4. */
  size?: "A4" | "LETTER";
  /** Compress content streams (default true); tests turn it off to read the drawing operators. */
  compress?: boolean;
}

export interface PdfStats extends ChartCount {
  pages: number;
  /** The layout, page by page. */
  layout: PdfPageSummary[];
  /** Height of the text area of a page, in points. */
  bodyHeightPt: number;
  /** 1, or less when the gaps were tightened to avoid an almost empty last page. */
  gapScale: number;
}

const MARGIN = (15 / 25.4) * 72;

/** What a page holds, from the layout the PDF was drawn by: for tests and diagnostics. */
export interface PdfPageSummary {
  /** Box kinds in drawing order ("heading", "subheading", "row", "paragraph", …). */
  kinds: string[];
  /** Height used from the top of the text area, in points. */
  usedPt: number;
}

/** The framed title block: title, subtitle, the facts, the pointer to the cautions. One box. */
function titleBlock(flow: Flow, model: ReportModel): void {
  const ops: { dy: number; draw: (y: number) => void }[] = [];
  let h = 10;
  const text = (t: string, s: TextStyle, gapAfter: number) => {
    const w = flow.width - 10;
    const th = flow.height(t, w, s);
    ops.push({ dy: h, draw: (y) => flow.textAt(t, flow.left + 10, y, w, s) });
    h += th + gapAfter;
  };
  text(model.title, { size: 20, bold: true }, 2);
  text(model.subtitle, { size: 12 }, 8);
  const kw = 110;
  const vw = flow.width - kw - 30;
  for (const f of model.facts) {
    const fh = Math.max(flow.height(f.key, kw, { size: 10, bold: true }), flow.height(f.value, vw, { size: 10 }));
    ops.push({
      dy: h,
      draw: (y) => {
        flow.textAt(f.key, flow.left + 10, y, kw, { size: 10, bold: true });
        flow.textAt(f.value, flow.left + 10 + kw, y, vw, { size: 10 });
      },
    });
    h += fh + 2;
  }
  const ci = model.sections.findIndex((s) => s.id === "cautions");
  if (ci >= 0) {
    h += 6;
    text(`Safety: read section ${ci + 1}, "${model.sections[ci]?.heading}", before any work on the bank.`, { size: 10, bold: true }, 4);
  }
  h += 6;
  flow.add({
    kind: "title",
    heightPt: h,
    gapAfterPt: 14,
    draw: (y) => {
      for (const op of ops) op.draw(y + op.dy);
      flow.doc.rect(flow.left, y, flow.width, h).lineWidth(2.5).undash().strokeColor("#000000").stroke();
    },
  });
}

/** A section's black heading bar: kept with the section's first block. */
function sectionHeading(flow: Flow, text: string, pageBreakBefore = false): void {
  flow.add({
    kind: "heading",
    heightPt: 20,
    gapAfterPt: 8,
    keepWithNext: "always",
    ...(pageBreakBefore ? { pageBreakBefore } : {}),
    draw: (y) => {
      flow.doc.rect(flow.left, y, flow.width, 20).fill("#000000");
      flow.doc
        .font(BOLD)
        .fontSize(12.5)
        .fillColor("#ffffff")
        .text(pdfSafe(text), flow.left + 7, y + 5, { lineBreak: false });
    },
  });
}

/** `text` cut with an ellipsis to fit `widthPt` in the current font. */
function fitted(doc: PDFKit.PDFDocument, text: string, widthPt: number): string {
  if (doc.widthOfString(text) <= widthPt) return text;
  const chars = [...text];
  while (chars.length > 0 && doc.widthOfString(`${chars.join("")}…`) > widthPt) chars.pop();
  return `${chars.join("")}…`;
}

function footers(doc: PDFKit.PDFDocument, model: ReportModel): number {
  const range = doc.bufferedPageRange();
  for (let i = range.start; i < range.start + range.count; i++) {
    doc.switchToPage(i);
    const bottom = doc.page.margins.bottom;
    doc.page.margins.bottom = 0;
    const y = doc.page.height - bottom - 10;
    const left = doc.page.margins.left;
    const right = doc.page.width - doc.page.margins.right;
    doc.font(FONT).fontSize(7.5).fillColor("#000000");
    const pn = `page ${i + 1} of ${range.count}`;
    const pnW = doc.widthOfString(pn);
    doc.text(fitted(doc, pdfSafe(`${model.title} — ${model.subtitle}`), right - left - pnW - 12), left, y, { lineBreak: false });
    doc.text(pn, right - pnW, y, { lineBreak: false });
    doc.page.margins.bottom = bottom;
  }
  return range.count;
}

function newDocument(model: ReportModel, options: PdfOptions): PDFKit.PDFDocument {
  const doc = new PDFDocument({
    size: options.size ?? "A4",
    margin: MARGIN,
    compress: options.compress ?? true,
    bufferPages: true,
    // PDF text strings: pdfkit writes non-ASCII metadata as UTF-16, so the title keeps any script.
    info: { Title: `${model.title}: ${model.subtitle}`, Creator: "pfc-sizing report", Subject: "Power-factor correction sizing" },
  });
  registerFonts(doc);
  return doc;
}

/** The model measured into boxes on `doc` (nothing drawn yet). */
function compose(doc: PDFKit.PDFDocument, model: ReportModel, count: ChartCount): Flow {
  const flow = new Flow(doc);
  titleBlock(flow, model);
  // Page 1: the verdict and the contents; the numbered detail starts on a new page.
  sectionHeading(flow, model.verdict.heading);
  for (const b of model.verdict.blocks) block(flow, b, count);
  flow.space(10);
  block(flow, { kind: "subheading", text: "Contents" }, count);
  block(flow, { kind: "list", items: model.sections.map((s, i) => `${i + 1}. ${s.heading}`) }, count);
  model.sections.forEach((s, i) => {
    sectionHeading(flow, `${i + 1}. ${s.heading}`, i === 0);
    for (const b of s.blocks) block(flow, b, count);
    flow.space(10);
  });
  return flow;
}

/** The measured boxes and the page frame, without drawing: what the layout rules work on. */
export function measureReportPdf(model: ReportModel, options: PdfOptions = {}): { boxes: LayoutBox[]; frame: Frame } {
  const flow = compose(newDocument(model, options), model, { charts: 0, chartPrimitives: 0 });
  return { boxes: flow.boxes, frame: { topPt: flow.top, bottomPt: flow.bottom } };
}

export function renderReportPdfWithStats(model: ReportModel, options: PdfOptions = {}): Promise<{ pdf: Buffer; stats: PdfStats }> {
  const doc = newDocument(model, options);
  const chunks: Buffer[] = [];
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on("data", (c: Buffer) => chunks.push(c));
    doc.on("end", () => resolve(Buffer.concat(chunks)));
    doc.on("error", reject);
  });
  const count: ChartCount = { charts: 0, chartPrimitives: 0 };
  const flow = compose(doc, model, count);
  const { pages, gapScale } = flow.finish();
  const layout = pages.map((p) => ({ kinds: p.placements.map((pl) => flow.boxes[pl.box]?.kind ?? "?"), usedPt: p.usedPt }));
  const stats: PdfStats = { ...count, pages: footers(doc, model), layout, bodyHeightPt: flow.bodyHeight, gapScale };
  doc.end();
  return done.then((pdf) => ({ pdf, stats }));
}

export async function renderReportPdf(model: ReportModel, options: PdfOptions = {}): Promise<Buffer> {
  return (await renderReportPdfWithStats(model, options)).pdf;
}
