import pg from "pg";

/** What a repository needs: a pool (each call its own statement) or one transaction's client. */
export interface Sql {
  query<R extends pg.QueryResultRow = pg.QueryResultRow>(text: string, values?: unknown[]): Promise<pg.QueryResult<R>>;
}

const TIMESTAMPTZ_OID = 1184;
const INT8_OID = 20;
const NUMERIC_OID = 1700;
const parseTimestamptz = pg.types.getTypeParser(TIMESTAMPTZ_OID) as (text: string) => Date;

/**
 * Values as the SQLite store hands them out: instants as `Date.toISOString()` strings (UTC, milliseconds; every
 * instant the service writes is such a string, so it reads back unchanged), counts and identity ids as numbers
 * (they stay far below 2^53). Per pool, not pg's global parsers, so nothing else in the process is affected.
 */
export const rowTypes: pg.CustomTypesConfig = {
  getTypeParser: ((oid: number, format?: "text" | "binary") => {
    if (oid === TIMESTAMPTZ_OID) return (text: string) => parseTimestamptz(text).toISOString();
    if (oid === INT8_OID || oid === NUMERIC_OID) return (text: string) => Number(text);
    return format === "binary" ? pg.types.getTypeParser(oid, "binary") : pg.types.getTypeParser(oid, "text");
  }) as pg.CustomTypesConfig["getTypeParser"],
};

export async function one<R extends pg.QueryResultRow>(sql: Sql, text: string, values: unknown[]): Promise<R | undefined> {
  return (await sql.query<R>(text, values)).rows[0];
}

export async function all<R extends pg.QueryResultRow>(sql: Sql, text: string, values: unknown[]): Promise<R[]> {
  return (await sql.query<R>(text, values)).rows;
}

/** JSON for a jsonb parameter (pg would send a JS array as a PostgreSQL array). */
export const jsonb = (value: unknown): string => JSON.stringify(value);

/** The URL without its password, for logs and /ready. */
export function redactedUrl(url: string): string {
  try {
    const u = new URL(url);
    if (u.password) u.password = "***";
    return u.toString();
  } catch {
    return "the DATABASE_URL (not a URL)";
  }
}
