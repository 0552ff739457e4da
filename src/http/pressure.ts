/**
 * Load shedding: when the event loop lags beyond EVENT_LOOP_MAX_DELAY_MS (mean delay over a sample), every request
 * but GET /health is answered 503 problem+json with Retry-After, so that a stalled service sheds work instead of
 * queueing it. /health stays answerable: a load balancer must tell "busy" from "dead".
 */
import underPressure from "@fastify/under-pressure";
import type { FastifyInstance, FastifyReply, FastifyRequest } from "fastify";
import type { Config } from "../config.js";
import { problem } from "./problem.js";

export const PRESSURE_EXEMPT_PATHS: ReadonlySet<string> = new Set(["/health"]);

type PressureConfig = Pick<Config, "EVENT_LOOP_MAX_DELAY_MS" | "EVENT_LOOP_SAMPLE_MS" | "OVERLOAD_RETRY_AFTER_S">;

export async function installPressure(app: FastifyInstance, config: PressureConfig): Promise<void> {
  if (config.EVENT_LOOP_MAX_DELAY_MS === 0) return;
  const retryAfter = config.OVERLOAD_RETRY_AFTER_S;
  await app.register(underPressure, {
    maxEventLoopDelay: config.EVENT_LOOP_MAX_DELAY_MS,
    sampleInterval: config.EVENT_LOOP_SAMPLE_MS,
    retryAfter,
    // A non-null return is sent as the answer (the plugin's typing says void; its code sends what is returned).
    pressureHandler: ((request: FastifyRequest, reply: FastifyReply, _type: string, value: number | undefined) => {
      if (PRESSURE_EXEMPT_PATHS.has(request.url.split("?")[0] as string)) return undefined;
      const lagMs = typeof value === "number" ? Math.round(value) : NaN;
      const detail = `the service's event loop lags ${lagMs} ms, above the ${config.EVENT_LOOP_MAX_DELAY_MS} ms limit; try again in ${retryAfter} s`;
      reply.code(503).header("retry-after", String(retryAfter)).type("application/problem+json");
      return { ...problem(503, "overloaded", "The service is busy", detail), instance: request.url };
    }) as unknown as (request: FastifyRequest, reply: FastifyReply, type: string, value: number | undefined) => void,
  });
}

