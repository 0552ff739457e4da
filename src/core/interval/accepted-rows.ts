import type { ParseFatal, ParseReport } from "./parser.js";
import type { RowDecoder } from "./rows.js";
import type { RowError } from "./series-types.js";
import { utf8Text } from "./text-bytes.js";

/** A source of Float64Arrays of at least a given length, and their return. */
export interface ColumnArrays {
  take(length: number): Float64Array;
  give(array: Float64Array): void;
}

/** Data rows read before the arrays are sized from their mean length. */
export const SIZING_ROWS = 256;

export interface AcceptedRowsOptions {
  maxRows: number;
  maxReported: number;
  maxLineChars: number;
  /** Expected upload size in characters, to size the arrays once from the first rows. */
  expectedChars?: number;
  /** An instant as the report shows it (for out-of-order rows). */
  fmt(utcMs: number): string;
}

/**
 * The data rows of an upload once its header is known: each row decoded, counted in the report, and when
 * accepted written to four typed columns that double as they fill (no object per row). A class, not closures
 * made per upload: its methods are the same functions for every upload, so the compiled row loop stays valid
 * from one upload to the next instead of being thrown away (a new closure is a new call target) and compiled
 * again.
 */
export class AcceptedRows {
  timestampsMs: Float64Array;
  kW: Float64Array;
  kvar: Float64Array;
  lines: Float64Array;
  n = 0;
  /** The previous accepted row's instant (resolves repeated local times; finds rows out of order). */
  prevUtc = Number.NaN;
  withoutOffset = 0;
  firstOffsetMs = Number.NaN;
  fatal: ParseFatal | null = null;
  private capacity: number;
  private charsSoFar = 0; // characters of the first SIZING_ROWS data rows, for the size estimate

  constructor(
    private readonly report: ParseReport,
    private readonly arrays: ColumnArrays,
    private readonly o: AcceptedRowsOptions,
  ) {
    this.timestampsMs = arrays.take(4096);
    this.kW = arrays.take(4096);
    this.kvar = arrays.take(4096);
    this.lines = arrays.take(4096);
    this.capacity = this.least();
  }

  /**
   * The complete lines of s from pos on, each found and split in one scan (RowDecoder.scanLine). Returns where
   * it stopped: at the unfinished last line, at a line the scan leaves to the caller (a quoted field, a line
   * longer than the limit), or after a line that refused the upload.
   */
  scanRows(d: RowDecoder, s: Uint8Array, pos: number): number {
    const len = s.length;
    const report = this.report;
    const maxLine = this.o.maxLineChars;
    while (this.fatal === null) {
      const nl = d.scanLine(s, pos, len);
      if (nl < 0 || nl - pos > maxLine) return pos;
      report.lines++;
      const end = nl > pos && s[nl - 1] === 13 ? nl - 1 : nl;
      if (end === pos) report.blankLines++;
      else this.row(d, s, pos, end, true);
      pos = nl + 1;
    }
    return pos;
  }

  /** A data row in s[start, end) (line counted, CR dropped, not blank); `split`: the decoder already holds its fields. */
  row(d: RowDecoder, s: Uint8Array, start: number, end: number, split: boolean): void {
    const report = this.report;
    if (report.dataRows < SIZING_ROWS) this.charsSoFar += end - start + 1;
    if (++report.dataRows > this.o.maxRows) return this.tooManyRows();
    if (report.dataRows === SIZING_ROWS && this.o.expectedChars) this.reserve();
    const prevUtc = this.prevUtc;
    if (!(split ? d.decodeFields(s, prevUtc) : d.decode(s, start, end, prevUtc))) return this.badRow(d, s);
    const u = d.utcMs;
    if (!d.hadOffset) this.withoutOffset++;
    else if (Number.isNaN(this.firstOffsetMs)) this.firstOffsetMs = d.offsetMs;
    if (u < prevUtc) this.outOfOrder(u, prevUtc);
    this.prevUtc = u;
    const n = this.n;
    if (n === this.capacity) this.grow(this.capacity * 2);
    this.timestampsMs[n] = u;
    this.kW[n] = d.kW;
    this.kvar[n] = d.kvar;
    this.lines[n] = report.lines;
    this.n = n + 1;
  }

  /** The columns back to their source, except those whose buffers are in `held`. */
  giveBack(held: ArrayBufferLike[]): void {
    for (const a of [this.timestampsMs, this.kW, this.kvar, this.lines]) if (!held.includes(a.buffer)) this.arrays.give(a);
  }

  private least(): number {
    return Math.min(this.timestampsMs.length, this.kW.length, this.kvar.length, this.lines.length);
  }

  private tooManyRows(): void {
    const max = this.o.maxRows;
    this.fatal = {
      kind: "too_many_rows",
      message: `more than ${max} data rows`,
      issues: [{ path: "body", message: `the upload has more than ${max} data rows` }],
    };
  }

  private outOfOrder(u: number, prevUtc: number): void {
    const o = this.report.outOfOrder;
    o.count++;
    if (o.first.length < this.o.maxReported)
      o.first.push({ line: this.report.lines, timestamp: this.o.fmt(u), previousTimestamp: this.o.fmt(prevUtc) });
  }

  private badRow(d: RowDecoder, s: Uint8Array): void {
    const report = this.report;
    const b = report.badRows;
    b.count++;
    const key = d.errReason.split(/[:(]/)[0]!.trim();
    b.byReason[key] = (b.byReason[key] ?? 0) + 1;
    if (b.first.length < this.o.maxReported) {
      const column = d.errColumn >= 0 ? (report.header[d.errColumn] ?? "") : "";
      const e: RowError = { line: report.lines, column, reason: d.errReason };
      if (d.errColumn >= 0) e.value = utf8Text(s, d.errStart, d.errEnd).slice(0, 40);
      b.first.push(e);
    }
  }

  private reserve(): void {
    const perRow = this.charsSoFar / SIZING_ROWS;
    this.grow(Math.min(this.o.maxRows, Math.ceil(((this.o.expectedChars as number) / perRow) * 1.02) + 16));
  }

  private grow(rows: number): void {
    if (rows <= this.capacity) return;
    const bigger = (a: Float64Array) => {
      if (a.length >= rows) return a;
      const b = this.arrays.take(rows);
      b.set(a.subarray(0, this.n));
      this.arrays.give(a);
      return b;
    };
    this.timestampsMs = bigger(this.timestampsMs);
    this.kW = bigger(this.kW);
    this.kvar = bigger(this.kvar);
    this.lines = bigger(this.lines);
    this.capacity = this.least();
  }
}
