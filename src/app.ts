import { randomUUID } from "node:crypto";
import Fastify, { type FastifyInstance, type FastifyServerOptions } from "fastify";
import type { Config } from "./config.js";
import { docsRoutes } from "./http/routes/docs.js";
import { sizingRoutes } from "./http/routes/sizing.js";
import { problem, ProblemError, sendProblem } from "./http/problem.js";

export interface AppOptions {
  config: Config;
  /** pino options or false; tests pass false or a silent level. */
  logger?: FastifyServerOptions["logger"];
}

/** Build the application. It never listens: src/server.ts does. */
export async function buildApp(options: AppOptions): Promise<FastifyInstance> {
  const { config } = options;
  const app = Fastify({
    logger: options.logger ?? { level: config.LOG_LEVEL },
    bodyLimit: config.BODY_LIMIT_BYTES,
    genReqId: (req) => {
      const given = req.headers["x-request-id"];
      return typeof given === "string" && /^[\w.:-]{1,128}$/.test(given) ? given : randomUUID();
    },
  });

  app.addHook("onSend", async (request, reply) => {
    reply.header("x-request-id", request.id);
  });

  app.setErrorHandler((error: Error & { code?: string; statusCode?: number }, request, reply) => {
    if (error instanceof ProblemError) return sendProblem(reply, error.problem);
    const status = error.statusCode ?? 500;
    if (error.code === "FST_ERR_CTP_BODY_TOO_LARGE" || status === 413) {
      return sendProblem(reply, problem(413, "too-large", "Request body too large", `the body exceeds ${config.BODY_LIMIT_BYTES} bytes`));
    }
    if (error.code === "FST_ERR_CTP_INVALID_MEDIA_TYPE" || status === 415) {
      return sendProblem(reply, problem(415, "unsupported-media-type", "Unsupported media type", "send the body as application/json"));
    }
    if (status >= 400 && status < 500) {
      const detail = error.code === "FST_ERR_CTP_EMPTY_JSON_BODY" ? "the body is empty; send a JSON object" : error.message;
      return sendProblem(reply, problem(status, "bad-request", "Bad request", detail, [{ path: "", message: detail }]));
    }
    request.log.error({ err: error }, "unhandled error");
    return sendProblem(reply, problem(500, "internal", "Internal error", "an unexpected error occurred; it has been logged with this request id"));
  });

  app.setNotFoundHandler((request, reply) =>
    sendProblem(reply, problem(404, "not-found", "Not found", `no route ${request.method} ${request.url.split("?")[0]}`)),
  );

  app.get("/health", async () => ({ status: "ok" }));
  await app.register(sizingRoutes);
  await app.register(docsRoutes);
  return app;
}
