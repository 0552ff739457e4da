import { describe, expect, it } from "vitest";
import { csvField, csvRecord, spreadsheetSafe, toCsv } from "../../src/http/csv.js";

/** Reads RFC 4180 back, to check that what the writer emits round-trips. */
function parseCsv(text: string): string[][] {
  const rows: string[][] = [];
  let row: string[] = [];
  let field = "";
  let quoted = false;
  for (let i = 0; i < text.length; i++) {
    const c = text[i];
    if (quoted) {
      if (c === '"' && text[i + 1] === '"') (field += '"'), i++;
      else if (c === '"') quoted = false;
      else field += c;
    } else if (c === '"') quoted = true;
    else if (c === ",") row.push(field), (field = "");
    else if (c === "\r" && text[i + 1] === "\n") row.push(field), rows.push(row), (row = []), (field = ""), i++;
    else field += c;
  }
  return rows;
}

describe("CSV writer", () => {
  it("leaves plain fields bare and writes numbers as numbers", () => {
    expect(csvRecord(["abc", 12.5, -3, 0, "x y"])).toBe("abc,12.5,-3,0,x y");
  });

  it("quotes fields holding a comma, quote, CR or LF and doubles quotes", () => {
    expect(csvField("a,b")).toBe('"a,b"');
    expect(csvField('say "hi"')).toBe('"say ""hi"""');
    expect(csvField("line1\nline2")).toBe('"line1\nline2"');
    expect(csvField("cr\ronly")).toBe('"cr\ronly"');
    expect(csvField('"')).toBe('""""');
  });

  it("writes empty fields for null, undefined and non-finite numbers", () => {
    expect(csvRecord([null, undefined, Number.NaN, Infinity, ""])).toBe(",,,,");
  });

  it("ends every record with CRLF, the last included", () => {
    expect(toCsv([["a", "b"], ["1", "2"]])).toBe("a,b\r\n1,2\r\n");
    expect(toCsv([])).toBe("");
  });

  it("round-trips awkward text through a reader", () => {
    const rows = [["h1", "h2", "h3"], ['Pump, "north"\r\nbay', "", "plain"], ["é ünïcode", ",", '""']];
    expect(parseCsv(toCsv(rows))).toEqual(rows);
  });

  it("defuses text a spreadsheet would run as a formula", () => {
    expect(spreadsheetSafe("=SUM(A1)")).toBe("'=SUM(A1)");
    expect(spreadsheetSafe("+1")).toBe("'+1");
    expect(spreadsheetSafe("-x")).toBe("'-x");
    expect(spreadsheetSafe("@cmd")).toBe("'@cmd");
    expect(spreadsheetSafe("Pump 1")).toBe("Pump 1");
    expect(spreadsheetSafe(undefined)).toBeUndefined();
  });
});
