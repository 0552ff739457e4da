import { byteText, unitBytes } from "./text-bytes.js";

/**
 * Decimal numbers from a slice of a row's bytes, without allocating: digits with an optional sign and one decimal
 * separator. Up to 15 significant digits the result is exact (integer mantissa ÷ a power of ten, both exact
 * doubles: one correctly rounded division — Clinger's fast path); anything longer, or with an exponent, falls
 * back to Number().
 */
const POW10 = [1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22];
/** POW10 up to 1e15 in a typed array (an unboxed load in the plain-decimal loop). */
const POW10_PLAIN = Float64Array.from(POW10.slice(0, 16));

/** The number in s[start, end) (spaces trimmed), or NaN. `decimalComma` accepts "1,5" for 1.5. */
export function parseDecimal(s: string, start: number, end: number, decimalComma: boolean): number {
  return parseDecimalBytes(unitBytes(s), start, end, decimalComma);
}

/** The number in the bytes b[start, end) (spaces trimmed), or NaN; as parseDecimal. */
export function parseDecimalBytes(b: Uint8Array, start: number, end: number, decimalComma: boolean): number {
  while (start < end && b[start] === 32) start++;
  while (end > start && b[end - 1] === 32) end--;
  const plain = plainDecimal(b, start, end, decimalComma);
  return plain === plain ? plain : general(b, start, end, decimalComma);
}

/**
 * The common case only — [sign] digits [separator digits], at most 15 digits in all, at least one — in two tight
 * digit loops; NaN for anything else, which the general reader then reads (or refuses) as before. Same value as
 * the general reader's: the same mantissa divided by the same power of ten.
 */
function plainDecimal(b: Uint8Array, start: number, end: number, decimalComma: boolean): number {
  let i = start;
  const first = b[i];
  const negative = first === 45;
  if (negative || first === 43) i++;
  const intStart = i;
  let mantissa = 0;
  let d = 0;
  while (i < end && (d = (b[i] as number) - 48) >>> 0 <= 9) {
    mantissa = mantissa * 10 + d;
    i++;
  }
  const intDigits = i - intStart;
  let fraction = 0;
  if (i < end) {
    const c = b[i];
    if (c !== 46 && !(decimalComma && c === 44)) return Number.NaN;
    const from = ++i;
    while (i < end && (d = (b[i] as number) - 48) >>> 0 <= 9) {
      mantissa = mantissa * 10 + d;
      i++;
    }
    if (i < end) return Number.NaN;
    fraction = i - from;
  }
  if (intDigits + fraction === 0 || intDigits + fraction > 15) return Number.NaN;
  const value = fraction > 0 ? mantissa / (POW10_PLAIN[fraction] as number) : mantissa;
  return negative ? -value : value;
}

/** Any decimal (trimmed): the fast path up to 15 significant digits, else Number(). */
function general(b: Uint8Array, start: number, end: number, decimalComma: boolean): number {
  if (start === end) return Number.NaN;
  let i = start;
  let negative = false;
  const first = b[i] as number;
  if (first === 45 || first === 43) {
    negative = first === 45;
    i++;
  }
  let mantissa = 0;
  let digits = 0;
  let fraction = -1;
  for (; i < end; i++) {
    const c = b[i] as number;
    if (c >= 48 && c <= 57) {
      if (mantissa !== 0 || c !== 48) digits++;
      mantissa = mantissa * 10 + (c - 48);
      if (fraction >= 0) fraction++;
    } else if ((c === 46 || (decimalComma && c === 44)) && fraction < 0) {
      fraction = 0;
    } else {
      return slow(b, start, end, decimalComma);
    }
  }
  const intDigits = i - start - (negative || first === 43 ? 1 : 0) - (fraction >= 0 ? fraction + 1 : 0);
  if (intDigits === 0 && fraction <= 0) return Number.NaN; // "", ".", "-"
  if (digits > 15 || fraction > 22) return slow(b, start, end, decimalComma);
  const value = fraction > 0 ? mantissa / (POW10[fraction] as number) : mantissa;
  return negative ? -value : value;
}

function slow(b: Uint8Array, start: number, end: number, decimalComma: boolean): number {
  let text = byteText(b, start, end); // a byte above 0x7f becomes a character the pattern refuses
  if (decimalComma) text = text.replace(",", ".");
  if (!/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(text)) return Number.NaN;
  const value = Number(text);
  return Number.isFinite(value) ? value : Number.NaN; // "1e999" is not a reading
}
