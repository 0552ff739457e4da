import cors from "@fastify/cors";
import helmet from "@fastify/helmet";
import rateLimit from "@fastify/rate-limit";
import type { FastifyInstance, FastifyRequest } from "fastify";
import { Redis } from "ioredis";
import { corsOrigins, type Config } from "../config.js";
import { problem, ProblemError } from "./problem.js";

/** The interactive docs load their own scripts and styles (and set inline styles); only there is CSP relaxed. */
export const DOCS_CSP =
  "default-src 'none'; script-src 'self'; style-src 'self' 'unsafe-inline'; img-src 'self' data:; connect-src 'self'; font-src 'self'; frame-ancestors 'none'; base-uri 'none'; form-action 'none'";

/** helmet's options for every answer: CSP default-src 'none' (the JSON API loads nothing). */
export const HELMET_OPTIONS = {
  contentSecurityPolicy: {
    useDefaults: false,
    directives: { defaultSrc: ["'none'"], frameAncestors: ["'none'"], baseUri: ["'none'"], formAction: ["'none'"] },
  },
} as const;

/** Probes a load balancer polls: never rate-limited. */
const UNLIMITED: ReadonlySet<string> = new Set(["/health", "/ready"]);

/**
 * Security headers (helmet, CSP default-src 'none' for the JSON API), CORS for the configured origins
 * and the rate limit per API key (per IP address for requests without a valid key). Registered after the
 * actor hook, so the limiter's key generator sees the key id. With REDIS_URL the counts live in Redis and hold
 * across instances (the plugin's own Redis store; if Redis fails, requests pass rather than fail); without it each
 * instance counts alone. /health and /ready are never limited: a load balancer polls them.
 */
export async function installSecurity(app: FastifyInstance, config: Config): Promise<void> {
  await app.register(helmet, { global: true, ...HELMET_OPTIONS });
  app.addHook("onSend", async (request, reply) => {
    const path = request.url.split("?")[0] ?? "";
    if (path === "/docs" || path.startsWith("/docs/")) reply.header("content-security-policy", DOCS_CSP);
  });

  const origins = corsOrigins(config.CORS_ORIGINS);
  await app.register(cors, {
    origin: origins.length > 0 ? origins : false,
    methods: ["GET", "HEAD", "POST", "PATCH", "DELETE"],
    allowedHeaders: ["authorization", "content-type", "idempotency-key", "x-request-id"],
    exposedHeaders: ["location", "x-request-id", "retry-after", "x-ratelimit-limit", "x-ratelimit-remaining", "x-ratelimit-reset"],
    maxAge: 600,
  });

  const redis = config.REDIS_URL
    ? new Redis(config.REDIS_URL, { connectTimeout: 2000, maxRetriesPerRequest: 1, enableOfflineQueue: false })
    : undefined;
  if (redis) {
    redis.on("error", (err: Error) => app.log.warn({ err }, "rate-limit store (Redis) error"));
    app.addHook("onClose", async () => {
      await redis.quit().catch(() => redis.disconnect());
    });
  }
  await app.register(rateLimit, {
    global: true,
    ...(redis ? { redis, nameSpace: "pfc-sizing-rate:", skipOnError: true } : {}),
    allowList: (request: FastifyRequest) => UNLIMITED.has(request.url.split("?")[0] ?? ""),
    hook: "onRequest",
    max: config.RATE_LIMIT_PER_MINUTE,
    timeWindow: 60_000,
    keyGenerator: (request) => (request.actor ? `key:${request.actor.actorId}` : `ip:${request.ip}`),
    errorResponseBuilder: (_request, context) => {
      const detail = `more than ${context.max} requests in a minute; retry after ${context.after}`;
      return new ProblemError(problem(429, "rate-limited", "Too many requests", detail));
    },
  });
}
