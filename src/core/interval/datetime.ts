/**
 * Allocation-free date-time parsing for interval rows, on the row's bytes (ASCII; see text-bytes.ts). A parse
 * writes the wall-clock time (as if UTC) and the offset found in the text into the parser object and returns an
 * error code (0 = ok). The string forms read the same way (for callers holding text).
 */

import { daysFromCivil, daysInMonth, fastIsoWallMs, MS_PER_DAY, MS_PER_MINUTE } from "./calendar.js";
import { unitBytes } from "./text-bytes.js";

export { daysFromCivil, isoWithOffset, monthIndexOfDays, monthLabel, MS_PER_DAY, MS_PER_HOUR, MS_PER_MINUTE } from "./calendar.js";

export type DateOrder = "mdy" | "dmy";

export const TS_OK = 0;
export const TS_SYNTAX = 1;
export const TS_RANGE = 2;
export const TS_AMBIGUOUS_ORDER = 3;
export const TS_REASONS: Record<number, string> = {
  [TS_SYNTAX]: "unrecognised date-time (use e.g. 2026-03-01 14:15, 2026-03-01T14:15:00Z or 03/01/2026 14:15)",
  [TS_RANGE]: "date or time out of range (month 1 to 12, day within the month, hour 0 to 23, minute and second 0 to 59)",
  [TS_AMBIGUOUS_ORDER]: "the first date part is above 12, so the dates are day-first: set dateOrder=dmy",
};

const C0 = 48;
const isDigit = (c: number) => c >= 48 && c <= 57;

export class TimestampParser {
  /** Wall-clock time of the last parse, ms, counted as if UTC. */
  wallMs = 0;
  /** Offset written in the text, ms east of UTC; NaN when the text carries none. */
  offsetMs = Number.NaN;
  /** Dates like 03/01/2026 read month-first because no dateOrder was given. */
  monthFirstByDefault = 0;
  private pos = 0;
  private nDigits = 0;
  private err = TS_OK;

  /** dateOrder: the option given, or null (then month-first, and a first part above 12 is an error). */
  constructor(private readonly dateOrder: DateOrder | null) {}

  /** A date with an optional time and offset in s[start, end). */
  parse(s: string, start: number, end: number): number {
    return this.parseBytes(unitBytes(s), start, end);
  }

  /** A date with an optional time and offset in s[dStart, dEnd) and a time of day in t[tStart, tEnd). */
  parseSplit(s: string, dStart: number, dEnd: number, t: string, tStart: number, tEnd: number): number {
    return this.parseSplitBytes(unitBytes(s), dStart, dEnd, unitBytes(t), tStart, tEnd);
  }

  /** A date with an optional time and offset in the bytes s[start, end). */
  parseBytes(s: Uint8Array, start: number, end: number): number {
    const fast = fastIsoWallMs(s, start, end);
    if (!Number.isNaN(fast)) {
      this.wallMs = fast;
      const len = end - start;
      this.offsetMs = len === 17 || len === 20 ? 0 : Number.NaN; // a trailing Z
      return TS_OK;
    }
    this.offsetMs = Number.NaN;
    const days = this.date(s, start, end);
    if (Number.isNaN(days)) return this.err;
    let timeMs = 0;
    if (this.pos < end) {
      const c = s[this.pos];
      if (c !== 84 && c !== 116 && c !== 32) return TS_SYNTAX; // 'T', 't' or space
      let q = this.pos + 1;
      while (q < end && s[q] === 32) q++;
      timeMs = this.time(s, q, end);
      if (Number.isNaN(timeMs)) return this.err;
    }
    this.wallMs = days * MS_PER_DAY + timeMs;
    return TS_OK;
  }

  /** A date in one column and a time of day in another (bytes). */
  parseSplitBytes(s: Uint8Array, dStart: number, dEnd: number, t: Uint8Array, tStart: number, tEnd: number): number {
    this.offsetMs = Number.NaN;
    const days = this.date(s, dStart, dEnd);
    if (Number.isNaN(days)) return this.err;
    if (this.pos !== dEnd) return TS_SYNTAX;
    const timeMs = this.time(t, tStart, tEnd);
    if (Number.isNaN(timeMs)) return this.err;
    this.wallMs = days * MS_PER_DAY + timeMs;
    return TS_OK;
  }

  private fail(code: number): number {
    this.err = code;
    return Number.NaN;
  }

  /** Up to `max` digits at this.pos; their value (−1 when none), their count in this.nDigits. */
  private digits(s: Uint8Array, end: number, max: number): number {
    let v = 0;
    let n = 0;
    while (this.pos < end && n < max) {
      const c = s[this.pos] as number;
      if (!isDigit(c)) break;
      v = v * 10 + c - C0;
      this.pos++;
      n++;
    }
    this.nDigits = n;
    return n === 0 ? -1 : v;
  }

  /** Days since the epoch (NaN on error); leaves this.pos after the date. */
  private date(s: Uint8Array, start: number, end: number): number {
    this.pos = start;
    const a = this.digits(s, end, 4);
    const aLen = this.nDigits;
    if (a < 0 || this.pos >= end) return this.fail(TS_SYNTAX);
    const sep = s[this.pos] as number;
    if (sep !== 45 && sep !== 47 && sep !== 46) return this.fail(TS_SYNTAX); // '-', '/', '.'
    this.pos++;
    const b = this.digits(s, end, 2);
    if (b < 0 || this.pos >= end || (s[this.pos] as number) !== sep) return this.fail(TS_SYNTAX);
    this.pos++;
    let year: number;
    let month: number;
    let day: number;
    if (aLen === 4) {
      day = this.digits(s, end, 2);
      if (day < 0) return this.fail(TS_SYNTAX);
      year = a;
      month = b;
    } else {
      year = this.digits(s, end, 4);
      if (this.nDigits !== 4) return this.fail(TS_SYNTAX);
      const dayFirst = sep === 46 || this.dateOrder === "dmy";
      if (!dayFirst && this.dateOrder === null && a > 12 && b <= 12) return this.fail(TS_AMBIGUOUS_ORDER);
      if (!dayFirst && this.dateOrder === null) this.monthFirstByDefault++;
      month = dayFirst ? b : a;
      day = dayFirst ? a : b;
    }
    if (month < 1 || month > 12 || day < 1 || day > daysInMonth(year, month)) return this.fail(TS_RANGE);
    return daysFromCivil(year, month, day);
  }

  /** Time of day in ms (24:00 allowed; NaN on error); reads an optional AM/PM and offset. */
  private time(s: Uint8Array, start: number, end: number): number {
    this.pos = start;
    let hour = this.digits(s, end, 2);
    if (hour < 0 || this.pos >= end || (s[this.pos] as number) !== 58) return this.fail(TS_SYNTAX);
    this.pos++;
    const minute = this.digits(s, end, 2);
    if (this.nDigits !== 2) return this.fail(TS_SYNTAX);
    let second = 0;
    let ms = 0;
    if (this.pos < end && (s[this.pos] as number) === 58) {
      this.pos++;
      second = this.digits(s, end, 2);
      if (this.nDigits !== 2) return this.fail(TS_SYNTAX);
      const c = this.pos < end ? (s[this.pos] as number) : 0;
      if (c === 46 || c === 44) {
        this.pos++;
        let scale = 100;
        const from = this.pos;
        while (this.pos < end && isDigit(s[this.pos] as number)) {
          ms += ((s[this.pos] as number) - C0) * scale;
          scale /= 10;
          this.pos++;
        }
        if (this.pos === from) return this.fail(TS_SYNTAX);
      }
    }
    this.spaces(s, end);
    if (this.pos + 1 < end && ((s[this.pos + 1] as number) | 32) === 109) {
      const ap = (s[this.pos] as number) | 32; // 'a' or 'p' before 'm'
      if (ap === 97 || ap === 112) {
        if (hour < 1 || hour > 12) return this.fail(TS_RANGE);
        hour = (hour % 12) + (ap === 112 ? 12 : 0);
        this.pos += 2;
        this.spaces(s, end);
      }
    }
    if (minute > 59 || second > 59 || hour > 24 || (hour === 24 && (minute > 0 || second > 0 || ms > 0))) {
      return this.fail(TS_RANGE);
    }
    if (this.pos < end && !this.offset(s, end)) return this.fail(TS_SYNTAX);
    this.spaces(s, end);
    if (this.pos !== end) return this.fail(TS_SYNTAX);
    return ((hour * 60 + minute) * 60 + second) * 1000 + Math.round(ms);
  }

  private spaces(s: Uint8Array, end: number): void {
    while (this.pos < end && (s[this.pos] as number) === 32) this.pos++;
  }

  /** "Z", "UTC", ±hh, ±hhmm or ±hh:mm; sets this.offsetMs. */
  private offset(s: Uint8Array, end: number): boolean {
    const c = s[this.pos] as number;
    if (c === 90 || c === 122) {
      this.pos++;
      this.offsetMs = 0;
      return true;
    }
    if (c === 85 && s[this.pos + 1] === 84 && s[this.pos + 2] === 67) {
      // "UTC"
      this.pos += 3;
      this.offsetMs = 0;
      return true;
    }
    if (c !== 43 && c !== 45) return false;
    this.pos++;
    const hh = this.digits(s, end, 2);
    if (this.nDigits !== 2) return false;
    if (this.pos < end && (s[this.pos] as number) === 58) this.pos++;
    let mm = 0;
    if (this.pos < end && isDigit(s[this.pos] as number)) {
      mm = this.digits(s, end, 2);
      if (this.nDigits !== 2) return false;
    }
    if (hh > 18 || mm > 59) return false;
    this.offsetMs = (c === 45 ? -1 : 1) * (hh * 60 + mm) * MS_PER_MINUTE;
    return true;
  }
}
