/**
 * Text for the PDF: characters the embedded font draws pass unchanged (Latin, Greek, Cyrillic, the report's
 * symbols φ √ ≤ ₁ …); tabs and carriage returns become spaces; anything the font lacks becomes "?", so a missing
 * glyph is seen rather than drawn as an empty box.
 */
import { fontCovers } from "./pdf-fonts.js";

/** Printable ASCII and newlines: the common case, which the font covers whole. */
const PLAIN = /^[\x20-\x7e\n]*$/;

export function pdfSafe(text: string): string {
  if (PLAIN.test(text)) return text;
  let out = "";
  for (const ch of text) {
    if (ch === "\n") out += ch;
    else if (ch === "\t" || ch === "\r") out += " ";
    else out += fontCovers(ch.codePointAt(0) as number) ? ch : "?";
  }
  return out;
}
