/** A top-to-bottom text flow on pdfkit pages: a cursor, page breaks, and measured text. */
import { pdfSafe } from "./pdf-text.js";

export type Doc = PDFKit.PDFDocument;

export const FONT = "Helvetica";
export const BOLD = "Helvetica-Bold";

export interface TextStyle {
  size: number;
  bold?: boolean;
  color?: string;
}

export class Flow {
  y: number;
  readonly left: number;
  readonly right: number;
  readonly top: number;
  readonly bottom: number;

  constructor(readonly doc: Doc) {
    const p = doc.page;
    this.left = p.margins.left;
    this.right = p.width - p.margins.right;
    this.top = p.margins.top;
    // Leave room for the running footer drawn after the flow.
    this.bottom = p.height - p.margins.bottom - 14;
    this.y = this.top;
  }

  get width(): number {
    return this.right - this.left;
  }

  newPage(): void {
    this.doc.addPage();
    this.y = this.top;
  }

  /** Start a new page unless `height` still fits below the cursor. */
  ensure(height: number): void {
    if (this.y + height > this.bottom && this.y > this.top + 1) this.newPage();
  }

  style(s: TextStyle): void {
    this.doc.font(s.bold ? BOLD : FONT).fontSize(s.size).fillColor(s.color ?? "#000000");
  }

  height(text: string, width: number, s: TextStyle): number {
    this.style(s);
    return this.doc.heightOfString(pdfSafe(text), { width, lineGap: 1 });
  }

  /** Write wrapped text at (x, y) without moving the flow's cursor. */
  textAt(text: string, x: number, y: number, width: number, s: TextStyle, align: "left" | "right" = "left"): void {
    this.style(s);
    this.doc.text(pdfSafe(text), x, y, { width, align, lineGap: 1 });
  }

  /** A paragraph at the cursor, breaking the page first when it does not fit. */
  paragraph(text: string, s: TextStyle, indent = 0, gapAfter = 5): void {
    const w = this.width - indent;
    const h = this.height(text, w, s);
    this.ensure(h);
    this.textAt(text, this.left + indent, this.y, w, s);
    this.y += h + gapAfter;
  }
}
