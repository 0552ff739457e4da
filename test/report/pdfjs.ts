/** A PDF read back with pdfjs-dist: the text of each page, each text item with its position, and the metadata title. */
import { getDocument } from "pdfjs-dist/legacy/build/pdf.mjs";

export interface PdfTextItem {
  str: string;
  /** Baseline position in PDF points, origin at the page's bottom left. */
  x: number;
  y: number;
}

export interface ReadPdf {
  /** Each page's text, items joined with one space. */
  pages: string[];
  items: PdfTextItem[][];
  /** First page's width and height in points. */
  size: number[];
  title: string | undefined;
}

export async function readPdf(buf: Uint8Array): Promise<ReadPdf> {
  const doc = await getDocument({ data: new Uint8Array(buf), isEvalSupported: false, disableFontFace: true, verbosity: 0 }).promise;
  const pages: string[] = [];
  const items: PdfTextItem[][] = [];
  for (let i = 1; i <= doc.numPages; i++) {
    const page = await doc.getPage(i);
    const content = await page.getTextContent();
    const list: PdfTextItem[] = [];
    for (const it of content.items) if ("str" in it) list.push({ str: it.str, x: it.transform[4] as number, y: it.transform[5] as number });
    items.push(list);
    pages.push(
      list
        .map((it) => it.str)
        .join(" ")
        .replace(/\s+/g, " "),
    );
  }
  const size = (await doc.getPage(1)).view.slice(2);
  const info = (await doc.getMetadata()).info as { Title?: string };
  await doc.destroy();
  return { pages, items, size, title: info.Title };
}
