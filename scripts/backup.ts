import { loadConfig, loadEnvFileIfPresent } from "../src/config.js";
import { backupDatabase } from "../src/store/backup.js";

/** npm run backup -- <file>: an online copy of DATABASE_PATH, safe while the server runs. */
const target = process.argv[2];
if (!target || target.startsWith("-")) {
  process.stderr.write("usage: npm run backup -- <backup-file>\n");
  process.exit(2);
}
try {
  loadEnvFileIfPresent();
  const config = loadConfig(process.env);
  const outcome = await backupDatabase(config.DATABASE_PATH, target);
  process.stdout.write(`${outcome.file}\n`);
} catch (err) {
  process.stderr.write(`backup failed: ${(err as Error).message}\n`);
  process.exit(1);
}
