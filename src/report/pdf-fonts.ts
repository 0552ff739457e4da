/**
 * The PDF's typeface: DejaVu Sans, regular and bold, from the dejavu-fonts-ttf package (Bitstream Vera licence,
 * DejaVu changes in the public domain). It covers Latin, Latin Extended, Greek and Cyrillic, so a site or a
 * surveyor's name prints as typed. pdfkit embeds only the glyphs a document uses (a subset), with a ToUnicode map,
 * so the text can still be searched and copied.
 */
import { readFileSync } from "node:fs";
import { createRequire } from "node:module";
import { create, type Font } from "fontkit";

/** Names the fonts are registered under in each document. */
export const FONT = "Body";
export const BOLD = "Body-Bold";

/** Package paths, resolved at run time so the compiled build reads the same files from node_modules. */
const FILES = {
  [FONT]: "dejavu-fonts-ttf/ttf/DejaVuSans.ttf",
  [BOLD]: "dejavu-fonts-ttf/ttf/DejaVuSans-Bold.ttf",
} as const;

interface Loaded {
  fonts: Record<keyof typeof FILES, Font>;
  /** Code points both weights draw: text in either weight may use them. */
  covered: Set<number>;
}

let loaded: Loaded | undefined;

/**
 * Parse both files once per process. Documents share the parsed fonts (pdfkit takes a fontkit font as a source
 * and makes its own subset per document), so glyphs decoded for one report serve the next.
 */
function load(): Loaded {
  if (loaded) return loaded;
  const require = createRequire(import.meta.url);
  const regular = create(readFileSync(require.resolve(FILES[FONT])));
  const bold = create(readFileSync(require.resolve(FILES[BOLD])));
  const covered = new Set(regular.characterSet.filter((cp) => bold.hasGlyphForCodePoint(cp)));
  loaded = { fonts: { [FONT]: regular, [BOLD]: bold }, covered };
  return loaded;
}

/** Make FONT and BOLD usable in `doc` (call before any text is measured). */
export function registerFonts(doc: PDFKit.PDFDocument): void {
  const { fonts } = load();
  // The typings list paths and buffers only; pdfkit's font factory also accepts a fontkit font (it has `layout`).
  doc.registerFont(FONT, fonts[FONT] as unknown as Buffer);
  doc.registerFont(BOLD, fonts[BOLD] as unknown as Buffer);
  doc.font(FONT);
}

/** Whether both weights have a glyph for this code point. */
export function fontCovers(codePoint: number): boolean {
  return load().covered.has(codePoint);
}
