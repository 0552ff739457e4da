import type { Hash } from "node:crypto";
import { IncomingMessage } from "node:http";
import type { FatalKind, IntervalParser, ParseOutcome } from "../../core/interval/parser.js";
import { problem, ProblemError, type Problem } from "../problem.js";
import type { ProblemSlug } from "../problem-types.js";

/** Largest upload this route reads, bytes (the app-wide JSON limit is 1 MiB; this route sets its own). */
export const INTERVAL_MAX_BYTES = 64 * 1024 * 1024;
/** Largest number of data rows: two years of 1-minute intervals with room to spare. */
export const INTERVAL_MAX_ROWS = 1_100_000;

export function tooLarge(detail: string): ProblemError {
  return new ProblemError(problem(413, "too-large", "Upload too large", detail, [{ path: "body", message: detail }]));
}

/**
 * Feed a byte stream to the parser chunk by chunk, as bytes (the parser finds lines and reads rows in them; no
 * text is decoded per chunk, nothing is buffered whole). Throws a 413 problem past maxBytes; stops reading as soon
 * as the parser refuses the upload. `hash`, when given, sees every raw chunk read (the whole upload, when the
 * parser accepts it).
 */
export async function feedStream(stream: AsyncIterable<Buffer | string>, parser: IntervalParser, maxBytes: number, hash?: Hash): Promise<number> {
  // Node's HTTP parser copies each body chunk into a buffer of its own, which nothing else holds once read
  const ownChunks = stream instanceof IncomingMessage;
  let bytes = 0;
  for await (const chunk of stream) {
    bytes += chunk.length;
    if (bytes > maxBytes) throw tooLarge(`the upload exceeds ${maxBytes} bytes (${maxBytes / 1048576} MiB)`);
    hash?.update(chunk);
    const more = typeof chunk === "string" ? parser.push(chunk) : parser.pushBytes(chunk);
    if (ownChunks && typeof chunk !== "string") release(chunk);
    if (!more) return bytes;
  }
  return bytes;
}

/**
 * Give a read chunk's memory back at once (the parser copies the little it keeps) instead of at the next garbage
 * collection: the parse allocates next to nothing on the JS heap, so collections are rare and a 20 MB upload's
 * chunks would otherwise pile up, upload after upload, until the external-memory limit forces one. Detaching the
 * chunk's ArrayBuffer frees it; the next chunks reuse that memory. Only for a chunk that is its buffer's sole view.
 */
function release(chunk: Buffer): void {
  const buffer = chunk.buffer as ArrayBuffer & { detached?: boolean; transfer?: (length: number) => ArrayBuffer }; // ES2024
  if (buffer instanceof ArrayBuffer && chunk.byteOffset === 0 && chunk.byteLength === buffer.byteLength && buffer.detached === false)
    buffer.transfer?.(0);
}

const FATAL: Record<FatalKind, { status: number; slug: ProblemSlug; title: string }> = {
  options: { status: 400, slug: "validation", title: "The request is not valid" },
  header: { status: 400, slug: "csv-header", title: "The CSV header does not give the needed columns" },
  line_too_long: { status: 400, slug: "csv-line-too-long", title: "A CSV line is too long" },
  no_data: { status: 422, slug: "csv-no-data", title: "The upload has no data" },
  too_many_rows: { status: 413, slug: "too-many-rows", title: "Too many rows" },
  too_many_bad_rows: { status: 422, slug: "csv-bad-rows", title: "Too many bad rows" },
  too_few_intervals: { status: 422, slug: "csv-too-few-intervals", title: "Too few intervals" },
};

/** A refused upload as a problem: the parse report's counts and first bad rows ride along as extension members. */
export function fatalProblem(outcome: Extract<ParseOutcome, { ok: false }>): Problem {
  const f = FATAL[outcome.fatal.kind];
  const r = outcome.report;
  const p = problem(f.status, f.slug, f.title, outcome.fatal.message, outcome.fatal.issues.length ? outcome.fatal.issues : undefined);
  return {
    ...p,
    ...(outcome.fatal.kind === "too_many_bad_rows" || r.badRows.count > 0 ? { badRows: r.badRows } : {}),
    ...(r.header.length ? { header: r.header } : {}),
    lines: r.lines,
    dataRows: r.dataRows,
  } as Problem;
}
