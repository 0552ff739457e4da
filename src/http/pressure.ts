/**
 * Load shedding: when the event loop lags beyond EVENT_LOOP_MAX_DELAY_MS, every request but GET /health is answered
 * 503 problem+json with Retry-After, so that a stalled service sheds work instead of queueing it. /health stays
 * answerable: a load balancer must tell "busy" from "dead".
 *
 * The lag is how late a timer set every EVENT_LOOP_SAMPLE_MS fires: the time the loop could not run anything. It is
 * measured from the moment the app is ready (start-up's module loading is not load) and holds until the next tick.
 * (A mean of a delay histogram per sample, as @fastify/under-pressure reads it, has no reading at all when the loop
 * stalled through the whole sample, which is exactly when shedding matters.)
 */
import type { FastifyInstance } from "fastify";
import type { Config } from "../config.js";
import { problem } from "./problem.js";

export const PRESSURE_EXEMPT_PATHS: ReadonlySet<string> = new Set(["/health"]);

type PressureConfig = Pick<Config, "EVENT_LOOP_MAX_DELAY_MS" | "EVENT_LOOP_SAMPLE_MS" | "OVERLOAD_RETRY_AFTER_S">;

export async function installPressure(app: FastifyInstance, config: PressureConfig): Promise<void> {
  const limitMs = config.EVENT_LOOP_MAX_DELAY_MS;
  if (limitMs === 0) return;
  const sampleMs = config.EVENT_LOOP_SAMPLE_MS;
  const retryAfter = String(config.OVERLOAD_RETRY_AFTER_S);
  let lagMs = 0;
  let timer: NodeJS.Timeout | null = null;

  let last = performance.now();
  timer = setInterval(() => {
    const now = performance.now();
    lagMs = Math.max(0, now - last - sampleMs);
    last = now;
  }, sampleMs);
  timer.unref();
  // start-up (modules loading, routes compiling) is not load: what it delayed does not count
  app.addHook("onReady", async () => {
    lagMs = 0;
    last = performance.now();
  });
  app.addHook("onClose", async () => {
    if (timer) clearInterval(timer);
  });

  app.addHook("onRequest", async (request, reply) => {
    if (lagMs <= limitMs || PRESSURE_EXEMPT_PATHS.has(request.url.split("?")[0] as string)) return;
    const detail = `the service's event loop lagged ${Math.round(lagMs)} ms, above the ${limitMs} ms limit; try again in ${retryAfter} s`;
    await reply
      .code(503)
      .header("retry-after", retryAfter)
      .type("application/problem+json")
      .send({ ...problem(503, "overloaded", "The service is busy", detail), instance: request.url });
    return reply;
  });
}
