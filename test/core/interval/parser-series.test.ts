import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { ok, parse, rows15 } from "./parse-helpers.js";

describe("time order, duplicates, gaps", () => {
  it("detects the interval as the median step and reports gaps with the missing count", () => {
    const text = rows15(20)
      .split("\n")
      .filter((_, i) => i !== 6 && i !== 7 && i !== 15)
      .join("\n"); // drop rows 5, 6 and 14
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
    const out = ok(
      "time,kW,kvar\n2026-03-08 01:30,1,1\n2026-03-08 02:30,1,1\n2026-03-08 03:00,1,1\n2026-03-08 03:30,1,1\n" +
        rows15(16).split("\n").slice(1).join("\n"),
      {
        timeZone: "America/Chicago",
        maxBadRowFraction: 0.1,
      },
    );
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
    const text = rows15(40, '"timestamp","kW","kvar"', (i) =>
      i === 7 ? "bad,1,1" : `"2026-03-01 ${String(Math.floor(i / 4)).padStart(2, "0")}:${String((i % 4) * 15).padStart(2, "0")}",${100 + i},${i}`,
    ).replace(/\n/g, "\r\n");
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

describe("date order", () => {
  it("says when slashed dates were read month-first by default", () => {
    const out = ok("time,kW,kvar\n03/01/2026 00:00,1,1\n03/01/2026 00:15,1,1\n");
    expect(out.series.timestampsMs[0]).toBe(Date.UTC(2026, 2, 1));
    expect(out.report.notes).toContain(
      "dateOrder not given: 2 slashed dates like 03/01/2026 were read month-first (set dateOrder=dmy for day-first)",
    );
    expect(ok("time,kW,kvar\n03/01/2026 00:00,1,1\n03/01/2026 00:15,1,1\n", { dateOrder: "mdy" }).report.notes.join()).not.toMatch(/dateOrder/);
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
    const alphabet = fc.constantFrom(...'0123456789,;.-:T Z\n\r"abkWvarPF/'.split(""));
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
