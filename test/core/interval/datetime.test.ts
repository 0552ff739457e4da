import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  daysFromCivil,
  isoWithOffset,
  monthIndexOfDays,
  TimestampParser,
  TS_AMBIGUOUS_ORDER,
  TS_OK,
  TS_RANGE,
  TS_SYNTAX,
  type DateOrder,
} from "../../../src/core/interval/datetime.js";

/** Parse and return UTC ms (wall − offset; wall alone when no offset is written), or the error code. */
function parse(text: string, order: DateOrder | null = null): { code: number; wallMs: number; offsetMs: number } {
  const t = new TimestampParser(order);
  const code = t.parse(text, 0, text.length);
  return { code, wallMs: t.wallMs, offsetMs: t.offsetMs };
}

describe("civil calendar arithmetic", () => {
  it("daysFromCivil matches Date.UTC for random dates 1600–2400 (independent oracle)", () => {
    fc.assert(
      fc.property(fc.integer({ min: 1600, max: 2400 }), fc.integer({ min: 1, max: 12 }), fc.integer({ min: 1, max: 28 }), (y, m, d) => {
        expect(daysFromCivil(y, m, d) * 86_400_000).toBe(Date.UTC(y, m - 1, d));
        expect(monthIndexOfDays(daysFromCivil(y, m, d))).toBe(y * 12 + m - 1);
      }),
      { numRuns: 3000 },
    );
  });

  it("knows leap days (hand: 2024 is a leap year, 2100 is not, 2000 is)", () => {
    expect(parse("2024-02-29 00:00").code).toBe(TS_OK);
    expect(parse("2100-02-29 00:00").code).toBe(TS_RANGE);
    expect(parse("2000-02-29 00:00").code).toBe(TS_OK);
    expect(monthIndexOfDays(daysFromCivil(2024, 2, 29))).toBe(2024 * 12 + 1);
  });

  it("formats an instant in a fixed offset (hand: 20:15Z at −06:00 is 14:15 local)", () => {
    expect(isoWithOffset(Date.UTC(2026, 2, 1, 20, 15), -6 * 3_600_000)).toBe("2026-03-01T14:15:00-06:00");
    expect(isoWithOffset(Date.UTC(2026, 2, 1, 20, 15), 0)).toBe("2026-03-01T20:15:00Z");
    expect(isoWithOffset(Date.UTC(2026, 2, 1, 20, 15), 5.5 * 3_600_000)).toBe("2026-03-02T01:45:00+05:30");
  });
});

describe("TimestampParser", () => {
  const wall = (y: number, mo: number, d: number, h = 0, mi = 0, s = 0) => Date.UTC(y, mo - 1, d, h, mi, s);

  it("reads ISO 8601 with Z, offsets and fractions", () => {
    expect(parse("2026-03-01T14:15:00Z")).toEqual({ code: TS_OK, wallMs: wall(2026, 3, 1, 14, 15), offsetMs: 0 });
    expect(parse("2026-03-01T14:15:00+02:00")).toEqual({ code: TS_OK, wallMs: wall(2026, 3, 1, 14, 15), offsetMs: 7_200_000 });
    expect(parse("2026-03-01T14:15-0530").offsetMs).toBe(-(5 * 60 + 30) * 60_000);
    expect(parse("2026-03-01T14:15:00.250Z").wallMs).toBe(wall(2026, 3, 1, 14, 15) + 250);
    expect(parse("2026-03-01 14:15 UTC").offsetMs).toBe(0);
  });

  it("reads common field forms without an offset (offset NaN)", () => {
    const r = parse("2026-03-01 14:15");
    expect(r.code).toBe(TS_OK);
    expect(r.wallMs).toBe(wall(2026, 3, 1, 14, 15));
    expect(r.offsetMs).toBeNaN();
    expect(parse("2026/03/01 14:15:30").wallMs).toBe(wall(2026, 3, 1, 14, 15, 30));
    expect(parse("3/1/2026 2:15 PM").wallMs).toBe(wall(2026, 3, 1, 14, 15));
    expect(parse("3/1/2026 12:05 AM").wallMs).toBe(wall(2026, 3, 1, 0, 5));
    expect(parse("3/1/2026 12:05 PM").wallMs).toBe(wall(2026, 3, 1, 12, 5));
    expect(parse("01.03.2026 14:15").wallMs).toBe(wall(2026, 3, 1, 14, 15)); // dotted dates are day-first
    expect(parse("2026-03-01").wallMs).toBe(wall(2026, 3, 1));
    expect(parse("2026-03-01 24:00").wallMs).toBe(wall(2026, 3, 2)); // end-of-day label
  });

  it("applies dateOrder to slashed dates", () => {
    expect(parse("03/01/2026 14:15", "mdy").wallMs).toBe(wall(2026, 3, 1, 14, 15));
    expect(parse("03/01/2026 14:15", "dmy").wallMs).toBe(wall(2026, 1, 3, 14, 15));
    expect(parse("03/01/2026 14:15").wallMs).toBe(wall(2026, 3, 1, 14, 15)); // default month-first
    expect(parse("13/01/2026 14:15").code).toBe(TS_AMBIGUOUS_ORDER); // default, but the first part cannot be a month
    expect(parse("13/01/2026 14:15", "mdy").code).toBe(TS_RANGE);
  });

  it("refuses malformed and out-of-range values", () => {
    for (const bad of [
      "",
      "yesterday",
      "2026-03-01X14:15",
      "2026-3",
      "2026-03-01 14",
      "2026-03-01 14:1",
      "26/03/01 10:00",
      "2026-03-01 14:15 +2",
      "2026-03-01 14:15 junk",
    ]) {
      expect(parse(bad).code, bad).toBe(TS_SYNTAX);
    }
    for (const bad of ["2026-13-01 00:00", "2026-04-31 00:00", "2026-03-01 25:00", "2026-03-01 24:30", "2026-03-01 10:60", "3/1/2026 13:00 PM"]) {
      expect(parse(bad).code, bad).toBe(TS_RANGE);
    }
  });

  it("agrees with Date.parse on random ISO instants (independent oracle)", () => {
    fc.assert(
      fc.property(fc.integer({ min: Date.UTC(1990, 0, 1), max: Date.UTC(2060, 0, 1) }), (ms) => {
        const text = new Date(ms).toISOString();
        const r = parse(text);
        expect(r.code).toBe(TS_OK);
        expect(r.wallMs - r.offsetMs).toBe(Date.parse(text));
      }),
      { numRuns: 2000 },
    );
  });
});

describe("fast ISO path", () => {
  it("agrees with the general parser on every shape it takes, and passes the rest on (random fields; oracle: Date.UTC)", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1970, max: 2099 }),
        fc.integer({ min: 1, max: 12 }),
        fc.integer({ min: 1, max: 31 }),
        fc.integer({ min: 0, max: 24 }),
        fc.integer({ min: 0, max: 60 }),
        fc.integer({ min: 0, max: 60 }),
        fc.constantFrom("T", " "),
        fc.constantFrom("", "Z"),
        fc.boolean(),
        (y, mo, d, h, mi, s, sep, z, withSeconds) => {
          const two = (v: number) => String(v).padStart(2, "0");
          const text = `${y}-${two(mo)}-${two(d)}${sep}${two(h)}:${two(mi)}${withSeconds ? `:${two(s)}` : ""}${z}`;
          const r = parse(text);
          const valid =
            d <= new Date(Date.UTC(y, mo, 0)).getUTCDate() &&
            mi <= 59 &&
            (!withSeconds || s <= 59) &&
            (h <= 23 || (h === 24 && mi === 0 && (!withSeconds || s === 0)));
          expect(r.code === TS_OK, text).toBe(valid);
          if (valid) {
            expect(r.wallMs, text).toBe(Date.UTC(y, mo - 1, d, h, mi, withSeconds ? s : 0));
            expect(Number.isNaN(r.offsetMs) ? "none" : r.offsetMs, text).toBe(z === "Z" ? 0 : "none");
          }
        },
      ),
      { numRuns: 3000 },
    );
  });
});
