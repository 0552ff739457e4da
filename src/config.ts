import { z } from "zod";

const schema = z.object({
  PORT: z.coerce.number().int().min(0).max(65535).default(3000),
  HOST: z.string().min(1).default("0.0.0.0"),
  LOG_LEVEL: z.enum(["fatal", "error", "warn", "info", "debug", "trace", "silent"]).default("info"),
  DATABASE_PATH: z.string().min(1).default("./data/pfc.sqlite"),
  DEMO_DATA: z.enum(["on", "off"]).default("on"),
  BODY_LIMIT_BYTES: z.coerce.number().int().min(1024).max(64 * 1024 * 1024).default(1024 * 1024),
});

export type Config = z.infer<typeof schema>;

/** Read and validate configuration; a bad value is reported with its variable name. */
export function loadConfig(env: NodeJS.ProcessEnv): Config {
  const picked = Object.fromEntries(Object.keys(schema.shape).map((k) => [k, env[k] === "" ? undefined : env[k]]));
  const parsed = schema.safeParse(picked);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join(".")}: ${i.message} (got ${JSON.stringify(picked[String(i.path[0])])})`);
    throw new Error(`invalid configuration:\n${lines.join("\n")}`);
  }
  return parsed.data;
}

export function defaultConfig(overrides: Partial<Config> = {}): Config {
  return { ...schema.parse({}), ...overrides };
}
