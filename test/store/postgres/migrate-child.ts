// One process migrating a database: `tsx migrate-child.ts <url> [dir]`; prints its report as JSON.
import pg from "pg";
import { migratePostgres } from "../../../src/store/postgres/migrate.js";

const [url, dir] = process.argv.slice(2);
if (!url) throw new Error("usage: migrate-child.ts <url> [dir]");
const pool = new pg.Pool({ connectionString: url, max: 1 });
try {
  console.log(JSON.stringify(await migratePostgres(pool, dir)));
} finally {
  await pool.end();
}
