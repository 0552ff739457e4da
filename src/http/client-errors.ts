import type { IncomingMessage, ServerResponse } from "node:http";
import type { Duplex } from "node:stream";
import helmet from "helmet";
import { problem, type Problem } from "./problem.js";
import { HELMET_OPTIONS } from "./security.js";

/**
 * Requests Node's HTTP parser refuses before fastify sees them: a request head beyond maxHeaderSize (16 KiB by
 * default — a URL longer than that among them), a malformed request line, a head that never finishes. Answered as
 * problems with the same security headers as every other answer, then the connection is closed (RFC 9110 §15.5.20
 * and RFC 6585 §5 for 408 and 431).
 */

/** helmet's headers, taken once from the same options the app uses, as plain name → value pairs. */
const SECURITY_HEADERS: ReadonlyArray<[string, string]> = (() => {
  const headers: [string, string][] = [];
  const sink = { setHeader: (name: string, value: string) => headers.push([name, String(value)]), removeHeader: () => undefined };
  helmet(HELMET_OPTIONS)({} as IncomingMessage, sink as unknown as ServerResponse, () => undefined);
  return headers;
})();

const REASONS: Record<number, string> = { 400: "Bad Request", 408: "Request Timeout", 431: "Request Header Fields Too Large" };

function answerOf(code: string | undefined): Problem {
  if (code === "HPE_HEADER_OVERFLOW") {
    const detail = "the request line and headers together exceed 16 KiB; a URL is never that long in this API";
    return problem(431, "headers-too-large", "Request headers too large", detail, [{ path: "headers", message: detail }]);
  }
  if (code === "ERR_HTTP_REQUEST_TIMEOUT") return problem(408, "request-timeout", "Request timeout", "the request was not received in full in time");
  return problem(400, "bad-request", "Bad request", "the request could not be read as HTTP/1.1");
}

/** fastify's `clientErrorHandler`. */
export function clientErrorHandler(error: Error & { code?: string }, socket: Duplex): void {
  if (error.code === "ECONNRESET" || !socket.writable) {
    socket.destroy();
    return;
  }
  const answer = answerOf(error.code);
  const body = JSON.stringify(answer);
  const status = answer.status;
  const head = [
    `HTTP/1.1 ${status} ${REASONS[status] ?? "Bad Request"}`,
    "Content-Type: application/problem+json; charset=utf-8",
    `Content-Length: ${Buffer.byteLength(body)}`,
    "Connection: close",
    ...SECURITY_HEADERS.map(([name, value]) => `${name}: ${value}`),
  ];
  socket.end(`${head.join("\r\n")}\r\n\r\n${body}`);
}
