import fc from "fast-check";
import { afterAll, describe, expect, it } from "vitest";
import { createIntervalParser, type ParseOutcome } from "../../src/core/interval/parser.js";
import { intervalAnswer } from "../../src/heavy-work/interval-task.js";
import { createHeavyWork, seriesTransfer } from "../../src/heavy-work/pool.js";
import { columnPool } from "../../src/http/interval/column-pool.js";
import { parseIntervalOptions } from "../../src/http/interval/options.js";

// The upload's own path — bytes in random chunks, columns from the pool, the series moved to a worker thread and
// its columns moved back — against the whole file pushed at once and analysed on this thread. The answers must be
// identical, number for number (toEqual compares numbers with Object.is: even −0 and 0 differ).

const pool = createHeavyWork({ threads: 1, maxQueue: 8, retryAfterS: 1 });
afterAll(() => pool.close());

/** Invented meter rows: timestamps with random gaps and repeats out of order, some bad rows. */
const row = fc.record({
  stepMin: fc.constantFrom(1, 15, 15, 15, 30, 60 * 24 * 9),
  kW: fc.double({ min: 0, max: 5000, noNaN: true }),
  kvar: fc.double({ min: -2000, max: 5000, noNaN: true }),
  bad: fc.nat(59).map((x) => x === 0),
  back: fc.nat(29).map((x) => x === 0),
});

function csvOf(rows: { stepMin: number; kW: number; kvar: number; bad: boolean; back: boolean }[], crlf: boolean): string {
  let t = Date.UTC(2026, 0, 28, 5, 0);
  const eol = crlf ? "\r\n" : "\n";
  let text = `Time stamp,Demand kW,kvar${eol}`;
  for (const r of rows) {
    t += (r.back ? -2 : 1) * r.stepMin * 60_000;
    const ts = new Date(t).toISOString().slice(0, 16).replace("T", " ");
    text += r.bad ? `${ts},n/a,1${eol}` : `${ts},${r.kW.toFixed(3)},${r.kvar.toFixed(2)}${eol}`;
  }
  return text;
}

function parsed(bytes: Uint8Array, cuts: number[] | null, query: Record<string, string>, shared: boolean): ParseOutcome {
  const o = parseIntervalOptions(query);
  const p = createIntervalParser({ ...o.parse, ...(shared ? { columnArrays: columnPool, expectedChars: bytes.length } : {}) });
  if (cuts === null) p.pushBytes(bytes);
  else {
    let from = 0;
    for (const cut of [...cuts].sort((a, b) => a - b)) {
      p.pushBytes(bytes.slice(from, Math.max(from, cut)));
      from = Math.max(from, cut);
    }
    p.pushBytes(bytes.slice(from));
  }
  return p.end();
}

describe("an interval upload analysed on a worker thread from streamed bytes", () => {
  it("answers exactly as the whole file analysed on this thread (random series, zones and banks)", async () => {
    let analysed = 0;
    await fc.assert(
      fc.asyncProperty(
        fc.array(row, { minLength: 3, maxLength: 400 }),
        fc.array(fc.nat(40_000), { maxLength: 12 }),
        fc.boolean(),
        fc.record(
          {
            targetPF: fc.constantFrom("0.9", "0.95", "1"),
            timeZone: fc.constantFrom("UTC", "America/Chicago", "+05:30", "Australia/Adelaide"),
            fixedKvar: fc.constantFrom("0", "25", "80"),
            bankSteps: fc.constantFrom("50", "50,50,100,100", "20,40,80,160,320", "75,75,75"),
            leadingLimitPF: fc.constantFrom("0.9", "0.98"),
          },
          { requiredKeys: ["targetPF"] },
        ),
        async (rows, cuts, crlf, query) => {
          const bytes = new TextEncoder().encode(csvOf(rows, crlf));
          const whole = parsed(bytes, null, query, false);
          const streamed = parsed(bytes, cuts, query, true);
          expect(streamed.ok).toBe(whole.ok);
          if (!whole.ok || !streamed.ok) return;
          analysed++;
          const options = parseIntervalOptions(query);
          const expected = intervalAnswer({ bytes: bytes.length, series: whole.series, report: whole.report, options });
          const { series, report } = streamed;
          const { answer, columns } = await pool.run("intervalAnalysis", { bytes: bytes.length, series, report, options }, seriesTransfer(series));
          expect(answer).toEqual(expected);
          for (const c of columns) columnPool.give(c);
        },
      ),
      { numRuns: 60 },
    );
    expect(analysed).toBeGreaterThan(30); // most uploads are accepted: the comparison is not vacuous
  }, 60_000);
});
