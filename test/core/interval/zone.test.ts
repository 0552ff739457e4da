import { describe, expect, it } from "vitest";
import { parseFixedOffsetMs, zoneFor } from "../../../src/core/interval/zone.js";

const H = 3_600_000;
const wall = (y: number, mo: number, d: number, h: number, mi = 0) => Date.UTC(y, mo - 1, d, h, mi);

describe("fixed offsets", () => {
  it("parses ±hh:mm, ±hhmm and ±hh", () => {
    expect(parseFixedOffsetMs("+02:00")).toBe(2 * H);
    expect(parseFixedOffsetMs("-0530")).toBe(-5.5 * H);
    expect(parseFixedOffsetMs("+05")).toBe(5 * H);
    expect(parseFixedOffsetMs("+19:00")).toBeNaN();
    expect(parseFixedOffsetMs("2:00")).toBeNaN();
  });

  it("maps wall time by the offset (hand: 14:15 at +02:00 is 12:15Z)", () => {
    const z = zoneFor("+02:00")!;
    expect(z.name).toBe("+02:00");
    expect(z.wallToUtc(wall(2026, 3, 1, 14, 15), Number.NaN)).toBe(wall(2026, 3, 1, 12, 15));
    expect(zoneFor("UTC")!.offsetMsAt(0)).toBe(0);
    expect(zoneFor("Z")!.name).toBe("UTC");
  });

  it("refuses what is not a zone", () => {
    for (const bad of ["", "Mars/Olympus", "+25:00", "-", "CST6CDT7"]) expect(zoneFor(bad), bad).toBeNull();
  });
});

describe("IANA zones through the platform tz database", () => {
  // US rule since 2007 (Energy Policy Act of 2005): DST from the 2nd Sunday of March 02:00 to the 1st Sunday of
  // November 02:00. 2026: 8 March (02:00 CST = 08:00Z) and 1 November (02:00 CDT = 07:00Z).
  const chicago = zoneFor("America/Chicago")!;

  it("gives CST −6 h in winter and CDT −5 h in summer, switching at the legal instants", () => {
    expect(chicago.offsetMsAt(Date.UTC(2026, 0, 15, 12))).toBe(-6 * H);
    expect(chicago.offsetMsAt(Date.UTC(2026, 6, 15, 12))).toBe(-5 * H);
    expect(chicago.offsetMsAt(Date.UTC(2026, 2, 8, 7, 59))).toBe(-6 * H);
    expect(chicago.offsetMsAt(Date.UTC(2026, 2, 8, 8, 0))).toBe(-5 * H);
    expect(chicago.offsetMsAt(Date.UTC(2026, 10, 1, 6, 59))).toBe(-5 * H);
    expect(chicago.offsetMsAt(Date.UTC(2026, 10, 1, 7, 0))).toBe(-6 * H);
  });

  it("has no 02:00–02:59 on 8 March 2026 (spring-forward gap → NaN)", () => {
    expect(chicago.wallToUtc(wall(2026, 3, 8, 1, 59), Number.NaN)).toBe(Date.UTC(2026, 2, 8, 7, 59));
    expect(chicago.wallToUtc(wall(2026, 3, 8, 2, 30), Number.NaN)).toBeNaN();
    expect(chicago.wallToUtc(wall(2026, 3, 8, 3, 0), Number.NaN)).toBe(Date.UTC(2026, 2, 8, 8, 0));
  });

  it("reads 01:00–01:59 on 1 November 2026 twice: CDT first, CST when the previous row is already past it", () => {
    const first = chicago.wallToUtc(wall(2026, 11, 1, 1, 30), Number.NaN);
    expect(first).toBe(Date.UTC(2026, 10, 1, 6, 30)); // 01:30 CDT
    const second = chicago.wallToUtc(wall(2026, 11, 1, 1, 30), Date.UTC(2026, 10, 1, 6, 59)); // after 01:59 CDT
    expect(second).toBe(Date.UTC(2026, 10, 1, 7, 30)); // 01:30 CST
  });

  it("Europe/Berlin: CET +1 h, CEST +2 h from the last Sunday of March 01:00Z (29 March 2026; EU Directive 2000/84/EC)", () => {
    const berlin = zoneFor("Europe/Berlin")!;
    expect(berlin.offsetMsAt(Date.UTC(2026, 2, 29, 0, 59))).toBe(1 * H);
    expect(berlin.offsetMsAt(Date.UTC(2026, 2, 29, 1, 0))).toBe(2 * H);
    expect(berlin.wallToUtc(wall(2026, 3, 29, 2, 30), Number.NaN)).toBeNaN();
    expect(berlin.offsetMsAt(Date.UTC(2026, 9, 25, 1, 0))).toBe(1 * H); // back on the last Sunday of October
  });

  it("agrees with Intl's own wall-clock rendering at every hour of 2026 (round trip, independent of the cache)", () => {
    const f = new Intl.DateTimeFormat("en-CA", {
      timeZone: "America/Chicago",
      hourCycle: "h23",
      year: "numeric",
      month: "2-digit",
      day: "2-digit",
      hour: "2-digit",
      minute: "2-digit",
    });
    for (let u = Date.UTC(2026, 0, 1); u < Date.UTC(2027, 0, 1); u += H) {
      const parts = Object.fromEntries(f.formatToParts(u).map((p) => [p.type, p.value]));
      const w = Date.UTC(Number(parts.year), Number(parts.month) - 1, Number(parts.day), Number(parts.hour), Number(parts.minute));
      expect(w - u, new Date(u).toISOString()).toBe(chicago.offsetMsAt(u));
      expect(chicago.wallToUtc(w, u - 1)).toBe(u);
    }
  });
});
