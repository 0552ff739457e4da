import { readFileSync } from "node:fs";
import { buildApp } from "./app.js";
import { loadConfig } from "./config.js";
import { storeLocation } from "./store/open.js";

let config;
try {
  config = loadConfig(process.env);
} catch (err) {
  process.stderr.write(`pfc-sizing: ${(err as Error).message}\n`);
  process.exit(2);
}

// HTTPS when both TLS paths are set (the config checks they come together); a file that cannot be read stops here.
let https: { cert: Buffer; key: Buffer } | undefined;
if (config.TLS_CERT_PATH && config.TLS_KEY_PATH) {
  try {
    https = { cert: readFileSync(config.TLS_CERT_PATH), key: readFileSync(config.TLS_KEY_PATH) };
  } catch (err) {
    process.stderr.write(`pfc-sizing: cannot read the TLS certificate or key: ${(err as Error).message}\n`);
    process.exit(2);
  }
}

let app: Awaited<ReturnType<typeof buildApp>>;
try {
  app = await buildApp({ config, ...(https ? { https } : {}) });
} catch (err) {
  // e.g. a database from a newer version, a failed migration, an unwritable DATABASE_PATH
  const where = storeLocation({ databaseUrl: config.DATABASE_URL, databasePath: config.DATABASE_PATH });
  process.stderr.write(`pfc-sizing: cannot start with the database at ${where}: ${(err as Error).message}\n`);
  process.exit(1);
}
/**
 * Graceful shutdown: app.close() stops accepting connections, lets the requests in flight finish, then closes the
 * store (its onClose hook). Requests still running after SHUTDOWN_TIMEOUT_MS are cut: their connections are closed,
 * the store is closed (no write of theirs is acknowledged after that) and the process exits with 1.
 */
let closing = false;
for (const signal of ["SIGTERM", "SIGINT"] as const) {
  process.on(signal, () => {
    if (closing) return;
    closing = true;
    app.log.info({ signal, timeoutMs: config.SHUTDOWN_TIMEOUT_MS }, "shutting down: draining requests in flight");
    const timer = setTimeout(() => {
      app.log.warn({ timeoutMs: config.SHUTDOWN_TIMEOUT_MS }, "requests still in flight at the shutdown timeout: cut");
      app.server.closeAllConnections();
      app.store.close().then(
        () => process.exit(1),
        () => process.exit(1),
      );
    }, config.SHUTDOWN_TIMEOUT_MS);
    app.close().then(
      () => {
        clearTimeout(timer);
        process.exit(0);
      },
      (err) => {
        app.log.error({ err }, "error during shutdown");
        process.exit(1);
      },
    );
  });
}

try {
  await app.listen({ port: config.PORT, host: config.HOST });
} catch (err) {
  app.log.fatal({ err }, "could not start");
  process.exit(1);
}
