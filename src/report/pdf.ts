/** The report model as a PDF (pdfkit, built-in Helvetica): the same sections, grid tables, charts as vectors. */
import PDFDocument from "pdfkit";
import { drawChart } from "./pdf-chart.js";
import { BOLD, Flow, FONT } from "./pdf-flow.js";
import { drawTable } from "./pdf-table.js";
import { pdfSafe } from "./pdf-text.js";
import type { Block, ReportModel } from "./types.js";

export interface PdfOptions {
  /** Paper; default A4. */
  size?: "A4" | "LETTER";
  /** Compress content streams (default true); tests turn it off to read the drawing operators. */
  compress?: boolean;
}

export interface PdfStats {
  pages: number;
  charts: number;
  /** Vector shapes drawn for charts (lines, polylines, rectangles, text). */
  chartPrimitives: number;
}

const MARGIN = (15 / 25.4) * 72;
const BODY = { size: 9.5 };

function keyValues(flow: Flow, items: { key: string; value: string }[], title?: string): void {
  if (title) {
    flow.ensure(40);
    flow.paragraph(title, { size: 10, bold: true }, 0, 3);
  }
  const kw = flow.width * 0.38;
  const vw = flow.width - kw - 8;
  for (const it of items) {
    const h = Math.max(flow.height(it.key, kw, { size: 9, bold: true }), flow.height(it.value, vw, { size: 9 })) + 4;
    flow.ensure(h);
    flow.textAt(it.key, flow.left, flow.y + 2, kw, { size: 9, bold: true });
    flow.textAt(it.value, flow.left + kw + 8, flow.y + 2, vw, { size: 9 });
    flow.y += h;
    flow.doc.moveTo(flow.left, flow.y).lineTo(flow.right, flow.y).lineWidth(0.4).undash().strokeColor("#888888").stroke();
  }
  flow.y += 6;
}

function callout(flow: Flow, title: string, text: string, reference?: string): void {
  const inner = flow.width - 22;
  const t = `CAUTION: ${title}`;
  const ref = reference ? `Reference: ${reference}` : "";
  const h = flow.height(t, inner, { size: 10, bold: true }) + 3 + flow.height(text, inner, BODY) + (ref ? flow.height(ref, inner, { size: 8 }) + 2 : 0) + 12;
  flow.ensure(h + 4);
  const doc = flow.doc;
  doc.rect(flow.left, flow.y, flow.width, h).lineWidth(1.5).undash().strokeColor("#000000").stroke();
  doc.rect(flow.left, flow.y, 7, h).fill("#000000");
  let y = flow.y + 6;
  flow.textAt(t, flow.left + 16, y, inner, { size: 10, bold: true });
  y += flow.height(t, inner, { size: 10, bold: true }) + 3;
  flow.textAt(text, flow.left + 16, y, inner, BODY);
  y += flow.height(text, inner, BODY) + 2;
  if (ref) flow.textAt(ref, flow.left + 16, y, inner, { size: 8 });
  flow.y += h + 6;
}

function block(flow: Flow, b: Block, stats: PdfStats): void {
  switch (b.kind) {
    case "paragraph": {
      if (b.tone === "alert") {
        const h = flow.height(b.text, flow.width - 12, { size: 9.5, bold: true }) + 10;
        flow.ensure(h);
        flow.doc.rect(flow.left, flow.y, flow.width, h).lineWidth(1.5).undash().strokeColor("#000000").stroke();
        flow.textAt(b.text, flow.left + 6, flow.y + 5, flow.width - 12, { size: 9.5, bold: true });
        flow.y += h + 6;
      } else if (b.tone === "note") {
        const h = flow.height(b.text, flow.width - 10, { size: 9 });
        flow.ensure(h);
        flow.doc.rect(flow.left, flow.y, 3, h).fill("#555555");
        flow.paragraph(b.text, { size: 9 }, 10, 6);
      } else flow.paragraph(b.text, BODY, 0, 6);
      return;
    }
    case "subheading": {
      flow.ensure(60);
      flow.y += 4;
      flow.paragraph(b.text, { size: 11.5, bold: true }, 0, 1);
      flow.doc.moveTo(flow.left, flow.y).lineTo(flow.right, flow.y).lineWidth(1.2).undash().strokeColor("#000000").stroke();
      flow.y += 5;
      return;
    }
    case "keyValues":
      return keyValues(flow, b.items, b.title);
    case "table":
      return drawTable(flow, b.title, b.header, b.rows, b.align, b.note);
    case "list":
      for (const item of b.items) {
        const h = flow.height(item, flow.width - 12, { size: 9 });
        flow.ensure(h);
        flow.textAt("•", flow.left + 2, flow.y, 8, { size: 9 });
        flow.paragraph(item, { size: 9 }, 12, 2);
      }
      flow.y += 4;
      return;
    case "callout":
      return callout(flow, b.title, b.text, b.reference);
    case "chart": {
      const w = flow.width;
      const h = (b.chart.height * w) / b.chart.width;
      const caption = b.chart.description;
      const ch = flow.height(caption, w, { size: 8 });
      flow.ensure(h + ch + 8);
      stats.chartPrimitives += drawChart(flow.doc, b.chart, flow.left, flow.y, w);
      stats.charts++;
      flow.y += h + 3;
      flow.paragraph(caption, { size: 8 }, 0, 10);
      return;
    }
  }
}

function titleBlock(flow: Flow, model: ReportModel): void {
  const doc = flow.doc;
  const top = flow.y;
  flow.y += 10;
  flow.paragraph(model.title, { size: 20, bold: true }, 10, 2);
  flow.paragraph(model.subtitle, { size: 12 }, 10, 8);
  const kw = 110;
  for (const f of model.facts) {
    const h = flow.height(f.value, flow.width - kw - 30, { size: 10 });
    flow.textAt(f.key, flow.left + 10, flow.y, kw, { size: 10, bold: true });
    flow.textAt(f.value, flow.left + 10 + kw, flow.y, flow.width - kw - 30, { size: 10 });
    flow.y += h + 2;
  }
  const ci = model.sections.findIndex((s) => s.id === "cautions");
  if (ci >= 0) {
    flow.y += 6;
    flow.paragraph(`Safety: read section ${ci + 1}, "${model.sections[ci]?.heading}", before any work on the bank.`, { size: 10, bold: true }, 10, 4);
  }
  flow.y += 6;
  doc.rect(flow.left, top, flow.width, flow.y - top).lineWidth(2.5).undash().strokeColor("#000000").stroke();
  flow.y += 14;
}

/** Page 1 after the title block: the verdict, then the contents; the detail starts on a new page. */
function verdictPage(flow: Flow, model: ReportModel, stats: PdfStats): void {
  const doc = flow.doc;
  const top = flow.y;
  flow.y += 6;
  doc.font(BOLD).fontSize(14).fillColor("#000000").text(pdfSafe(model.verdict.heading), flow.left + 10, flow.y, { lineBreak: false });
  flow.y += 22;
  for (const b of model.verdict.blocks) block(flow, b, stats);
  doc.rect(flow.left, top, flow.width, flow.y - top + 4).lineWidth(2.5).undash().strokeColor("#000000").stroke();
  flow.y += 16;
  block(flow, { kind: "subheading", text: "Contents" }, stats);
  block(flow, { kind: "list", items: model.sections.map((s, i) => `${i + 1}. ${s.heading}`) }, stats);
  doc.addPage();
  flow.y = doc.page.margins.top;
}

function footers(doc: PDFKit.PDFDocument, model: ReportModel): number {
  const range = doc.bufferedPageRange();
  for (let i = range.start; i < range.start + range.count; i++) {
    doc.switchToPage(i);
    const bottom = doc.page.margins.bottom;
    doc.page.margins.bottom = 0;
    const y = doc.page.height - bottom - 10;
    doc.font(FONT).fontSize(7.5).fillColor("#000000");
    doc.text(pdfSafe(`${model.title} — ${model.subtitle}`), doc.page.margins.left, y, { lineBreak: false });
    const pn = `page ${i + 1} of ${range.count}`;
    doc.text(pn, doc.page.width - doc.page.margins.right - doc.widthOfString(pn), y, { lineBreak: false });
    doc.page.margins.bottom = bottom;
  }
  return range.count;
}

export function renderReportPdfWithStats(model: ReportModel, options: PdfOptions = {}): Promise<{ pdf: Buffer; stats: PdfStats }> {
  const doc = new PDFDocument({
    size: options.size ?? "A4",
    margin: MARGIN,
    compress: options.compress ?? true,
    bufferPages: true,
    info: { Title: pdfSafe(`${model.title}: ${model.subtitle}`), Creator: "pfc-sizing report", Subject: "Power-factor correction sizing" },
  });
  const chunks: Buffer[] = [];
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on("data", (c: Buffer) => chunks.push(c));
    doc.on("end", () => resolve(Buffer.concat(chunks)));
    doc.on("error", reject);
  });
  const stats: PdfStats = { pages: 0, charts: 0, chartPrimitives: 0 };
  const flow = new Flow(doc);
  titleBlock(flow, model);
  verdictPage(flow, model, stats);
  model.sections.forEach((s, i) => {
    flow.ensure(90);
    const h = 20;
    doc.rect(flow.left, flow.y, flow.width, h).fill("#000000");
    doc.font(BOLD).fontSize(12.5).fillColor("#ffffff").text(pdfSafe(`${i + 1}. ${s.heading}`), flow.left + 7, flow.y + 5, { lineBreak: false });
    flow.y += h + 8;
    for (const b of s.blocks) block(flow, b, stats);
    flow.y += 10;
  });
  stats.pages = footers(doc, model);
  doc.end();
  return done.then((pdf) => ({ pdf, stats }));
}

export async function renderReportPdf(model: ReportModel, options: PdfOptions = {}): Promise<Buffer> {
  return (await renderReportPdfWithStats(model, options)).pdf;
}
