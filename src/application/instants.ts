const DATE_ONLY = /^\d{4}-\d{2}-\d{2}$/;

/** The UTC instant of an ISO date or date-time (a date alone is its start, or its end with `end`); null when not a date. */
export function utcInstantOf(iso: string, end = false): string | null {
  const text = DATE_ONLY.test(iso) ? `${iso}T${end ? "23:59:59.999" : "00:00:00.000"}Z` : iso;
  const ms = Date.parse(text);
  return Number.isNaN(ms) ? null : new Date(ms).toISOString();
}
