import { utcInstantOf } from "../application/instants.js";
import { z } from "zod";
import { problem, ProblemError, validationProblem } from "./problem.js";

/** Opaque cursors, page sizes and date bounds shared by the list endpoints. */

export const DEFAULT_LIMIT = 20;
export const MAX_LIMIT = 100;

export function parseLimit(raw: string | undefined): number {
  if (raw === undefined || raw === "") return DEFAULT_LIMIT;
  const n = Number(raw);
  if (!/^\d+$/.test(raw) || !Number.isInteger(n) || n < 1 || n > MAX_LIMIT) {
    throw new ProblemError(validationProblem([{ path: "limit", message: `limit must be a whole number from 1 to ${MAX_LIMIT}` }]));
  }
  return n;
}

/** A cursor is base64url JSON tagged with the list it belongs to, so one list's cursor is refused by another. */
export function encodeCursor(kind: string, position: Record<string, string | number>): string {
  return Buffer.from(JSON.stringify({ k: kind, ...position }), "utf8").toString("base64url");
}

export function decodeCursor<S extends z.ZodType>(kind: string, schema: S, raw: string | undefined): z.infer<S> | undefined {
  if (raw === undefined || raw === "") return undefined;
  let value: unknown;
  try {
    value = JSON.parse(Buffer.from(raw, "base64url").toString("utf8"));
  } catch {
    value = undefined;
  }
  const parsed = schema.safeParse(value);
  if (!parsed.success || (value as { k?: unknown }).k !== kind) {
    throw new ProblemError(
      validationProblem([{ path: "cursor", message: "cursor is not valid for this list: pass the nextCursor of the previous page unchanged" }]),
    );
  }
  return parsed.data;
}

/** `limit + 1` rows were fetched: the page, and the cursor of its last item when there are more. */
export function pageOf<T>(rows: T[], limit: number, cursorOf: (last: T) => string): { items: T[]; nextCursor: string | null } {
  const items = rows.slice(0, limit);
  const last = items[items.length - 1];
  return { items, nextCursor: rows.length > limit && last !== undefined ? cursorOf(last) : null };
}

/** The UTC instant of an ISO date or date-time; a date alone is its start, or its end with `end`. */
export function utcInstant(iso: string, end = false): string {
  const utc = utcInstantOf(iso, end);
  if (utc === null) throw new ProblemError(problem(400, "validation", "The request is not valid", `${iso} is not a valid instant`));
  return utc;
}

/** from/to query bounds as inclusive UTC instants; from after to is a 400. */
export function rangeOf(q: { from?: string; to?: string }): { fromUtc?: string; toUtc?: string } {
  const fromUtc = q.from === undefined ? undefined : utcInstant(q.from);
  const toUtc = q.to === undefined ? undefined : utcInstant(q.to, true);
  if (fromUtc && toUtc && fromUtc > toUtc) {
    throw new ProblemError(validationProblem([{ path: "from", message: `from (${q.from}) is after to (${q.to})` }]));
  }
  return { ...(fromUtc ? { fromUtc } : {}), ...(toUtc ? { toUtc } : {}) };
}
