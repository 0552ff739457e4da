/**
 * The parser reads bytes (the upload as it arrives, UTF-8), not decoded text: every character it interprets is
 * ASCII, and in UTF-8 an ASCII byte never occurs inside a multi-byte character, so delimiters, digits and quotes
 * are found in the bytes directly and no string is made per line. Text is decoded only where a person reads it
 * (header names, the value of a bad cell).
 */

/** UTF-8 → text; a byte-order mark is kept as U+FEFF (the parser decides where one is dropped). */
const utf8 = new TextDecoder("utf-8", { ignoreBOM: true });

export function utf8Text(b: Uint8Array, start: number, end: number): string {
  return utf8.decode(b.subarray(start, end));
}

/** True when b[start, end) holds only ASCII bytes. */
export function isAsciiRange(b: Uint8Array, start: number, end: number): boolean {
  for (let i = start; i < end; i++) if ((b[i] as number) > 0x7f) return false;
  return true;
}

/** Length in UTF-16 code units of the UTF-8 text in b[start, end) (a trailing incomplete character not counted). */
export function utf16Length(b: Uint8Array, start: number, end: number): number {
  if (isAsciiRange(b, start, end)) return end - start;
  return new TextDecoder("utf-8", { ignoreBOM: true }).decode(b.subarray(start, end), { stream: true }).length;
}

/**
 * A string as one byte per UTF-16 code unit: ASCII kept, anything else 0xFF (a byte no reader accepts), so the
 * string's indexes stay valid on the bytes. For the string forms of the byte readers.
 */
export function unitBytes(s: string): Uint8Array {
  const b = new Uint8Array(s.length);
  for (let i = 0; i < s.length; i++) {
    const c = s.charCodeAt(i);
    b[i] = c < 0x80 ? c : 0xff;
  }
  return b;
}

/** One character per byte (ASCII text, for the rare paths that need a string). */
export function byteText(b: Uint8Array, start: number, end: number): string {
  let s = "";
  for (let i = start; i < end; i++) s += String.fromCharCode(b[i] as number);
  return s;
}
