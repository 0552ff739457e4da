/**
 * Every problem type the service answers with: its slug (the last segment of the `type` URI), its title, the
 * status it comes with, what it means and what to do. GET /problems/<slug> shows this as a short page: RFC 9457
 * §3.1.1 encourages a problem type URI that, dereferenced, documents the type for a person.
 *
 * `problem()` takes only these slugs, so a new type cannot be answered without its page.
 */
import { DEFAULT_MAX_BAD_ROW_FRACTION } from "../core/interval/interval-api.js";
import { INTERVAL_MAX_BYTES, INTERVAL_MAX_ROWS } from "./interval/ingest.js";

export interface ProblemTypeDoc {
  title: string;
  /** The status code(s) it comes with, as a person reads them ("400", "413"). */
  status: string;
  means: string;
  todo: string;
}

export const PROBLEM_TYPES = {
  validation: {
    title: "The request is not valid",
    status: "400",
    means:
      "A field of the body, the query string or a header is missing, of the wrong type or out of range, or a reading is physically implausible. The answer's errors list names each field by its dotted path (loads.0.measurement.pf) with the reason.",
    todo: "Correct each field named in errors and send the request again. Field names and their units are in the OpenAPI document at /openapi.json.",
  },
  "bad-request": {
    title: "Bad request",
    status: "400",
    means:
      "The request could not be read at all: JSON that does not parse, an empty body where a JSON object is needed, or a URL with a broken %-escape.",
    todo: "Check that the body is well-formed JSON sent with content-type application/json, and that the URL is correctly escaped.",
  },
  "bad-upload": {
    title: "The upload could not be read",
    status: "400",
    means: "A multipart/form-data upload is malformed, for example a part is cut short.",
    todo: "Send the option fields first and the CSV last in the form field named file, or send the CSV itself as the body with content-type text/csv.",
  },
  "csv-header": {
    title: "The CSV header does not give the needed columns",
    status: "400",
    means: "No line near the top of the interval file names a time column and a kW column (kvar or PF as well, or a kVA column).",
    todo: "Check the export's column names against the interval-analysis options in the API documentation, or name the columns explicitly with the query options.",
  },
  "csv-line-too-long": {
    title: "A CSV line is too long",
    status: "400",
    means: "A line of the interval file is longer than any real meter export would write; the file is probably not a CSV, or has no line ends.",
    todo: "Export the interval data again as CSV with one interval per line.",
  },
  unauthorized: {
    title: "Authentication required",
    status: "401",
    means: "Every /v1 request needs an API key; this one had none, a malformed one, an unknown one or a revoked one.",
    todo: "Send the header Authorization: Bearer <API key>. An administrator of your organisation can create a key (POST /v1/keys or npm run keys).",
  },
  forbidden: {
    title: "Not allowed",
    status: "403",
    means: "The key is valid, but its role may not do this: auditors only read, surveyors may not manage keys.",
    todo: "Use a key with a role that may (the detail names the allowed roles), or ask an administrator.",
  },
  "not-found": {
    title: "Not found",
    status: "404",
    means:
      "There is no such route, or no such building, survey, revision or analysis in your organisation. Another organisation's records also answer 404.",
    todo: "Check the path and the id; lists such as GET /v1/buildings give the ids your key can see.",
  },
  "method-not-allowed": {
    title: "Method not allowed",
    status: "405",
    means: "The path exists, but not with this method.",
    todo: "Use one of the methods in the answer's Allow header.",
  },
  "last-admin-key": {
    title: "Conflict",
    status: "409",
    means: "This is the organisation's last active admin key; revoking it would leave nobody able to manage keys.",
    todo: "Create another admin key first, then revoke this one.",
  },
  "too-large": {
    title: "Request body too large",
    status: "413",
    means: `The body is larger than the service accepts: BODY_LIMIT_BYTES for JSON (1 MiB unless configured), ${INTERVAL_MAX_BYTES / 1048576} MiB for an interval upload.`,
    todo: "Send less: split the readings over several surveys, or the interval data over several uploads.",
  },
  "too-many-rows": {
    title: "Too many rows",
    status: "413",
    means: `The interval file has more than ${INTERVAL_MAX_ROWS.toLocaleString("en-GB")} data rows, more than one analysis takes (about two years of 1-minute data).`,
    todo: "Upload a shorter period, or the same period at a longer interval.",
  },
  "uri-too-long": {
    title: "URI too long",
    status: "414",
    means: "A segment of the path is longer than any id or name the service uses.",
    todo: "Check the URL: ids are short strings taken from the service's own answers.",
  },
  "headers-too-large": {
    title: "Request headers too large",
    status: "431",
    means:
      "The request line and headers together exceed 16 KiB, so the server would not read them. Usually a URL made far too long by a script, or an oversized cookie.",
    todo: "Check the URL and the headers the client sends: query strings in this API are short.",
  },
  "request-timeout": {
    title: "Request timeout",
    status: "408",
    means: "The request was not received in full within the server's time limit: a slow or stalled connection.",
    todo: "Send the request again; on a poor link, send interval data in smaller uploads.",
  },
  "unsupported-media-type": {
    title: "Unsupported media type",
    status: "415",
    means: "The body's content-type is not one this route reads.",
    todo: "Send JSON as application/json; interval data as text/csv or multipart/form-data.",
  },
  "idempotency-key-reused": {
    title: "Idempotency-Key reused",
    status: "422",
    means:
      "The Idempotency-Key was already used, within the time keys are kept, for a request with another method, URL or body. The first request's answer stands.",
    todo: "Use a new key for a new request; repeat a key only to retry exactly the same request.",
  },
  "idempotency-key-in-flight": {
    title: "Request with this Idempotency-Key in progress",
    status: "409",
    means: "A request with the same Idempotency-Key is still being worked (by this or another instance of the service); its answer is not known yet.",
    todo: "Retry the same request after the seconds given in Retry-After: you will get the first request's answer.",
  },
  "write-conflict": {
    title: "Changed while being written",
    status: "409",
    means: "The building or survey changed (another revision, another building version) while this request was computed, twice in a row.",
    todo: "Read the resource again and retry.",
  },
  "not-ready": {
    title: "Not ready",
    status: "503",
    means: "The service cannot reach its database, or the database's schema is not the one this build expects (migrations pending or newer).",
    todo: "Wait and retry; an operator should check the database and the service's log.",
  },
  "csv-no-data": {
    title: "The upload has no data",
    status: "422",
    means: "The interval upload is empty, or its header is followed by no rows.",
    todo: "Check that the export holds the period you meant, and send the file itself.",
  },
  "csv-bad-rows": {
    title: "Too many bad rows",
    status: "422",
    means: `More than ${DEFAULT_MAX_BAD_ROW_FRACTION * 100} % of the rows could not be read (a time that does not parse, a number that is not one). The answer's badRows lists the first ones by line and column.`,
    todo: "Fix the rows named, or check that the upload options (delimiter, column names) match the export.",
  },
  "csv-too-few-intervals": {
    title: "Too few intervals",
    status: "422",
    means: "The file holds fewer than two distinct timestamps: no interval can be measured from it.",
    todo: "Upload a longer period.",
  },
  "rate-limited": {
    title: "Too many requests",
    status: "429",
    means: "The key (or, without a key, the address) sent more requests in a minute than RATE_LIMIT_PER_MINUTE allows.",
    todo: "Wait for the seconds given in the Retry-After header, then go on more slowly.",
  },
  overloaded: {
    title: "The service is busy",
    status: "503",
    means:
      "The service is answering slowly (its event loop lags beyond EVENT_LOOP_MAX_DELAY_MS) or its queue of heavy work (large harmonic scans, reports, interval analyses) is full, so it refuses new work rather than stall every request. GET /health is always answered.",
    todo: "Wait for the seconds given in the Retry-After header and send the request again.",
  },
  internal: {
    title: "Internal error",
    status: "500",
    means: "Something failed inside the service. It is logged with the request id.",
    todo: "Try again later; if it persists, give the service's operator the x-request-id header of the answer.",
  },
} as const satisfies Record<string, ProblemTypeDoc>;

export type ProblemSlug = keyof typeof PROBLEM_TYPES;

export const isProblemSlug = (s: string): s is ProblemSlug => Object.hasOwn(PROBLEM_TYPES, s);
