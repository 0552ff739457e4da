/**
 * The service alone in its own process, for bench/interval.ts: its peak RSS (VmHWM) is then the server's, apart
 * from the client that generates and sends the file. Reads DATABASE_PATH and PFC_BOOTSTRAP_KEY from the
 * environment, prints "listening <port>" once ready, and closes on SIGTERM. The bench starts it for the sources
 * (through tsx); with BENCH_SERVER_FROM=dist it starts node dist/server.js instead, as production does.
 */
import type { AddressInfo } from "node:net";

const root = process.env.BENCH_SERVER_FROM === "dist" ? "../dist" : "../src";
const { buildApp } = (await import(`${root}/app.js`)) as typeof import("../src/app.js");
const { defaultConfig } = (await import(`${root}/config.js`)) as typeof import("../src/config.js");

const app = await buildApp({
  config: defaultConfig({
    DATABASE_PATH: process.env.DATABASE_PATH as string,
    PFC_BOOTSTRAP_KEY: process.env.PFC_BOOTSTRAP_KEY as string,
    DEMO_DATA: "off",
    LOG_LEVEL: "silent",
    RATE_LIMIT_PER_MINUTE: 10_000_000,
  }),
  logger: false,
});
await app.listen({ port: 0, host: "127.0.0.1" });
process.stdout.write(`listening ${(app.server.address() as AddressInfo).port}\n`);
process.once("SIGTERM", () => void app.close().then(() => process.exit(0)));
