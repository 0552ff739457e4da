import fc from "fast-check";
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
      if (c === '"' && text[i + 1] === '"') ((field += '"'), i++);
      else if (c === '"') quoted = false;
      else field += c;
    } else if (c === '"') quoted = true;
    else if (c === ",") (row.push(field), (field = ""));
    else if (c === "\r" && text[i + 1] === "\n") (row.push(field), rows.push(row), (row = []), (field = ""), i++);
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
    expect(
      toCsv([
        ["a", "b"],
        ["1", "2"],
      ]),
    ).toBe("a,b\r\n1,2\r\n");
    expect(toCsv([])).toBe("");
  });

  it("round-trips awkward text through a reader", () => {
    const rows = [
      ["h1", "h2", "h3"],
      ['Pump, "north"\r\nbay', "", "plain"],
      ["é ünïcode", ",", '""'],
    ];
    expect(parseCsv(toCsv(rows))).toEqual(rows);
  });

  // OWASP, "CSV Injection" (https://owasp.org/www-community/attacks/CSV_Injection): no cell may begin with
  // = + - @ tab (0x09) CR (0x0D) LF (0x0A); and separators (',' ';') and quotes in the text can start a cell too.
  const FORMULA = ["=", "+", "-", "@"];
  const OWASP_LIST = [...FORMULA, "\t", "\r", "\n"];

  it("defuses text that begins with any character OWASP lists", () => {
    for (const c of OWASP_LIST) expect(spreadsheetSafe(`${c}SUM(A1)`), JSON.stringify(c)).toBe(`'${c}SUM(A1)`);
    expect(spreadsheetSafe("\t=1")).toBe("'\t'=1"); // a spreadsheet trimming the tab would see '=1
    expect(spreadsheetSafe("  =1+1")).toBe("  '=1+1"); // for spreadsheets that trim leading spaces
    expect(spreadsheetSafe("Pump 1")).toBe("Pump 1");
    expect(spreadsheetSafe("MCC-2 feeder")).toBe("MCC-2 feeder"); // a minus inside a word starts no cell
    expect(spreadsheetSafe("")).toBe("");
  });

  it("defuses a cell that a separator or quote could start inside the text (OWASP: the first character is not enough)", () => {
    // a spreadsheet set to ';' splits here, whatever the RFC 4180 quoting says
    expect(spreadsheetSafe(";=HYPERLINK(1)")).toBe(";'=HYPERLINK(1)");
    expect(spreadsheetSafe("Press line;=1+2")).toBe("Press line;'=1+2");
    expect(spreadsheetSafe("a, -5 kvar")).toBe("a, '-5 kvar");
    expect(spreadsheetSafe("a\t+1")).toBe("a\t'+1");
    expect(spreadsheetSafe("a;\t@x")).toBe("a;\t'@x");
    expect(spreadsheetSafe('x"@y')).toBe(`x"'@y`);
    expect(spreadsheetSafe("x'=y")).toBe("x''=y");
    expect(spreadsheetSafe("line\n=1")).toBe("line\n'=1");
    expect(spreadsheetSafe("line\r\n-1")).toBe("line\r\n'-1");
    expect(spreadsheetSafe('Pump, "north"\r\nbay')).toBe('Pump, "north"\r\nbay');
    expect(spreadsheetSafe("a;b, c")).toBe("a;b, c");
  });

  it("csvField defuses text and leaves numbers alone; the OWASP examples' payloads stay one text cell", () => {
    expect(csvField("=1+2")).toBe("'=1+2");
    expect(csvField(-3)).toBe("-3");
    // OWASP's two examples, through our writer (RFC 4180 quoting plus the guard at every cell start)
    expect(csvField('=1+2";=1+2')).toBe(`"'=1+2"";'=1+2"`);
    expect(csvField(`=1+2'" ;,=1+2`)).toBe(`"'=1+2'"" ;,'=1+2"`);
  });

  it("property: split on any separator, quote or line break, no piece begins a formula once trimmed; only apostrophes are added", () => {
    const risky = fc.constantFrom("=", "+", "-", "@", "\t", "\r", "\n", ",", ";", "'", '"', " ", "a", "1");
    // not on ': the apostrophe is the guard's own mark (a user's ' still counts as a cell start, see above)
    const splitters: (string | RegExp)[] = [",", ";", "\t", '"', /\r\n|\r|\n/];
    fc.assert(
      fc.property(
        fc.array(risky, { maxLength: 12 }).map((cs) => cs.join("")),
        (text) => {
          const safe = spreadsheetSafe(text);
          expect(safe.replace(/'/g, "")).toBe(text.replace(/'/g, ""));
          expect(OWASP_LIST.includes(safe.charAt(0)), JSON.stringify(safe)).toBe(false);
          for (const sep of splitters) {
            for (const piece of safe.split(sep)) {
              const first = piece.replace(/^[ \t\r\n]+/, "").charAt(0);
              expect(FORMULA.includes(first), `${JSON.stringify(text)} → ${JSON.stringify(safe)} split on ${String(sep)}`).toBe(false);
            }
          }
        },
      ),
      { numRuns: 2000 },
    );
  });
});
