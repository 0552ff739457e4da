import type { FastifyError, FastifyInstance, FastifyReply, FastifyRequest } from "fastify";
import helmet from "helmet";
import { problem, sendProblem } from "./problem.js";
import { HELMET_OPTIONS } from "./security.js";

/**
 * Answers for requests that match no route: 405 with Allow when the path exists under another method, 404
 * otherwise; and problem+json for the URLs the router itself refuses (a path segment too long, a broken %-escape).
 */

const METHODS = ["GET", "HEAD", "POST", "PUT", "PATCH", "DELETE"] as const;

/** The longest path segment (route parameter) the router matches; longer ones are a 414 (fastify's default, 100). */
export const MAX_PARAM_CHARS = 100;

/**
 * The methods a concrete path answers to. OPTIONS is left out: the CORS preflight route answers it on every path,
 * so it says nothing about whether the resource exists.
 */
export function allowedMethods(app: FastifyInstance, url: string): string[] {
  const path = url.split("?")[0] ?? "";
  return METHODS.filter((method) => app.findRoute({ method, url: path }) !== null);
}

/** The not-found handler. RFC 9110 §15.5.6: a 405 must list the resource's methods in Allow. */
export function noRouteHandler(app: FastifyInstance) {
  return (request: FastifyRequest, reply: FastifyReply) => {
    const path = request.url.split("?")[0] ?? "";
    const allow = allowedMethods(app, path);
    if (allow.length > 0) {
      const detail = `${request.method} is not allowed on ${path}; allowed: ${allow.join(", ")}`;
      return sendProblem(reply.header("allow", allow.join(", ")), problem(405, "method-not-allowed", "Method not allowed", detail));
    }
    return sendProblem(reply, problem(404, "not-found", "Not found", `no route ${request.method} ${path}`));
  };
}

const securityHeaders = helmet(HELMET_OPTIONS);

/**
 * fastify's `frameworkErrors`: the router refused the URL before any hook ran, so neither the security headers
 * (helmet's onRequest hook) nor the request id (an onSend hook) are on the reply yet; both are set here.
 */
export function routerErrorHandler(error: FastifyError, request: FastifyRequest, reply: FastifyReply): FastifyReply {
  securityHeaders(request.raw, reply.raw, () => undefined);
  reply.header("x-request-id", request.id);
  if (error.code === "FST_ERR_MAX_PARAM_LENGTH") {
    const detail = `a segment of the path is longer than ${MAX_PARAM_CHARS} characters`;
    return sendProblem(reply, problem(414, "uri-too-long", "URI too long", detail, [{ path: "url", message: detail }]));
  }
  if (error.code === "FST_ERR_BAD_URL") {
    const detail = "the path holds a %-escape that does not decode to UTF-8";
    return sendProblem(reply, problem(400, "bad-request", "Bad request", detail, [{ path: "url", message: detail }]));
  }
  request.log.error({ err: error }, "router error");
  return sendProblem(reply, problem(500, "internal", "Internal error", "an unexpected error occurred; it has been logged with this request id"));
}
