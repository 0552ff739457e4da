import type { ColumnMapping, Delimiter } from "./columns.js";
import { TimestampParser, TS_REASONS, type DateOrder } from "./datetime.js";
import { parseDecimalBytes } from "./numbers.js";
import type { Zone } from "./zone.js";

export type SenseOption = "lagging" | "leading";

/** Largest |kW|, |kvar| or |kVA| read, 1 TW: anything larger is a unit or export error (plausibility bound, no source). */
export const MAX_ABS_POWER = 1e9;

/** Beyond this share above the kVA a kW reading is an error, not rounding (common practice, no source). */
export const KW_ABOVE_KVA_TOLERANCE = 0.01;

export interface RowDecoderOptions {
  delimiter: Delimiter;
  dateOrder: DateOrder | null;
  /** Zone for timestamps written without an offset. */
  zone: Zone;
  /** Sense of PF / kVA rows without a sense column; null: PF signed (negative = leading), kVA lagging. */
  sense: SenseOption | null;
}

/**
 * Decodes one data row in place from its bytes (UTF-8; every character read is ASCII, see text-bytes.ts): splits
 * it at the delimiter (double-quoted fields allowed), reads the timestamp and the powers, and leaves either the
 * values (utcMs, kW, kvar) or an error (errColumn, errReason, and the cell's byte range errStart–errEnd) on the
 * object.
 */
export class RowDecoder {
  utcMs = 0;
  kW = 0;
  kvar = 0;
  hadOffset = false;
  /** Offset written in the timestamp, ms (NaN when none). */
  offsetMs = Number.NaN;
  errColumn = -1;
  errReason = "";
  errStart = 0;
  errEnd = 0;
  fieldCount = 0;
  private numberError = "";
  private readonly starts: Int32Array;
  private readonly ends: Int32Array;
  readonly ts: TimestampParser;
  private readonly delim: number;
  private readonly decimalComma: boolean;

  constructor(
    private readonly map: ColumnMapping,
    private readonly columnCount: number,
    private readonly opts: RowDecoderOptions,
  ) {
    this.starts = new Int32Array(columnCount);
    this.ends = new Int32Array(columnCount);
    this.ts = new TimestampParser(opts.dateOrder);
    this.delim = opts.delimiter.charCodeAt(0);
    this.decimalComma = opts.delimiter !== ",";
  }

  private fail(column: number, reason: string): false {
    this.errColumn = column;
    this.errReason = reason;
    if (column >= 0) {
      this.errStart = this.starts[column] as number;
      this.errEnd = this.ends[column] as number;
    }
    return false;
  }

  /** Split s[start, end) into fields; false on an unterminated quote. */
  private split(s: Uint8Array, start: number, end: number): boolean {
    const delim = this.delim;
    let pos = start;
    let f = 0;
    for (;;) {
      let fs = pos;
      let fe: number;
      if (pos < end && s[pos] === 34) {
        let q = pos + 1;
        for (;;) {
          let k = q;
          while (k < end && s[k] !== 34) k++;
          if (k >= end) return false;
          if (k + 1 < end && s[k + 1] === 34) q = k + 2;
          else {
            fs = pos + 1;
            fe = k;
            break;
          }
        }
        pos = fe + 1; // anything between the closing quote and the delimiter is dropped
        while (pos < end && s[pos] !== delim) pos++;
      } else {
        while (pos < end && s[pos] !== delim) pos++;
        fe = pos;
      }
      while (fs < fe && s[fs] === 32) fs++;
      while (fe > fs && s[fe - 1] === 32) fe--;
      if (f < this.columnCount) {
        this.starts[f] = fs;
        this.ends[f] = fe;
      }
      f++;
      if (pos >= end) break;
      pos++;
    }
    this.fieldCount = f;
    return true;
  }

  /** The number in a column; NaN (with the reason in numberError) when unreadable or implausibly large. */
  private number(s: Uint8Array, column: number): number {
    const v = parseDecimalBytes(s, this.starts[column] as number, this.ends[column] as number, this.decimalComma);
    if (v <= MAX_ABS_POWER && v >= -MAX_ABS_POWER) return v;
    this.numberError = Number.isNaN(v) ? "unparseable number" : `number out of range (|value| > ${MAX_ABS_POWER})`;
    return Number.NaN;
  }

  /** +1 lagging, −1 leading, 0 when the sense cell is absent or empty, NaN when unrecognised. */
  private senseSign(s: Uint8Array): number {
    const col = this.map.sense;
    if (col < 0) return 0;
    const a = this.starts[col] as number;
    if (a >= (this.ends[col] as number)) return 0;
    const c = (s[a] as number) | 32;
    const c2 = a + 1 < (this.ends[col] as number) ? (s[a + 1] as number) | 32 : 0;
    if (c === 105 || (c === 108 && c2 === 97) || (c === 108 && c2 === 0)) return 1; // ind…, la…, L
    if (c === 99 || (c === 108 && c2 === 101)) return -1; // cap…, le…
    return Number.NaN;
  }

  /**
   * Find the end of the line that starts at `start` and split it into fields in the same pass (the one scan of a
   * row's bytes in the common case): returns the index of its line feed, with the fields as split() would leave
   * them for the line without it and without a carriage return before it. −1: no line feed before `limit` (the
   * line continues in the next chunk); −2: a field opens with a double quote (the caller splits the line itself).
   */
  scanLine(s: Uint8Array, start: number, limit: number): number {
    const delim = this.delim;
    const columns = this.columnCount;
    let f = 0;
    let k = start;
    for (;;) {
      const fs = k;
      if (k < limit && s[k] === 34) return -2;
      let c = 0;
      while (k < limit) {
        c = s[k] as number;
        if (c === delim || c === 10) break;
        k++;
      }
      if (k >= limit) return -1;
      let fe = c === 10 && k > fs && s[k - 1] === 13 ? k - 1 : k;
      let from = fs;
      while (from < fe && s[from] === 32) from++;
      while (fe > from && s[fe - 1] === 32) fe--;
      if (f < columns) {
        this.starts[f] = from;
        this.ends[f] = fe;
      }
      f++;
      if (c === 10) {
        this.fieldCount = f;
        return k;
      }
      k++;
    }
  }

  /** Decode the row in s[start, end); `afterUtcMs` (previous row) resolves repeated local times. */
  decode(s: Uint8Array, start: number, end: number, afterUtcMs: number): boolean {
    this.errColumn = -1;
    if (!this.split(s, start, end)) return this.fail(-1, "unterminated double quote");
    return this.decodeFields(s, afterUtcMs);
  }

  /** Decode the row whose fields scanLine (or split) has just found. */
  decodeFields(s: Uint8Array, afterUtcMs: number): boolean {
    this.errColumn = -1;
    if (this.fieldCount !== this.columnCount) {
      return this.fail(-1, `wrong column count: ${this.fieldCount} field${this.fieldCount === 1 ? "" : "s"}, the header has ${this.columnCount}`);
    }
    const m = this.map;
    const code =
      m.timestamp >= 0
        ? this.ts.parseBytes(s, this.starts[m.timestamp] as number, this.ends[m.timestamp] as number)
        : this.ts.parseSplitBytes(
            s,
            this.starts[m.date] as number,
            this.ends[m.date] as number,
            s,
            this.starts[m.time] as number,
            this.ends[m.time] as number,
          );
    const tsColumn = m.timestamp >= 0 ? m.timestamp : m.date;
    if (code !== 0) return this.fail(tsColumn, `bad timestamp: ${TS_REASONS[code]}`);
    this.offsetMs = this.ts.offsetMs;
    this.hadOffset = !Number.isNaN(this.offsetMs);
    this.utcMs = this.hadOffset ? this.ts.wallMs - this.ts.offsetMs : this.opts.zone.wallToUtc(this.ts.wallMs, afterUtcMs);
    if (Number.isNaN(this.utcMs)) {
      return this.fail(
        tsColumn,
        `bad timestamp: this local time does not exist in ${this.opts.zone.name} (skipped by the daylight-saving change; a meter on standard time all year needs a fixed offset such as -06:00)`,
      );
    }
    const kW = this.number(s, m.kW);
    if (Number.isNaN(kW)) return this.fail(m.kW, this.numberError);
    if (kW < 0) return this.fail(m.kW, "negative kW (export): this analysis covers imported power only");
    const sign = this.senseSign(s);
    if (Number.isNaN(sign)) return this.fail(m.sense, "unrecognised sense (use lagging/leading, lag/lead, L/C, inductive/capacitive)");
    this.kW = kW;
    if (m.method === "kW_kvar") {
      const q = this.number(s, m.kvar);
      if (Number.isNaN(q)) return this.fail(m.kvar, this.numberError);
      this.kvar = sign === 0 ? q : sign * Math.abs(q);
      return true;
    }
    if (m.method === "kW_pf") {
      const pf = this.number(s, m.pf);
      if (Number.isNaN(pf)) return this.fail(m.pf, this.numberError);
      const mag = Math.abs(pf);
      if (!(mag > 0 && mag <= 1)) return this.fail(m.pf, mag > 1 ? "PF outside (0, 1] (give PF as a fraction, not percent)" : "PF outside (0, 1]");
      const s2 = sign !== 0 ? sign : this.opts.sense === "leading" ? -1 : this.opts.sense === "lagging" ? 1 : pf < 0 ? -1 : 1;
      // Q = P·tan(acos PF) = P·√(1 − PF²)/PF (power triangle)
      this.kvar = (s2 * kW * Math.sqrt(1 - mag * mag)) / mag + 0; // + 0: no −0 at PF 1
      return true;
    }
    const kVA = this.number(s, m.kVA);
    if (Number.isNaN(kVA)) return this.fail(m.kVA, this.numberError);
    if (kVA < 0) return this.fail(m.kVA, "negative kVA");
    if (kW > kVA * (1 + KW_ABOVE_KVA_TOLERANCE)) return this.fail(m.kW, "kW above kVA by more than 1 %");
    const s3 = sign !== 0 ? sign : this.opts.sense === "leading" ? -1 : 1;
    // Q = √(S² − P²) (power triangle); kW within 1 % above kVA is rounding and gives 0
    this.kvar = kVA > kW ? s3 * Math.sqrt(kVA * kVA - kW * kW) : 0;
    return true;
  }
}
