import { readFileSync } from "node:fs";
import { buildApp } from "./app.js";
import { loadConfig } from "./config.js";

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
  process.stderr.write(`pfc-sizing: cannot start with the database at ${config.DATABASE_PATH}: ${(err as Error).message}\n`);
  process.exit(1);
}
let closing = false;
for (const signal of ["SIGTERM", "SIGINT"] as const) {
  process.on(signal, () => {
    if (closing) return;
    closing = true;
    app.log.info({ signal }, "shutting down");
    app.close().then(
      () => process.exit(0),
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
