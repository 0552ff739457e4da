/**
 * JSON text in ASCII: JSON.stringify's text with every character above U+007F written as a \uXXXX escape
 * (RFC 8259 §7), so it parses to the same value. Why: one non-ASCII character in a large answer (a "≥" in a note)
 * makes the whole text a two-byte string, and the socket then transcodes all of it to UTF-8; an ASCII text is written
 * as it is. Measured on the 25 KB sizing answer, the escaping costs less than the transcoding it saves.
 */
const NON_ASCII = /[\u0080-\uffff]/g;

function escapeChar(c: string): string {
  return `\\u${c.charCodeAt(0).toString(16).padStart(4, "0")}`;
}

/** JSON.stringify(value) in ASCII; a surrogate pair becomes two escapes, which JSON reads back as the one character. */
export function asciiJson(value: unknown): string {
  return JSON.stringify(value).replace(NON_ASCII, escapeChar);
}
