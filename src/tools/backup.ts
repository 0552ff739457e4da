import { loadConfig, loadEnvFileIfPresent } from "../config.js";
import { backupDatabase } from "../store/sqlite/backup.js";

/**
 * An online copy of DATABASE_PATH, safe while the server runs: `npm run backup -- <file>` from the sources, or
 * `node dist/tools/backup.js <file>` compiled (the image carries it; no dev dependency needed). SQLite only: for
 * PostgreSQL (DATABASE_URL set) use pg_dump, as the README says.
 */
const target = process.argv[2];
if (!target || target.startsWith("-")) {
  process.stderr.write("usage: npm run backup -- <backup-file>   (compiled: node dist/tools/backup.js <backup-file>)\n");
  process.exit(2);
}
try {
  loadEnvFileIfPresent();
  const config = loadConfig(process.env);
  if (config.DATABASE_URL) throw new Error("DATABASE_URL is set: the store is PostgreSQL; back it up with pg_dump (see the README)");
  const outcome = await backupDatabase(config.DATABASE_PATH, target);
  process.stdout.write(`${outcome.file}\n`);
} catch (err) {
  process.stderr.write(`backup failed: ${(err as Error).message}\n`);
  process.exit(1);
}
