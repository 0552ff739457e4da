import { describe, expect, it } from "vitest";
import { expectClose } from "../../helpers/tolerance.js";
import { ITOL } from "./fixtures.js";
import { ok, parse, rows15, Z } from "./parse-helpers.js";

describe("header detection", () => {
  it.each([
    ["Timestamp,Demand kW,kVAr", "kW_kvar", { timestamp: "Timestamp", kW: "Demand kW", kvar: "kVAr" }],
    ["time;kW;PF", "kW_pf", { timestamp: "time", kW: "kW", pf: "PF" }],
    ['"Interval End","kW (avg)","kVA"', "kW_kVA", { timestamp: "Interval End", kW: "kW (avg)", kVA: "kVA" }],
    [
      "Date/Time,Active Power kW,Power Factor,PF Sense",
      "kW_pf",
      { timestamp: "Date/Time", kW: "Active Power kW", pf: "Power Factor", sense: "PF Sense" },
    ],
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
    const out = ok("Timestamp;Wirkleistung kW;Blindleistung kvar\n01.03.2026 00:00;100,5;40,25\n01.03.2026 00:15;101;41\n", {
      timeZone: "Europe/Berlin",
    });
    expect(out.report.delimiter).toBe(";");
    expect(out.series.kW[0]).toBe(100.5);
    expect(out.series.kvar[0]).toBe(40.25);
    expect(out.series.timestampsMs[0]).toBe(Z("2026-02-28T23:00:00Z")); // 00:00 CET = 23:00Z the day before
  });
});

describe("power triangle per row", () => {
  it("kW + PF with a sense column, a sense option or a signed PF", () => {
    // hand: PF 0.6 → tan φ = 0.8/0.6 = 4/3; 300 kW → 400 kvar
    const col = ok(
      "time,kW,PF,sense\n2026-03-01 00:00,300,0.6,lag\n2026-03-01 00:15,300,0.6,Leading\n2026-03-01 00:30,300,0.6,C\n2026-03-01 00:45,300,0.6,\n",
    );
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
      { line: 21, column: "kW", reason: "kW above kVA by more than 1 %", value: "510" },
      { line: 31, column: "", reason: "wrong column count: 2 fields, the header has 3" },
      { line: 41, column: "time", reason: expect.stringMatching(/^bad timestamp: date or time out of range/), value: "2026-03-01 25:00" },
      { line: 51, column: "kVA", reason: "negative kVA", value: "-5" },
    ]);
    expect(b.byReason).toEqual({
      "unparseable number": 1,
      "kW above kVA by more than 1 %": 1,
      "wrong column count": 1,
      "bad timestamp": 1,
      "negative kVA": 1,
    });
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
