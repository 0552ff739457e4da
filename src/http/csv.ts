/**
 * A tiny RFC 4180 writer: CRLF line ends; a field with a comma, quote, CR or LF is quoted, quotes doubled.
 * Every text field also goes through spreadsheetSafe; numbers are ours and are written as numbers.
 */

export type CsvValue = string | number | null | undefined;

const NEEDS_QUOTES = /[",\r\n]/;

export function csvField(value: CsvValue): string {
  if (value === null || value === undefined) return "";
  const text = typeof value === "number" ? (Number.isFinite(value) ? String(value) : "") : spreadsheetSafe(value);
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
 * Defusing text against spreadsheet formulas, after OWASP's "CSV Injection" page
 * (https://owasp.org/www-community/attacks/CSV_Injection): no cell may begin with = + - @ tab CR or LF, and, as
 * "the first character is not enough", the same holds wherever a separator or quote in the text could start a cell.
 */
const FORMULA = new Set(["=", "+", "-", "@"]);
/** OWASP's other three: a cell beginning with one of them may be trimmed down to a formula. */
const LEADING_BLANK = new Set(["\t", "\r", "\n"]);
/** After these a spreadsheet may begin a new cell: a separator it may be set to (, ; tab), a quote, a line break. */
const CELL_BREAK = new Set([",", ";", "\t", "'", '"', "\r", "\n"]);

/**
 * The text with an apostrophe — read by spreadsheets as "this cell is text" — put in front of every = + - @ that
 * a cell could begin with: at the start of the text or after a separator, quote or line break, blanks (space,
 * tab, CR, LF) in between, as a spreadsheet may trim them. Text beginning with tab, CR or LF gets one in front
 * too (OWASP's list, literally). Nothing else changes.
 */
export function spreadsheetSafe(text: string): string {
  let out = LEADING_BLANK.has(text.charAt(0)) ? "'" : "";
  let cellStart = true;
  for (const c of text) {
    if (cellStart && FORMULA.has(c)) out += "'";
    out += c;
    cellStart = CELL_BREAK.has(c) || (cellStart && c === " ");
  }
  return out;
}
