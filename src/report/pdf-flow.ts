/**
 * A top-to-bottom flow on pdfkit pages, in two steps: blocks are measured into boxes (each with its drawing),
 * then `pdf-layout` decides the pages and `finish` draws every box where the layout put it.
 */
import { arrange, type Keep, type LayoutBox, type Page } from "./pdf-layout.js";
import { BOLD, FONT } from "./pdf-fonts.js";
import { pdfSafe } from "./pdf-text.js";

export type Doc = PDFKit.PDFDocument;

export interface TextStyle {
  size: number;
  bold?: boolean;
  color?: string;
}

export interface DrawBox extends LayoutBox {
  /** Draw the box with its top at y. */
  draw(yPt: number): void;
  /** Draw the header repeated above the box when a page starts with it (height `repeatHeightPt`). */
  drawRepeat?(yPt: number): void;
}

/** Keep for line `i` of `n` drawn one by one: the first two and the last two lines stay together (n > 1). */
export function keepLines(i: number, n: number): Keep | undefined {
  return n > 1 && (i === 0 || i === n - 2) ? "always" : undefined;
}

export class Flow {
  readonly left: number;
  readonly right: number;
  readonly top: number;
  readonly bottom: number;
  readonly boxes: DrawBox[] = [];

  constructor(readonly doc: Doc) {
    const p = doc.page;
    this.left = p.margins.left;
    this.right = p.width - p.margins.right;
    this.top = p.margins.top;
    // Leave room for the running footer drawn after the flow.
    this.bottom = p.height - p.margins.bottom - 14;
  }

  get width(): number {
    return this.right - this.left;
  }

  get bodyHeight(): number {
    return this.bottom - this.top;
  }

  add(box: DrawBox): void {
    this.boxes.push(box);
  }

  /** More space after the last box so far (a section's end). */
  space(pt: number): void {
    const last = this.boxes[this.boxes.length - 1];
    if (last) last.gapAfterPt += pt;
  }

  style(s: TextStyle): void {
    this.doc
      .font(s.bold ? BOLD : FONT)
      .fontSize(s.size)
      .fillColor(s.color ?? "#000000");
  }

  height(text: string, width: number, s: TextStyle): number {
    this.style(s);
    return this.doc.heightOfString(pdfSafe(text), { width, lineGap: 1 });
  }

  /** Write wrapped text at (x, y). */
  textAt(text: string, x: number, y: number, width: number, s: TextStyle, align: "left" | "right" = "left"): void {
    this.style(s);
    this.doc.text(pdfSafe(text), x, y, { width, align, lineGap: 1 });
  }

  /**
   * `text` wrapped to `width`: one piece when it takes at most `maxPt`, else one piece per line, broken here (at
   * spaces, or inside a word wider than the line) so each can go to its own page and pdfkit does not wrap it again.
   */
  pieces(text: string, width: number, s: TextStyle, maxPt: number): { text: string; heightPt: number }[] {
    const whole = this.height(text, width, s);
    if (whole <= maxPt) return [{ text, heightPt: whole }];
    const lineH = this.height("X", width, s);
    return this.wrap(text, width, s).map((line) => ({ text: line, heightPt: lineH }));
  }

  /** Greedy line breaking at spaces with the current font's widths; a word wider than the line is cut. */
  wrap(text: string, width: number, s: TextStyle): string[] {
    this.style(s);
    const fits = (t: string) => this.doc.widthOfString(t) <= width - 0.5;
    const lines: string[] = [];
    for (const para of pdfSafe(text).split("\n")) {
      let line = "";
      for (const word of para.split(/ +/)) {
        const next = line ? `${line} ${word}` : word;
        if (fits(next)) {
          line = next;
          continue;
        }
        if (line) lines.push(line);
        line = word;
        while (!fits(line) && line.length > 1) {
          let cut = line.length - 1;
          while (cut > 1 && !fits(line.slice(0, cut))) cut--;
          lines.push(line.slice(0, cut));
          line = line.slice(cut);
        }
      }
      lines.push(line);
    }
    return lines;
  }

  /**
   * A paragraph as one box, or line by line when it is taller than a third of the page (long notes): then its
   * first two and last two lines stay together, so no line is left alone at a page's foot or head.
   */
  paragraph(text: string, s: TextStyle, indent = 0, gapAfter = 5, kind = "paragraph", keep?: Keep): void {
    const w = this.width - indent;
    const parts = this.pieces(text, w, s, this.bodyHeight / 3);
    parts.forEach((part, i) => {
      const last = i === parts.length - 1;
      const k = last ? keep : keepLines(i, parts.length);
      this.add({
        kind,
        heightPt: part.heightPt,
        gapAfterPt: last ? gapAfter : 0,
        ...(k ? { keepWithNext: k } : {}),
        draw: (y) => this.textAt(part.text, this.left + indent, y, w, s),
      });
    });
  }

  /** Lay the boxes out, draw them page by page, and return the layout. */
  finish(): { pages: Page[]; gapScale: number } {
    const layout = arrange(this.boxes, { topPt: this.top, bottomPt: this.bottom });
    layout.pages.forEach((page, n) => {
      if (n > 0) this.doc.addPage();
      for (const p of page.placements) {
        const box = this.boxes[p.box] as DrawBox;
        let y = p.yPt;
        if (p.withRepeat && box.drawRepeat) {
          box.drawRepeat(y);
          y += box.repeatHeightPt ?? 0;
        }
        box.draw(y);
      }
    });
    return layout;
  }
}
