import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { createIntervalParser, type ParseOptions, type ParseOutcome } from "../../../src/core/interval/parser.js";
import { expectClose } from "../../helpers/tolerance.js";
import { ITOL } from "./fixtures.js";

function parse(text: string, opts: ParseOptions = {}, chunk = 0): ParseOutcome {
  const p = createIntervalParser(opts);
  if (chunk <= 0) p.push(text);
  else for (let i = 0; i < text.length; i += chunk) p.push(text.slice(i, i + chunk));
  return p.end();
}
function ok(text: string, opts: ParseOptions = {}) {
  const out = parse(text, opts);
  if (!out.ok) throw new Error(`refused: ${out.fatal.message} ${JSON.stringify(out.fatal.issues)}`);
  return out;
}
const Z = (s: string) => Date.parse(s);

/** 20 rows of 15-minute data from 2026-03-01 00:00Z, kW 100 + i, kvar 50 + i. */
function rows15(n = 20, header = "timestamp,kW,kvar", f = (i: number) => `${new Date(Z("2026-03-01T00:00:00Z") + i * 900_000).toISOString()},${100 + i},${50 + i}`) {
  return [header, ...Array.from({ length: n }, (_, i) => f(i))].join("\n") + "\n";
}

describe("header detection", () => {
  it.each([
    ["Timestamp,Demand kW,kVAr", "kW_kvar", { timestamp: "Timestamp", kW: "Demand kW", kvar: "kVAr" }],
    ["time;kW;PF", "kW_pf", { timestamp: "time", kW: "kW", pf: "PF" }],
    ['"Interval End","kW (avg)","kVA"', "kW_kVA", { timestamp: "Interval End", kW: "kW (avg)", kVA: "kVA" }],
    ["Date/Time,Active Power kW,Power Factor,PF Sense", "kW_pf", { timestamp: "Date/Time", kW: "Active Power kW", pf: "Power Factor", sense: "PF Sense" }],
  ])("%s → %s", (header, method, columns) => {
    const delim = header.includes(";") ? ";" : ",";
    const value = method === "kW_pf" ? "0.9" : method === "kW_kVA" ? "150" : "40";
    const extra = header.includes("Sense") ? `${delim}lagging` : "";
    const text = `${header}\n2026-03-01 00:00${delim}100${delim}${value}${extra}\n2026-03-01 00:15${delim}100${delim}${value}${extra}\n`;
    const out = ok(text);
    expect(out.report.method).toBe(method);
    expect(out.report.columns).toEqual(columns);
  });

  it("joins split date and time columns", () => {
    const out = ok("Date,Time,kW,kvar\n2026-03-01,00:00,100,40\n2026-03-01,00:15,110,45\n");
    expect(out.report.columns).toMatchObject({ date: "Date", time: "Time" });
    expect(Array.from(out.series.timestampsMs)).toEqual([Z("2026-03-01T00:00:00Z"), Z("2026-03-01T00:15:00Z")]);
  });

  it("skips a meter's preamble before the header, and a BOM", () => {
    const out = ok("\uFEFFMeter 0042 export\nSite: plant 3\n\ntimestamp,kW,kvar\n2026-03-01 00:00,1,1\n2026-03-01 00:15,1,1\n");
    expect(out.report.preambleLines).toBe(2);
    expect(out.report.blankLines).toBe(1);
    expect(out.series.length).toBe(2);
  });

  it("takes overrides by name (case-insensitive) or 1-based number, and they choose the method", () => {
    const text = "Reading time,load kW,kW max,kvar,PF\n2026-03-01 00:00,100,120,40,0.8\n2026-03-01 00:15,100,120,40,0.8\n";
    const auto = ok(text);
    expect(auto.report.columns).toMatchObject({ timestamp: "Reading time", kW: "load kW", kvar: "kvar" });
    expect(auto.report.notes.join(" ")).toMatch(/also matching: "kW max"/);
    const over = ok(text, { timestampColumn: "READING TIME", kWColumn: "3", pfColumn: "pf" });
    expect(over.report.method).toBe("kW_pf");
    expect(over.report.columns).toMatchObject({ kW: "kW max", pf: "PF" });
    // hand: Q = 120·√(1 − 0.8²)/0.8 = 120·0.75 = 90 kvar
    expectClose(over.series.kvar[0], 90, ITOL.exact, "kvar from kW and PF");
  });

  it("names the field when a column is missing or an override matches nothing", () => {
    const a = parse("time,kW\n2026-03-01 00:00,1\n");
    expect(a.ok).toBe(false);
    if (!a.ok) {
      expect(a.fatal.kind).toBe("header");
      expect(a.fatal.issues.map((i) => i.path)).toEqual(["kvarColumn"]);
    }
    const b = parse("time,kW,kvar\n2026-03-01 00:00,1,1\n", { kvarColumn: "Q" });
    expect(!b.ok && b.fatal.issues[0]).toMatchObject({ path: "kvarColumn", message: expect.stringMatching(/no column named "Q"/) });
    const c = parse("time,kW,kvar\n", { kWColumn: "kvar" });
    expect(!c.ok && c.fatal.issues[0]?.message).toMatch(/already used/);
  });

  it("reads semicolon files with decimal commas", () => {
    const out = ok("Timestamp;Wirkleistung kW;Blindleistung kvar\n01.03.2026 00:00;100,5;40,25\n01.03.2026 00:15;101;41\n", { timeZone: "Europe/Berlin" });
    expect(out.report.delimiter).toBe(";");
    expect(out.series.kW[0]).toBe(100.5);
    expect(out.series.kvar[0]).toBe(40.25);
    expect(out.series.timestampsMs[0]).toBe(Z("2026-02-28T23:00:00Z")); // 00:00 CET = 23:00Z the day before
  });
});

describe("power triangle per row", () => {
  it("kW + PF with a sense column, a sense option or a signed PF", () => {
    // hand: PF 0.6 → tan φ = 0.8/0.6 = 4/3; 300 kW → 400 kvar
    const col = ok("time,kW,PF,sense\n2026-03-01 00:00,300,0.6,lag\n2026-03-01 00:15,300,0.6,Leading\n2026-03-01 00:30,300,0.6,C\n2026-03-01 00:45,300,0.6,\n");
    expect(Array.from(col.series.kvar).map((q) => Math.round(q * 1e9) / 1e9)).toEqual([400, -400, -400, 400]);
    const signed = ok("time,kW,PF\n2026-03-01 00:00,300,-0.6\n2026-03-01 00:15,300,0.6\n");
    expectClose(signed.series.kvar[0], -400, ITOL.exact, "negative PF = leading");
    const opt = ok("time,kW,PF\n2026-03-01 00:00,300,0.6\n2026-03-01 00:15,300,1\n", { sense: "leading" });
    expectClose(opt.series.kvar[0], -400, ITOL.exact, "sense option");
    expect(opt.series.kvar[1]).toBe(0); // PF 1 → 0 kvar
  });

  it("kW + kVA: Q = √(S² − P²), and kW up to 1 % above kVA is rounding (0 kvar)", () => {
    // hand: 300 kW, 500 kVA → √(250000 − 90000) = 400 kvar; 101 kW on 100 kVA is within 1 % → 0
    const out = ok("time,kW,kVA\n2026-03-01 00:00,300,500\n2026-03-01 00:15,101,100\n");
    expectClose(out.series.kvar[0], 400, ITOL.exact, "kvar from kVA");
    expect(out.series.kvar[1]).toBe(0);
  });
});

describe("bad rows", () => {
  /** Row i: 15-minute steps from 2026-03-01 00:00 (local form, no offset), 300 kW on 500 kVA. */
  const good = (i: number) => `${new Date(Date.UTC(2026, 2, 1) + i * 900_000).toISOString().slice(0, 16).replace("T", " ")},300,500`;

  it("reports each with its line number, column and reason; counts by reason; never drops one silently", () => {
    const rows = Array.from({ length: 100 }, (_, i) => good(i));
    rows[9] = good(9).replace(",300,", ",abc,"); // line 11 (the header is line 1)
    rows[19] = good(19).replace(",300,", ",510,"); // kW 2 % above kVA
    rows[29] = good(29).replace(",500", ""); // 2 fields
    rows[39] = "2026-03-01 25:00,300,500";
    rows[49] = good(49).replace(",500", ",-5");
    const out = ok(["time,kW,kVA", ...rows].join("\n"));
    const b = out.report.badRows;
    expect(b.count).toBe(5);
    expect(b.fraction).toBe(0.05); // 5 of 100: at the limit, accepted
    expect(b.first).toEqual([
      { line: 11, column: "kW", reason: "unparseable number", value: "abc" },
      { line: 21, column: "kW", reason: "kW above kVA by more than 1 %" , value: "510" },
      { line: 31, column: "", reason: "wrong column count: 2 fields, the header has 3" },
      { line: 41, column: "time", reason: expect.stringMatching(/^bad timestamp: date or time out of range/), value: "2026-03-01 25:00" },
      { line: 51, column: "kVA", reason: "negative kVA", value: "-5" },
    ]);
    expect(b.byReason).toEqual({ "unparseable number": 1, "kW above kVA by more than 1 %": 1, "wrong column count": 1, "bad timestamp": 1, "negative kVA": 1 });
    expect(out.report.dataRows).toBe(100);
    expect(out.series.length).toBe(95);
  });

  it("PF outside (0, 1] is a bad row", () => {
    const out = parse("time,kW,PF\n2026-03-01 00:00,300,95\n2026-03-01 00:15,300,0\n2026-03-01 00:30,300,0.9\n");
    expect(!out.ok && out.report.badRows.first.map((e) => [e.line, e.reason])).toEqual([
      [2, "PF outside (0, 1] (give PF as a fraction, not percent)"],
      [3, "PF outside (0, 1]"],
    ]);
  });

  it("refuses the upload above 5 % bad rows, listing the first errors", () => {
    const rows = Array.from({ length: 100 }, (_, i) => good(i));
    for (const k of [3, 13, 23, 33, 43, 53]) rows[k] = "garbage,,";
    const out = parse(["time,kW,kVA", ...rows].join("\n"));
    expect(out.ok).toBe(false);
    if (!out.ok) {
      expect(out.fatal.kind).toBe("too_many_bad_rows");
      expect(out.fatal.message).toBe("6 of 100 rows (6.0 %) are bad, above the 5 % limit");
      expect(out.fatal.issues[0]).toEqual({ path: "line.5.time", message: expect.stringMatching(/^bad timestamp/) });
      expect(out.fatal.issues).toHaveLength(6);
    }
  });

  it("keeps only the first 50 error details but counts all", () => {
    const rows = Array.from({ length: 2000 }, (_, i) => (i % 25 === 0 ? "x,1,1" : good(i)));
    const out = ok(["time,kW,kVA", ...rows].join("\n"));
    expect(out.report.badRows.count).toBe(80);
    expect(out.report.badRows.first).toHaveLength(50);
  });

  it("refuses more rows than the limit", () => {
    const out = parse(rows15(20), { maxRows: 10 });
    expect(!out.ok && out.fatal.kind).toBe("too_many_rows");
  });

  it("refuses empty uploads and headers without rows", () => {
    expect((parse("") as { fatal: { kind: string } }).fatal.kind).toBe("no_data");
    expect((parse("time,kW,kvar\n") as { fatal: { kind: string } }).fatal.kind).toBe("no_data");
    expect((parse("time,kW,kvar\n2026-03-01 00:00,1,1\n") as { fatal: { kind: string } }).fatal.kind).toBe("too_few_intervals");
  });
});

describe("time order, duplicates, gaps", () => {
  it("detects the interval as the median step and reports gaps with the missing count", () => {
    const text = rows15(20).split("\n").filter((_, i) => i !== 6 && i !== 7 && i !== 15).join("\n"); // drop rows 5, 6 and 14
    const out = ok(text);
    expect(out.report.interval).toEqual({ minutes: 15, detectedMinutes: 15, source: "detected" });
    expect(out.report.steps!.gaps.count).toBe(2);
    expect(out.report.steps!.gaps.missingIntervals).toBe(3);
    expect(out.report.steps!.gaps.first[0]).toEqual({ line: 7, from: "2026-03-01T01:00:00Z", to: "2026-03-01T01:45:00Z", missingIntervals: 2 });
  });

  it("reports duplicates (first row kept) and out-of-order rows (series sorted)", () => {
    const lines = rows15(6).trim().split("\n");
    const text = [lines[0], lines[1], lines[3], lines[2], lines[4], lines[4]!.replace(",103,", ",999,"), lines[5], lines[6]].join("\n");
    const out = ok(text);
    expect(out.report.outOfOrder.count).toBe(1);
    expect(out.report.outOfOrder.first[0]).toEqual({ line: 4, timestamp: "2026-03-01T00:15:00Z", previousTimestamp: "2026-03-01T00:30:00Z" });
    expect(out.report.duplicates).toEqual({ count: 1, first: [{ line: 6, firstLine: 5, timestamp: "2026-03-01T00:45:00Z", sameValues: false }] });
    expect(Array.from(out.series.kW)).toEqual([100, 101, 102, 103, 104, 105]);
    expect(out.series.length).toBe(6);
  });

  it("an interval override is used and the detected step still reported", () => {
    const out = ok(rows15(8), { intervalMinutes: 5 });
    expect(out.report.interval).toEqual({ minutes: 5, detectedMinutes: 15, source: "given" });
    expect(out.report.steps!.gaps.count).toBe(7); // every 15-min step is 3 five-minute intervals
  });
});

describe("time zones", () => {
  it("local timestamps across the Chicago fall-back (1 Nov 2026): the repeated hour is read in order, no duplicates", () => {
    // 00:30 … 02:30 local every 30 min, with 01:00 and 01:30 twice (CDT then CST): 7 distinct instants 30 min apart
    const locals = ["00:30", "01:00", "01:30", "01:00", "01:30", "02:00", "02:30"];
    const out = ok(["time,kW,kvar", ...locals.map((t) => `2026-11-01 ${t},10,5`)].join("\n"), { timeZone: "America/Chicago" });
    expect(out.report.duplicates.count).toBe(0);
    expect(out.report.outOfOrder.count).toBe(0);
    const start = Date.parse("2026-11-01T05:30:00Z"); // 00:30 CDT
    expect(Array.from(out.series.timestampsMs)).toEqual(locals.map((_, i) => start + i * 1_800_000));
    expect(out.report.interval!.minutes).toBe(30);
  });

  it("local timestamps in the Chicago spring-forward gap (8 Mar 2026 02:xx) are bad rows", () => {
    const out = ok("time,kW,kvar\n2026-03-08 01:30,1,1\n2026-03-08 02:30,1,1\n2026-03-08 03:00,1,1\n2026-03-08 03:30,1,1\n" + rows15(16).split("\n").slice(1).join("\n"), {
      timeZone: "America/Chicago",
      maxBadRowFraction: 0.1,
    });
    expect(out.report.badRows.first[0]).toMatchObject({ line: 3, reason: expect.stringMatching(/does not exist in America\/Chicago/) });
  });

  it("explicit offsets win over the zone; without timeZone, months follow the first offset and a note says so", () => {
    const out = ok("time,kW,kvar\n2026-03-01T00:00:00-06:00,1,1\n2026-03-01T00:15:00-06:00,1,1\n");
    expect(out.series.timestampsMs[0]).toBe(Date.parse("2026-03-01T06:00:00Z"));
    expect(out.series.timeZone).toBe("-06:00");
    expect(out.report.notes.join(" ")).toMatch(/first row's offset \(-06:00\)/);
    const naive = ok("time,kW,kvar\n2026-03-01 00:00,1,1\n2026-03-01 00:15,1,1\n");
    expect(naive.series.timeZone).toBe("UTC");
    expect(naive.report.notes.join(" ")).toMatch(/read as UTC/);
  });

  it("an unknown zone is refused naming the field", () => {
    const out = parse(rows15(3), { timeZone: "Mars/Base" });
    expect(!out.ok && out.fatal.issues[0]?.path).toBe("timeZone");
  });
});

describe("streaming", () => {
  it("any split of the text into chunks gives the same series and report (CRLF, quotes, a bad row)", () => {
    const text = rows15(40, '"timestamp","kW","kvar"', (i) => (i === 7 ? "bad,1,1" : `"2026-03-01 ${String(Math.floor(i / 4)).padStart(2, "0")}:${String((i % 4) * 15).padStart(2, "0")}",${100 + i},${i}`)).replace(/\n/g, "\r\n");
    const whole = ok(text, { maxBadRowFraction: 0.05 });
    expect(whole.series.length).toBe(39);
    expect(whole.report.badRows.first[0]?.line).toBe(9);
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 200 }), (size) => {
        const part = parse(text, {}, size);
        expect(part.ok).toBe(true);
        if (part.ok) {
          expect(Array.from(part.series.kW)).toEqual(Array.from(whole.series.kW));
          expect(Array.from(part.series.timestampsMs)).toEqual(Array.from(whole.series.timestampsMs));
          expect(part.report).toEqual(whole.report);
        }
      }),
      { numRuns: 60 },
    );
  });

  it("sizing the arrays from expectedChars changes nothing, whether the estimate is low or high", () => {
    const text = rows15(1000);
    const plain = ok(text);
    for (const expectedChars of [10, text.length, 50 * text.length]) {
      const sized = ok(text, { expectedChars });
      expect(Array.from(sized.series.kvar)).toEqual(Array.from(plain.series.kvar));
      expect(sized.series.length).toBe(1000);
    }
  });
});

describe("implausible numbers", () => {
  it("an infinite or out-of-range number is a bad row with its reason", () => {
    const out = parse("time,kW,kvar\n2026-03-01 00:00,1e999,1\n2026-03-01 00:15,5e12,1\n2026-03-01 00:30,1,1\n");
    expect(!out.ok && out.report.badRows.first.map((e) => e.reason)).toEqual(["unparseable number", "number out of range (|value| > 1000000000)"]);
  });

});

describe("robustness", () => {
  it("never throws on arbitrary text: every upload ends as a series or a stated refusal", () => {
    const alphabet = fc.constantFrom(..."0123456789,;.-:T Z\n\r\"abkWvarPF/".split(""));
    fc.assert(
      fc.property(fc.string({ unit: alphabet, maxLength: 400 }), fc.integer({ min: 1, max: 50 }), (body, chunk) => {
        const out = parse("time,kW,kvar\n" + body, {}, chunk);
        if (out.ok) {
          expect(out.series.length).toBeGreaterThanOrEqual(2);
          for (let i = 0; i < out.series.length; i++) expect(Number.isFinite(out.series.kvar[i])).toBe(true);
        } else expect(out.fatal.message.length).toBeGreaterThan(0);
      }),
      { numRuns: 500 },
    );
  });
});
