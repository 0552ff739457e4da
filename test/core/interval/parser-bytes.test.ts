import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { createIntervalParser, type ParseOutcome } from "../../../src/core/interval/parser.js";
import { parse } from "./parse-helpers.js";

/** Feed UTF-8 bytes cut at the given lengths (cuts may fall inside a character or the byte-order mark). */
function parseBytes(bytes: Uint8Array, cuts: number[]): ParseOutcome {
  const p = createIntervalParser({ maxBadRowFraction: 1 });
  for (let i = 0, k = 0; i < bytes.length; k++) {
    const len = cuts[k % cuts.length] as number;
    p.pushBytes(bytes.slice(i, i + len));
    i += len;
  }
  return p.end();
}

const plain = (o: ParseOutcome) => JSON.parse(JSON.stringify(o, (_k, v: unknown) => (v instanceof Float64Array ? Array.from(v) : v)));

describe("the parser fed bytes", () => {
  it("gives the same outcome wherever the byte splits fall, inside characters too (reference: the upload pushed whole as text)", () => {
    const cell = fc.constantFrom("2026-03-01 00:15", "2026-03-01T00:30:00Z", "12.5", "-3", "ünï", "😀", '"4,5"', "", "x");
    const row = fc.array(cell, { minLength: 3, maxLength: 4 }).map((c) => c.join(","));
    fc.assert(
      fc.property(
        fc.array(row, { maxLength: 30 }),
        fc.array(fc.integer({ min: 1, max: 9 }), { minLength: 1, maxLength: 5 }),
        fc.boolean(),
        (rows, cuts, crlf) => {
          const text = ["timestamp,kW,kvar", "2026-03-01 00:00,1,1", ...rows, "2026-03-01 01:00,2,2"].join(crlf ? "\r\n" : "\n");
          const bytes = new TextEncoder().encode(text);
          expect(plain(parseBytes(bytes, cuts))).toEqual(plain(parse(text, { maxBadRowFraction: 1 })));
        },
      ),
      { numRuns: 300 },
    );
  });

  it("drops a byte-order mark at the start, even split over chunks, and keeps the header (hand)", () => {
    const bytes = new TextEncoder().encode("\uFEFFtimestamp,kW,kvar\n2026-03-01 00:00,1,1\n2026-03-01 00:15,1,1\n");
    expect(bytes.slice(0, 3)).toEqual(Uint8Array.from([0xef, 0xbb, 0xbf]));
    for (const cuts of [[1], [2], [3], [1, 1, 40], [64]]) {
      const out = parseBytes(bytes, cuts);
      expect(out.ok && out.report.header).toEqual(["timestamp", "kW", "kvar"]);
      expect(out.ok && out.series.length).toBe(2);
    }
  });

  it("quotes a bad value's text from its bytes, cut to 40 characters (hand)", () => {
    const out = parseBytes(
      new TextEncoder().encode(`timestamp,kW,kvar\n2026-03-01 00:00,1,1\n2026-03-01 00:15,${"é".repeat(50)},1\n2026-03-01 00:30,1,1\n`),
      [7],
    );
    expect(out.report.badRows.first[0]).toMatchObject({ line: 3, column: "kW", value: "é".repeat(40) });
  });
});
