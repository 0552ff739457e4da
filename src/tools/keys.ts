import { parseArgs } from "node:util";
import { issueKey, organisationNamed } from "../auth/bootstrap.js";
import { ROLES, type Role } from "../auth/keys.js";
import { loadConfig, loadEnvFileIfPresent } from "../config.js";
import { openStore, storeLocation } from "../store/open.js";
import { DEFAULT_ORG_ID } from "../store/ports.js";

/**
 * npm run keys -- create (compiled: node dist/tools/keys.js create …; no dev dependency needed)
 * --role <admin|surveyor|auditor> [--org <name>] [--label <text>]
 * Works offline on the configured store (DATABASE_URL or DATABASE_PATH; migrated first). --org names an organisation, created when new; without it
 * the key belongs to the first organisation. The key is printed once, alone on the last line; only its hash is stored.
 */
const USAGE = `usage: npm run keys -- create --role <${ROLES.join("|")}> [--org <organisation name>] [--label <text>]\n`;

function fail(message: string, code = 2): never {
  process.stderr.write(`${message}\n`);
  process.exit(code);
}

let parsed;
try {
  parsed = parseArgs({
    args: process.argv.slice(2),
    allowPositionals: true,
    options: { role: { type: "string" }, org: { type: "string" }, label: { type: "string" } },
  });
} catch (err) {
  fail(`${(err as Error).message}\n${USAGE}`);
}
const { positionals, values } = parsed;
if (positionals.length !== 1 || positionals[0] !== "create") fail(USAGE);
const role = values.role as Role | undefined;
if (!role || !(ROLES as readonly string[]).includes(role)) fail(`--role must be one of ${ROLES.join(", ")}\n${USAGE}`);
const orgName = values.org?.trim();
if (values.org !== undefined && (!orgName || orgName.length > 200)) fail(`--org must be a name of 1 to 200 characters\n${USAGE}`);
const label = values.label?.trim() || null;
if (label !== null && label.length > 100) fail("--label must be at most 100 characters");

let config;
try {
  loadEnvFileIfPresent();
  config = loadConfig(process.env);
} catch (err) {
  fail((err as Error).message);
}
try {
  const store = await openStore({
    databaseUrl: config.DATABASE_URL,
    databasePath: config.DATABASE_PATH,
    poolSize: 1,
    statementTimeoutMs: config.DATABASE_STATEMENT_TIMEOUT_MS,
    sslMode: config.DATABASE_SSL_MODE,
  });
  try {
    const org = orgName
      ? await organisationNamed(store, orgName)
      : { id: DEFAULT_ORG_ID, name: (await store.keys.organisation(DEFAULT_ORG_ID))?.name ?? DEFAULT_ORG_ID, created: false };
    const issued = await issueKey(store, { orgId: org.id, role, label, createdBy: "cli" });
    process.stdout.write(
      `${org.created ? "created organisation" : "organisation"} "${org.name}" (${org.id})\n` +
        `created ${role} key ${issued.record.id}; it is shown this once, store it now:\n${issued.key}\n`,
    );
  } finally {
    await store.close();
  }
} catch (err) {
  fail(`keys (${storeLocation({ databaseUrl: config.DATABASE_URL, databasePath: config.DATABASE_PATH })}): ${(err as Error).message}`, 1);
}
