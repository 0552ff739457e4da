import type { FastifyReply } from "fastify";
import type { z } from "zod";
import type { ProblemSlug } from "./problem-types.js";

/** RFC 9457 problem details. `errors` names each offending field by its dotted path. */
export interface Problem {
  type: string;
  title: string;
  status: number;
  detail: string;
  instance?: string;
  errors?: { path: string; message: string }[];
}

/**
 * Problem types are pages of this service (GET /problems/<slug>), named by a path-absolute reference resolved
 * against the request's URI: the service does not know the host it is reached by. RFC 9457 §3.1.1 prefers absolute
 * URIs where possible and, for a relative one, the full path, as here (recalled from the RFC, not quoted).
 */
export const PROBLEM_BASE = "/problems/";

export class ProblemError extends Error {
  constructor(
    readonly problem: Problem,
    /** Headers the answer carries, e.g. WWW-Authenticate on a 401. */
    readonly headers: Record<string, string> = {},
  ) {
    super(problem.detail);
  }
}

export function problem(status: number, slug: ProblemSlug, title: string, detail: string, errors?: Problem["errors"]): Problem {
  return { type: PROBLEM_BASE + slug, title, status, detail, ...(errors ? { errors } : {}) };
}

export function sendProblem(reply: FastifyReply, p: Problem): FastifyReply {
  return reply
    .code(p.status)
    .type("application/problem+json")
    .send({ ...p, instance: reply.request.url });
}

export function pathOf(path: readonly PropertyKey[]): string {
  return path.map((k) => String(k)).join(".");
}

export function validationProblem(errors: { path: string; message: string }[]): Problem {
  const first = errors[0];
  const detail = errors.length === 1 && first ? `${first.path || "body"}: ${first.message}` : `${errors.length} fields are invalid; see errors`;
  return problem(400, "validation", "The request is not valid", detail, errors);
}

/** One error per offending field; an unknown key is reported at its own path, not its parent's. */
export function zodErrors(error: z.ZodError, prefix: (string | number)[] = []): { path: string; message: string }[] {
  return error.issues.flatMap((i) =>
    i.code === "unrecognized_keys"
      ? i.keys.map((k) => ({ path: pathOf([...prefix, ...i.path, k]), message: `unknown field "${k}"` }))
      : [{ path: pathOf([...prefix, ...i.path]), message: i.message }],
  );
}

export const notFound = (what: string) => problem(404, "not-found", "Not found", `${what} was not found`);
