import { detectDelimiter, mapColumns, splitHeader, type ColumnMapping, type ColumnOverrides, type Delimiter, type MappingIssue } from "./columns.js";
import { isoWithOffset, type DateOrder } from "./datetime.js";
import { checkSteps, medianStepMinutes, sortAndDedupe, type DuplicateExample, type StepReport } from "./quality.js";
import { AcceptedRows, type ColumnArrays } from "./accepted-rows.js";
import { RowDecoder, type SenseOption } from "./rows.js";
import type { IntervalSeries, RowError } from "./series-types.js";
import { utf16Length, utf8Text } from "./text-bytes.js";
import { fixedZone, UTC_ZONE, zoneFor, type Zone } from "./zone.js";

export const DEFAULT_MAX_ROWS = 1_100_000;
export const DEFAULT_MAX_BAD_ROW_FRACTION = 0.05;
export const DEFAULT_MAX_REPORTED = 50;
/** Lines before the header (a meter's preamble) searched for a header that maps. */
export const HEADER_SEARCH_LINES = 20;
export const MAX_LINE_CHARS = 10_000;

export interface ParseOptions extends ColumnOverrides {
  delimiter?: Delimiter;
  dateOrder?: DateOrder;
  /** IANA name or fixed offset for timestamps without one, and for calendar months. */
  timeZone?: string;
  sense?: SenseOption;
  /** Interval length override, minutes (otherwise the median step). */
  intervalMinutes?: number;
  maxRows?: number;
  /** Expected upload size in characters (e.g. the Content-Length), to size the arrays once from the first rows. */
  expectedChars?: number;
  maxBadRowFraction?: number;
  maxReported?: number;
  /**
   * Where the column arrays come from and go back to, instead of fresh allocations: the caller's pool. Every array
   * taken goes back when the parse is done, except those the series holds (the caller gives them back after use).
   */
  columnArrays?: ColumnArrays;
}

export type { ColumnArrays } from "./accepted-rows.js";

const FRESH: ColumnArrays = { take: (length) => new Float64Array(length), give: () => {} };

export type FatalKind = "options" | "header" | "line_too_long" | "too_many_rows" | "no_data" | "too_many_bad_rows" | "too_few_intervals";

export interface ParseFatal {
  kind: FatalKind;
  message: string;
  issues: MappingIssue[];
}

export interface ParseReport {
  lines: number;
  dataRows: number;
  acceptedRows: number;
  blankLines: number;
  preambleLines: number;
  delimiter: Delimiter;
  header: string[];
  columns: Record<string, string>;
  method: ColumnMapping["method"] | null;
  timeZone: string;
  notes: string[];
  badRows: { count: number; fraction: number; limitFraction: number; byReason: Record<string, number>; first: RowError[] };
  outOfOrder: { count: number; first: { line: number; timestamp: string; previousTimestamp: string }[] };
  duplicates: { count: number; first: DuplicateExample[] };
  interval: { minutes: number; detectedMinutes: number; source: "detected" | "given" } | null;
  steps: StepReport | null;
}

export type ParseOutcome = { ok: true; series: IntervalSeries; report: ParseReport } | { ok: false; fatal: ParseFatal; report: ParseReport };

export interface IntervalParser {
  /** Feed the next piece of text (any split, even mid-line); false once the upload is refused. */
  push(chunk: string): boolean;
  /**
   * Feed the next bytes of a UTF-8 upload (any split, even inside a character); false once the upload is refused.
   * A byte-order mark at the very start is dropped. The bytes are read, not kept: the caller may reuse them.
   */
  pushBytes(chunk: Uint8Array): boolean;
  /** No more text: finish the last line and build the series. */
  end(): ParseOutcome;
}

/**
 * A streaming CSV parser: a state machine over lines (header search, then rows) fed byte chunks (or text, which
 * it encodes as UTF-8). Lines are found and rows decoded in the bytes; no string is made per line.
 */
export function createIntervalParser(options: ParseOptions = {}): IntervalParser {
  const maxRows = options.maxRows ?? DEFAULT_MAX_ROWS;
  const maxReported = options.maxReported ?? DEFAULT_MAX_REPORTED;
  const givenZone = options.timeZone !== undefined ? zoneFor(options.timeZone) : null;
  let zone: Zone = givenZone ?? UTC_ZONE;
  const report: ParseReport = {
    lines: 0,
    dataRows: 0,
    acceptedRows: 0,
    blankLines: 0,
    preambleLines: 0,
    delimiter: options.delimiter ?? ",",
    header: [],
    columns: {},
    method: null,
    timeZone: zone.name,
    notes: [],
    badRows: { count: 0, fraction: 0, limitFraction: options.maxBadRowFraction ?? DEFAULT_MAX_BAD_ROW_FRACTION, byReason: {}, first: [] },
    outOfOrder: { count: 0, first: [] },
    duplicates: { count: 0, first: [] },
    interval: null,
    steps: null,
  };
  let fatal: ParseFatal | null = null;
  if (options.timeZone !== undefined && givenZone === null) {
    fatal = {
      kind: "options",
      message: "timeZone is not an IANA zone name or an offset like +02:00",
      issues: [{ path: "timeZone", message: `unknown time zone "${options.timeZone}"` }],
    };
  }
  let decoder: RowDecoder | null = null;
  let firstHeaderIssues: MappingIssue[] | null = null;
  let firstHeaderLine = 0;
  let candidates = 0;
  // The unfinished last line of the chunks so far (bytes, copied: a caller may reuse its buffers).
  let carry = new Uint8Array(0);
  let carryLength = 0;
  let bomPending = true; // a byte upload's first bytes may be a byte-order mark
  let bomHead = new Uint8Array(0);
  let highSurrogate = ""; // a text chunk's last code unit when it starts a surrogate pair
  const encoder = new TextEncoder();
  const fmt = (u: number) => isoWithOffset(u, zone.offsetMsAt(u));
  const arrays = options.columnArrays ?? FRESH;
  const rows = new AcceptedRows(report, arrays, {
    maxRows,
    maxReported,
    maxLineChars: MAX_LINE_CHARS,
    ...(options.expectedChars ? { expectedChars: options.expectedChars } : {}),
    fmt,
  });

  const header = (text: string): void => {
    if (text.trim() === "") return void report.blankLines++;
    candidates++;
    const delimiter = options.delimiter ?? detectDelimiter(text);
    const names = splitHeader(text.charCodeAt(0) === 0xfeff ? text.slice(1) : text, delimiter);
    const mapped = mapColumns(names, options);
    if ("issues" in mapped) {
      if (firstHeaderIssues === null) report.header = names; // shown with the header problem
      firstHeaderIssues ??= mapped.issues;
      firstHeaderLine ||= report.lines;
      if (candidates >= HEADER_SEARCH_LINES) {
        fatal = {
          kind: "header",
          message: `no header line with the needed columns in the first ${HEADER_SEARCH_LINES} lines (line ${firstHeaderLine} shown)`,
          issues: firstHeaderIssues,
        };
      }
      return;
    }
    report.preambleLines = candidates - 1;
    report.delimiter = delimiter;
    report.header = names;
    report.columns = mapped.mapping.names;
    report.method = mapped.mapping.method;
    report.notes.push(...mapped.mapping.notes);
    decoder = new RowDecoder(mapped.mapping, names.length, { delimiter, dateOrder: options.dateOrder ?? null, zone, sense: options.sense ?? null });
  };

  const tooLong = (lineNumber: number): void => {
    fatal = {
      kind: "line_too_long",
      message: `line ${lineNumber} is longer than ${MAX_LINE_CHARS} characters`,
      issues: [{ path: `line.${lineNumber}`, message: "line too long" }],
    };
  };

  /** Characters (UTF-16 code units, as text would count them) above the limit; bytes count only when all ASCII. */
  const overLong = (s: Uint8Array, start: number, end: number): boolean =>
    end - start > MAX_LINE_CHARS && utf16Length(s, start, end) > MAX_LINE_CHARS;

  const line = (s: Uint8Array, start: number, end: number): void => {
    report.lines++;
    // The bound holds wherever the line falls in the chunks (a line inside one chunk as well as one across two).
    if (overLong(s, start, end)) return tooLong(report.lines);
    if (end > start && s[end - 1] === 13) end--;
    const d = decoder;
    if (d === null) return header(utf8Text(s, start, end));
    if (start === end) return void report.blankLines++;
    rows.row(d, s, start, end, false);
    fatal ??= rows.fatal;
  };

  const keepCarry = (chunk: Uint8Array, from: number): void => {
    const more = chunk.length - from;
    if (carryLength + more > carry.length) {
      const bigger = new Uint8Array(Math.max(carryLength + more, carry.length * 2, 256));
      bigger.set(carry.subarray(0, carryLength));
      carry = bigger;
    }
    carry.set(chunk.subarray(from), carryLength);
    carryLength += more;
  };

  /**
   * The complete lines of chunk from pos on; returns where the unfinished last line starts. Once the header is
   * found, rows are read by AcceptedRows.scanRows (a row's line end and fields in one scan); a line it leaves (a
   * quoted field, an overlong line) is read here as any other.
   */
  const readLines = (chunk: Uint8Array, pos: number): number => {
    while (!fatal) {
      if (decoder !== null) {
        pos = rows.scanRows(decoder, chunk, pos);
        fatal ??= rows.fatal;
        if (fatal) break;
      }
      const nl = chunk.indexOf(10, pos);
      if (nl < 0) break;
      line(chunk, pos, nl);
      pos = nl + 1;
    }
    return pos;
  };

  const pushBytes = (input: Uint8Array): boolean => {
    if (fatal) return false;
    // a plain Uint8Array view (a Buffer is a subclass): the readers then see one kind of array
    let chunk = input.constructor === Uint8Array ? input : new Uint8Array(input.buffer, input.byteOffset, input.byteLength);
    if (bomPending) {
      // U+FEFF at the start of a UTF-8 stream is a byte-order mark, not text (as a UTF-8 decoder drops it)
      const head = bomHead.length > 0 ? concat(bomHead, chunk) : chunk;
      if (head.length < 3 && (head.length === 0 || isBomPrefix(head))) {
        bomHead = Uint8Array.from(head);
        return true;
      }
      bomPending = false;
      bomHead = new Uint8Array(0);
      chunk = head.length >= 3 && isBomPrefix(head) ? head.subarray(3) : head;
    }
    let pos = 0;
    if (carryLength > 0) {
      const nl = chunk.indexOf(10);
      if (nl < 0) {
        keepCarry(chunk, 0);
        if (overLong(carry, 0, carryLength)) tooLong(report.lines + 1);
        return !fatal;
      }
      keepCarry(chunk.subarray(0, nl), 0);
      const joined = carryLength;
      carryLength = 0; // the joined line is read before the carry is written again
      line(carry, 0, joined);
      pos = nl + 1;
    }
    pos = readLines(chunk, pos);
    if (!fatal && pos < chunk.length) keepCarry(chunk, pos);
    return !fatal;
  };

  /** Text: encoded as UTF-8 (a surrogate pair split between two chunks is joined first). */
  const push = (text: string): boolean => {
    bomPending = false; // a BOM in text is a character; the header search drops it
    let t = highSurrogate + text;
    highSurrogate = "";
    const last = t.charCodeAt(t.length - 1);
    if (last >= 0xd800 && last <= 0xdbff) {
      highSurrogate = t.slice(-1);
      t = t.slice(0, -1);
    }
    return pushBytes(encoder.encode(t));
  };

  /** The columns back to their source, except those the series holds. */
  const end = (): ParseOutcome => {
    const out = finish();
    rows.giveBack(out.ok ? [out.series.timestampsMs.buffer, out.series.kW.buffer, out.series.kvar.buffer] : []);
    return out;
  };

  return { push, pushBytes, end };

  function finish(): ParseOutcome {
    if (highSurrogate !== "" && !fatal) pushBytes(encoder.encode(highSurrogate));
    if (bomHead.length > 0 && !fatal) {
      bomPending = false;
      pushBytes(bomHead); // fewer than three bytes in all: not a byte-order mark
    }
    if (!fatal && carryLength > 0) line(carry, 0, carryLength);
    carryLength = 0;
    const fail = (kind: FatalKind, message: string, issues: MappingIssue[]): ParseOutcome => ({
      ok: false,
      fatal: { kind, message, issues },
      report,
    });
    if (fatal) return { ok: false, fatal, report };
    if (decoder === null) {
      if (candidates === 0) return fail("no_data", "the upload is empty", [{ path: "body", message: "no lines: send a CSV with a header line" }]);
      return fail("header", `no header line with the needed columns (line ${firstHeaderLine} shown)`, firstHeaderIssues ?? []);
    }
    const b = report.badRows;
    report.acceptedRows = rows.n;
    b.fraction = report.dataRows > 0 ? b.count / report.dataRows : 0;
    if (report.dataRows === 0)
      return fail("no_data", "no data rows after the header", [{ path: "body", message: "the header is followed by no rows" }]);
    if (b.fraction > b.limitFraction) {
      const message = `${b.count} of ${report.dataRows} rows (${(b.fraction * 100).toFixed(1)} %) are bad, above the ${(b.limitFraction * 100).toFixed(0)} % limit`;
      return fail(
        "too_many_bad_rows",
        message,
        b.first.map((e) => ({ path: `line.${e.line}${e.column ? `.${e.column}` : ""}`, message: e.reason })),
      );
    }
    const { withoutOffset, firstOffsetMs } = rows;
    if (givenZone === null && withoutOffset === 0 && !Number.isNaN(firstOffsetMs)) zone = fixedZone(firstOffsetMs);
    report.timeZone = zone.name;
    const monthFirst = (decoder as RowDecoder).ts.monthFirstByDefault;
    if (monthFirst > 0)
      report.notes.push(`dateOrder not given: ${monthFirst} slashed dates like 03/01/2026 were read month-first (set dateOrder=dmy for day-first)`);
    if (givenZone !== null && withoutOffset > 0 && !/^(UTC|[+-])/.test(zone.name)) {
      report.notes.push(
        `timestamps without an offset read as local time in ${zone.name}; a local hour repeated at the daylight-saving change is read in row order (first occurrence, then second)`,
      );
    }
    if (givenZone === null) {
      report.notes.push(
        withoutOffset > 0
          ? `timeZone not given: ${withoutOffset} timestamps without an offset were read as UTC, and months are UTC months`
          : `timeZone not given: timestamps carry offsets; months are counted in the first row's offset (${zone.name})`,
      );
    }
    const raw = { timestampsMs: rows.timestampsMs, kW: rows.kW, kvar: rows.kvar, lines: rows.lines, n: rows.n };
    const { rows: sorted, duplicates } = sortAndDedupe(raw, report.outOfOrder.count === 0, fmt, maxReported);
    report.duplicates = duplicates;
    if (sorted.n < 2)
      return fail("too_few_intervals", "fewer than two distinct timestamps", [{ path: "body", message: "at least two intervals are needed" }]);
    const detected = medianStepMinutes(sorted.timestampsMs, sorted.n);
    const minutes = options.intervalMinutes ?? detected;
    report.interval = { minutes, detectedMinutes: detected, source: options.intervalMinutes !== undefined ? "given" : "detected" };
    report.steps = checkSteps(sorted, minutes, fmt, maxReported);
    const series: IntervalSeries = {
      timestampsMs: sorted.timestampsMs.subarray(0, sorted.n),
      kW: sorted.kW.subarray(0, sorted.n),
      kvar: sorted.kvar.subarray(0, sorted.n),
      length: sorted.n,
      intervalMinutes: minutes,
      timeZone: zone.name,
    };
    return { ok: true, series, report };
  }
}

const BOM = [0xef, 0xbb, 0xbf];

/** The first bytes (up to three) are those of a UTF-8 byte-order mark. */
function isBomPrefix(b: Uint8Array): boolean {
  for (let i = 0; i < 3 && i < b.length; i++) if (b[i] !== BOM[i]) return false;
  return true;
}

function concat(a: Uint8Array, b: Uint8Array): Uint8Array {
  const out = new Uint8Array(a.length + b.length);
  out.set(a);
  out.set(b, a.length);
  return out;
}
