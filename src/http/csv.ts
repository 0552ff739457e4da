/** A tiny RFC 4180 writer: CRLF line ends; a field with a comma, quote, CR or LF is quoted, quotes doubled. */

export type CsvValue = string | number | null | undefined;

const NEEDS_QUOTES = /[",\r\n]/;

export function csvField(value: CsvValue): string {
  if (value === null || value === undefined) return "";
  const text = typeof value === "number" ? (Number.isFinite(value) ? String(value) : "") : value;
  return NEEDS_QUOTES.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

export function csvRecord(values: readonly CsvValue[]): string {
  return values.map(csvField).join(",");
}

/** The whole document; every record, the last included, ends with CRLF. */
export function toCsv(rows: readonly (readonly CsvValue[])[]): string {
  return rows.map((r) => `${csvRecord(r)}\r\n`).join("");
}

/**
 * Free text from a user that a spreadsheet would run as a formula (=, +, -, @, tab, CR first)
 * gets a leading apostrophe, the usual defence against CSV formula injection. Numbers are ours.
 */
export function spreadsheetSafe(text: string | undefined): string | undefined {
  return text !== undefined && /^[=+\-@\t\r]/.test(text) ? `'${text}` : text;
}
