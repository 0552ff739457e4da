import { createHash, type Hash } from "node:crypto";
import type { Readable } from "node:stream";
import multipart from "@fastify/multipart";
import type { FastifyInstance, FastifyRequest } from "fastify";
import { createIntervalParser, type ParseOutcome } from "../../core/interval/parser.js";
import { seriesTransfer } from "../../heavy-work/pool.js";
import { problem, ProblemError, validationProblem } from "../problem.js";
import { columnPool } from "./column-pool.js";
import { fatalProblem, feedStream, INTERVAL_MAX_BYTES, INTERVAL_MAX_ROWS, tooLarge } from "./ingest.js";
import { parseIntervalOptions, type IntervalRequestOptions } from "./options.js";
import type { intervalResponse } from "./response.js";

/** Reading an interval upload (text/csv or multipart/form-data) into an analysis, for every route that takes one. */

const CSV_TYPES = ["text/csv", "application/csv", "text/plain"];
const MAX_FORM_FIELDS = 40;

export type IntervalAnswer = ReturnType<typeof intervalResponse>;

/** What identifies an upload for Idempotency-Key: its media type, form fields and the SHA-256 of its bytes. */
export interface UploadDigest {
  mediaType: string;
  form: Record<string, string>;
  sha256: string;
}

export interface AnalysedUpload {
  answer: IntervalAnswer;
  /** Present when asked for (hashing costs a pass over the bytes as they stream by). */
  digest?: UploadDigest;
}

/** The plugin's own body parsers: the CSV stays a stream, multipart is read part by part; JSON is not an input here. */
export async function installUploadParsers(app: FastifyInstance): Promise<void> {
  app.removeContentTypeParser(["application/json", "text/plain"]);
  const passStream = (_req: unknown, payload: Readable, done: (err: Error | null, body?: unknown) => void) => done(null, payload);
  app.addContentTypeParser(CSV_TYPES, passStream);
  if (!app.hasContentTypeParser("*")) app.addContentTypeParser("*", passStream);
  if (!app.hasContentTypeParser("multipart/form-data")) await app.register(multipart);
}

function mediaType(request: FastifyRequest): string {
  return (request.headers["content-type"] ?? "").split(";")[0]!.trim().toLowerCase();
}

/** An error while reading the upload (never the analysis) as a 4xx problem. */
function readProblem(err: unknown): ProblemError {
  if (err instanceof ProblemError) return err;
  const e = err as { code?: string; statusCode?: number; message?: string };
  if (e.code === "FST_REQ_FILE_TOO_LARGE") return tooLarge(`the file exceeds ${INTERVAL_MAX_BYTES} bytes (${INTERVAL_MAX_BYTES / 1048576} MiB)`);
  if (e.code === "FST_FILES_LIMIT") return new ProblemError(validationProblem([{ path: "file", message: "send one file" }]));
  if (e.code === "FST_FIELDS_LIMIT" || e.code === "FST_PARTS_LIMIT") {
    return new ProblemError(validationProblem([{ path: "body", message: `at most ${MAX_FORM_FIELDS} form fields` }]));
  }
  const detail = `the upload could not be read: ${e.message ?? "unknown error"}`;
  return new ProblemError(problem(400, "bad-upload", "The upload could not be read", detail, [{ path: "body", message: detail }]));
}

type Read = { outcome: ParseOutcome; bytes: number };

/** Stream phase: feed the upload to the parser; errors here are the client's. */
async function readCsv(
  stream: AsyncIterable<Buffer | string>,
  o: IntervalRequestOptions,
  hash: Hash | undefined,
  declaredBytes?: number,
): Promise<Read> {
  const parser = createIntervalParser({
    ...o.parse,
    maxRows: INTERVAL_MAX_ROWS,
    columnArrays: columnPool,
    ...(declaredBytes ? { expectedChars: declaredBytes } : {}),
  });
  try {
    const bytes = await feedStream(stream, parser, INTERVAL_MAX_BYTES, hash);
    return { outcome: parser.end(), bytes };
  } catch (err) {
    throw readProblem(err);
  }
}

/**
 * Analysis phase: pure computation on the parsed series, on a worker thread (sorting a year of intervals for the
 * percentiles and simulating the controller over it would hold the event loop); the series' arrays are moved there.
 */
async function analyse(request: FastifyRequest, { outcome, bytes }: Read, o: IntervalRequestOptions): Promise<IntervalAnswer> {
  if (!outcome.ok) throw new ProblemError(fatalProblem(outcome));
  const { series, report } = outcome;
  const { answer, columns } = await request.server.heavyWork.run("intervalAnalysis", { bytes, series, report, options: o }, seriesTransfer(series));
  for (const c of columns) columnPool.give(c);
  return answer;
}

/** Multipart: option fields first, then the file in field `file` (streamed straight into the parser). */
async function analyseMultipart(request: FastifyRequest, hash: Hash | undefined): Promise<{ answer: IntervalAnswer; form: Record<string, string> }> {
  const form: Record<string, string> = {};
  let read: Read | null = null;
  let options: IntervalRequestOptions | null = null;
  try {
    const parts = request.parts({ limits: { fileSize: INTERVAL_MAX_BYTES, files: 1, fields: MAX_FORM_FIELDS, fieldSize: 1000 } });
    for await (const part of parts) {
      if (part.type === "field") {
        if (read !== null)
          throw new ProblemError(validationProblem([{ path: part.fieldname, message: "form fields must come before the file field" }]));
        form[part.fieldname] = String(part.value);
        continue;
      }
      if (part.fieldname !== "file")
        throw new ProblemError(validationProblem([{ path: part.fieldname, message: 'the CSV goes in the form field "file"' }]));
      options = parseIntervalOptions(request.query as Record<string, unknown>, form);
      read = await readCsv(part.file, options, hash);
      if (part.file.truncated) throw tooLarge(`the file exceeds ${INTERVAL_MAX_BYTES} bytes`);
    }
  } catch (err) {
    throw readProblem(err);
  }
  if (read === null || options === null)
    throw new ProblemError(validationProblem([{ path: "file", message: 'no file: upload the CSV in the form field "file"' }]));
  return { answer: await analyse(request, read, options), form };
}

/**
 * Read and analyse the upload of a route registered after installUploadParsers, with a bodyLimit of
 * INTERVAL_MAX_BYTES: the CSV as the body, or multipart with the option fields before the file.
 */
export async function analyseUpload(request: FastifyRequest, o: { digest?: boolean } = {}): Promise<AnalysedUpload> {
  const type = mediaType(request);
  const hash = o.digest ? createHash("sha256") : undefined;
  const digestOf = (form: Record<string, string>) => (hash ? { digest: { mediaType: type, form, sha256: hash.digest("hex") } } : {});
  if (type === "multipart/form-data") {
    const { answer, form } = await analyseMultipart(request, hash);
    return { answer, ...digestOf(form) };
  }
  if (!CSV_TYPES.includes(type)) {
    throw new ProblemError(
      problem(
        415,
        "unsupported-media-type",
        "Unsupported media type",
        `send the CSV as text/csv or as multipart/form-data with a "file" field (got ${type || "no content type"})`,
      ),
    );
  }
  const options = parseIntervalOptions(request.query as Record<string, unknown>);
  const declared = Number(request.headers["content-length"]);
  if (declared > INTERVAL_MAX_BYTES)
    throw tooLarge(`the upload is ${declared} bytes; the limit is ${INTERVAL_MAX_BYTES} bytes (${INTERVAL_MAX_BYTES / 1048576} MiB)`);
  const body = request.body as AsyncIterable<Buffer> | null | undefined;
  if (!body || typeof (body as Partial<Readable>)[Symbol.asyncIterator] !== "function") {
    throw new ProblemError(
      problem(422, "csv-no-data", "The upload has no data", "the body is empty", [{ path: "body", message: "send the CSV as the body" }]),
    );
  }
  const answer = await analyse(request, await readCsv(body, options, hash, declared > 0 ? declared : undefined), options);
  return { answer, ...digestOf({}) };
}
