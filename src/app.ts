import { clientErrorHandler } from "./http/client-errors.js";
import { Conflict, FieldRejected, InputRejected, NotFound } from "./application/errors.js";
import { engineIssuesTo400 } from "./http/validate.js";
import { randomUUID } from "node:crypto";
import Fastify, { type FastifyInstance, type FastifyServerOptions } from "fastify";
import { trustProxyOf, type Config } from "./config.js";
import { seedDemo } from "./demo/seed.js";
import { bootstrapAdminKey } from "./auth/bootstrap.js";
import { installActor } from "./http/actor.js";
import { installSecurity } from "./http/security.js";
import { keysRoutes } from "./http/routes/keys.js";
import { auditRoutes } from "./http/routes/audit.js";
import { buildingsRoutes } from "./http/routes/buildings.js";
import { docsRoutes } from "./http/routes/docs.js";
import { formRoutes } from "./form/plugin.js";
import { harmonicsRoutes } from "./http/routes/harmonics.js";
import { intervalAnalysesRoutes } from "./http/routes/interval-analyses.js";
import { sizingRoutes } from "./http/routes/sizing.js";
import { reportRoutes } from "./http/routes/reports.js";
import { surveyReadRoutes } from "./http/routes/survey-reads.js";
import { surveysRoutes } from "./http/routes/surveys.js";
import { bankHealthRoutes } from "./http/routes/bank-health.js";
import { notFound, problem, ProblemError, sendProblem, validationProblem } from "./http/problem.js";
import { problemsRoutes } from "./http/routes/problems.js";
import { MAX_PARAM_CHARS, noRouteHandler, routerErrorHandler } from "./http/routing.js";
import { openStore } from "./store/open.js";
import type { Store } from "./store/ports.js";
import { readyAnswer } from "./http/readiness.js";
import { createHeavyWork, type HeavyWork } from "./heavy-work/pool.js";
import { installPressure } from "./http/pressure.js";
import { installOpenapi } from "./http/openapi.js";
import * as service from "./http/contracts/service.js";

declare module "fastify" {
  interface FastifyInstance {
    /** The database behind the app; closed by app.close(). */
    store: Store;
    /** Worker threads for heavy work (large scans, reports, interval analyses); stopped by app.close(). */
    heavyWork: HeavyWork;
  }
}

export interface AppOptions {
  config: Config;
  /** pino options or false; tests pass false or a silent level. */
  logger?: FastifyServerOptions["logger"];
  /** An already-open store (the app takes ownership and closes it); otherwise the configured one is opened (src/store/open.ts). */
  store?: Store;
  /** Migrations directory, for tests; the project's migrations/ by default. */
  migrationsDir?: string;
  /** Clock for stored timestamps, for tests. */
  now?: () => Date;
  /**
   * Called once with the admin key generated for a database without keys (PFC_BOOTSTRAP_KEY unset).
   * Default: one dedicated line on stdout — the only place a key is ever written; never the request log.
   */
  onGeneratedKey?: (key: string) => void;
  /** PEM certificate and key: the app serves HTTPS (src/server.ts reads them from TLS_CERT_PATH / TLS_KEY_PATH). */
  https?: { cert: Buffer; key: Buffer };
}

const printKey = (key: string) =>
  process.stdout.write(`pfc-sizing: no API key existed; the first admin key (shown this once, store it now): ${key}\n`);

/** Build the application. It never listens: src/server.ts does. */
export async function buildApp(options: AppOptions): Promise<FastifyInstance> {
  const { config } = options;
  const store =
    options.store ??
    (await openStore({
      databaseUrl: config.DATABASE_URL,
      databasePath: config.DATABASE_PATH,
      poolSize: config.DATABASE_POOL_SIZE,
      statementTimeoutMs: config.DATABASE_STATEMENT_TIMEOUT_MS,
      sslMode: config.DATABASE_SSL_MODE,
      ...(options.migrationsDir ? { migrationsDir: options.migrationsDir } : {}),
      ...(options.now ? { now: options.now } : {}),
    }));
  try {
    if (config.DEMO_DATA === "on") await seedDemo(store);
    const boot = await bootstrapAdminKey(store, config.PFC_BOOTSTRAP_KEY);
    if (boot.generated) (options.onGeneratedKey ?? printKey)(boot.generated);
    return await assemble(options, store);
  } catch (err) {
    await store.close();
    throw err;
  }
}

async function assemble(options: AppOptions, store: Store): Promise<FastifyInstance> {
  const { config } = options;
  const app = Fastify({
    ...(options.https ? { https: options.https } : {}),
    logger: options.logger ?? { level: config.LOG_LEVEL, redact: ["req.headers.authorization"] },
    trustProxy: trustProxyOf(config.TRUST_PROXY),
    bodyLimit: config.BODY_LIMIT_BYTES,
    requestTimeout: config.REQUEST_TIMEOUT_MS,
    connectionTimeout: config.REQUEST_TIMEOUT_MS,
    routerOptions: { maxParamLength: MAX_PARAM_CHARS },
    frameworkErrors: (error, request, reply) => void routerErrorHandler(error, request, reply),
    clientErrorHandler,
    genReqId: (req) => {
      const given = req.headers["x-request-id"];
      return typeof given === "string" && /^[\w.:-]{1,128}$/.test(given) ? given : randomUUID();
    },
  });

  // Before every other hook: a lagging loop sheds requests before they cost anything.
  await installPressure(app, config);
  const heavyWork = createHeavyWork({
    threads: config.HEAVY_WORK_THREADS,
    maxQueue: config.HEAVY_WORK_QUEUE,
    retryAfterS: config.OVERLOAD_RETRY_AFTER_S,
  });
  app.decorate("heavyWork", heavyWork);
  app.addHook("onClose", async () => heavyWork.close());

  // JSON only by default: a text/plain body is a 415, not a string handed to a JSON route.
  app.removeContentTypeParser("text/plain");

  app.addHook("onSend", async (request, reply) => {
    reply.header("x-request-id", request.id);
  });

  app.setErrorHandler((error: Error & { code?: string; statusCode?: number }, request, reply) => {
    if (error instanceof ProblemError) return sendProblem(reply.headers(error.headers), error.problem);
    if (error instanceof InputRejected) return sendProblem(reply, engineIssuesTo400(error.issues).problem);
    if (error instanceof NotFound) return sendProblem(reply, notFound(error.what));
    if (error instanceof FieldRejected) return sendProblem(reply, validationProblem([{ path: error.path, message: error.message }]));
    if (error instanceof Conflict) {
      const errors = error.path ? [{ path: error.path, message: error.message }] : undefined;
      if (error.reason === "last_admin_key") return sendProblem(reply, problem(409, "last-admin-key", "Conflict", error.message, errors));
      return sendProblem(reply, problem(409, "write-conflict", "Changed while being written", error.message, errors));
    }
    const status = error.statusCode ?? 500;
    if (error.code === "FST_ERR_CTP_BODY_TOO_LARGE" || status === 413) {
      const limit = request.routeOptions?.bodyLimit ?? config.BODY_LIMIT_BYTES;
      const detail = `the body exceeds ${limit} bytes`;
      return sendProblem(reply, problem(413, "too-large", "Request body too large", detail, [{ path: "", message: detail }]));
    }
    if (error.code === "FST_ERR_CTP_INVALID_MEDIA_TYPE" || status === 415) {
      const detail = `content type ${JSON.stringify(request.headers["content-type"] ?? "")} is not accepted here; send application/json`;
      return sendProblem(reply, problem(415, "unsupported-media-type", "Unsupported media type", detail, [{ path: "", message: detail }]));
    }
    if (status >= 400 && status < 500) {
      const detail = error.code === "FST_ERR_CTP_EMPTY_JSON_BODY" ? "the body is empty; send a JSON object" : error.message;
      return sendProblem(reply, problem(status, "bad-request", "Bad request", detail, [{ path: "", message: detail }]));
    }
    request.log.error({ err: error }, "unhandled error");
    return sendProblem(reply, problem(500, "internal", "Internal error", "an unexpected error occurred; it has been logged with this request id"));
  });

  app.setNotFoundHandler(noRouteHandler(app));

  app.decorate("store", store);
  app.addHook("onClose", async () => store.close());
  await installOpenapi(app);
  installActor(app, store);
  await installSecurity(app, config);

  app.get("/health", { schema: service.health }, async () => ({ status: "ok" }));
  app.get("/ready", { schema: service.ready }, async (_request, reply) => readyAnswer(reply, await store.readiness()));
  await app.register(sizingRoutes);
  await app.register(intervalAnalysesRoutes, { store });
  await app.register(harmonicsRoutes);
  await app.register(buildingsRoutes, { store });
  await app.register(surveysRoutes, { store });
  await app.register(surveyReadRoutes, { store });
  await app.register(bankHealthRoutes, { store });
  await app.register(reportRoutes, { store });
  await app.register(auditRoutes, { store });
  await app.register(keysRoutes, { store });
  await app.register(docsRoutes);
  await app.register(problemsRoutes);
  await app.register(formRoutes);
  return app;
}
