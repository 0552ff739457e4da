import type { FastifyReply } from "fastify";
import type { Readiness } from "../store/ports.js";
import { problem, sendProblem } from "./problem.js";

/** Seconds a load balancer should wait before asking /ready again after a 503. */
const NOT_READY_RETRY_AFTER_S = 5;

/** GET /ready: 200 when the database answers and its schema is this build's; else 503 problem+json saying which. */
export function readyAnswer(reply: FastifyReply, r: Readiness): FastifyReply | { status: "ready"; database: "reachable"; migrations: "current" } {
  if (r.databaseReachable && r.migrationsCurrent) return { status: "ready", database: "reachable", migrations: "current" };
  const what = !r.databaseReachable ? "the database cannot be reached" : "the database schema is not the one this build expects";
  const detail = r.detail ? `${what}: ${r.detail}` : what;
  return sendProblem(reply.header("retry-after", String(NOT_READY_RETRY_AFTER_S)), problem(503, "not-ready", "Not ready", detail));
}
