/**
 * Interval uploads at their bounds: the most rows, the most bytes and the widest line are analysed, with answers
 * well under 10 MB; one past a bound is a 413 or 400 naming the limit. Bodies are streamed, as a client sends them.
 */
import { Readable } from "node:stream";
import type { FastifyInstance } from "fastify";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { MAX_LINE_CHARS } from "../../src/core/interval/parser.js";
import { INTERVAL_MAX_BYTES, INTERVAL_MAX_ROWS } from "../../src/http/interval/ingest.js";
import { CSV, makeIntervalApp } from "../core/interval/app-fixture.js";
import { inject } from "../helpers/auth.js";

let app: FastifyInstance;
let close: () => Promise<void>;
beforeAll(async () => ({ app, close } = await makeIntervalApp()));
afterAll(async () => close());

const TEN_MB = 10 * 1024 * 1024;
const START_MS = Date.UTC(2026, 0, 1);
const post = (body: Readable) => inject(app, { method: "POST", url: "/v1/interval-analyses", headers: CSV, payload: body });

/** "2026-01-01 00:00" for minute i (a 1-minute series from 2026-01-01 UTC). */
const stamp = (i: number) => new Date(START_MS + i * 60_000).toISOString().slice(0, 16).replace("T", " ");

/** A CSV streamed in pieces: the header, then `rows` rows from row(i), 2,000 rows a piece. */
function csvStream(header: string, rows: number, row: (i: number) => string): Readable {
  let i = -1;
  return new Readable({
    read() {
      if (i === -1) {
        this.push(header + "\n");
        i = 0;
      }
      let piece = "";
      for (const end = Math.min(rows, i + 2000); i < end; i++) piece += row(i) + "\n";
      if (piece) this.push(piece);
      if (i >= rows) this.push(null);
    },
  });
}

describe("interval uploads at their bounds", () => {
  it(`takes ${INTERVAL_MAX_ROWS} rows (the row limit) and answers under 10 MB; one more row is a 413 naming the limit`, async () => {
    const row = (i: number) => `${stamp(i)},${100 + (i % 7)},${40 + (i % 5)}`;
    const r = await post(csvStream("time,kW,kvar", INTERVAL_MAX_ROWS, row));
    expect(r.statusCode, r.body.slice(0, 300)).toBe(200);
    expect(r.body.length).toBeLessThan(TEN_MB);
    const b = r.json();
    expect(b.input.dataRows).toBe(INTERVAL_MAX_ROWS);
    expect(b.input.acceptedRows).toBe(INTERVAL_MAX_ROWS);
    // kW cycles 100…106 over 7 rows: the peak is 106 (hand reading of the generator)
    expect(b.kW.max).toBe(106);

    const over = await post(csvStream("time,kW,kvar", INTERVAL_MAX_ROWS + 1, row));
    expect(over.statusCode).toBe(413);
    expect(over.headers["content-type"]).toMatch(/^application\/problem\+json/);
    expect(over.json()).toMatchObject({ type: "/problems/too-many-rows", detail: `more than ${INTERVAL_MAX_ROWS} data rows` });
  }, 240_000);

  it(`takes exactly ${INTERVAL_MAX_BYTES} bytes (the size limit) and answers under 10 MB`, async () => {
    const header = "time,kW,kvar,note";
    // rows of 2,000 bytes with a note column; the last row's note pads the upload to the limit exactly
    const width = 2000;
    const fixed = (i: number) => `${stamp(i)},100,40,`;
    const rowOf = (i: number, total: number) => fixed(i) + "x".repeat(total - fixed(i).length);
    const body = INTERVAL_MAX_BYTES - header.length - 1;
    const rows = Math.floor(body / (width + 1));
    const lastWidth = body - (rows - 1) * (width + 1) - 1;
    expect(lastWidth).toBeLessThanOrEqual(MAX_LINE_CHARS);
    const r = await post(csvStream(header, rows, (i) => rowOf(i, i === rows - 1 ? lastWidth : width)));
    expect(r.statusCode, r.body.slice(0, 300)).toBe(200);
    expect(r.body.length).toBeLessThan(TEN_MB);
    expect(r.json().input).toMatchObject({ bytes: INTERVAL_MAX_BYTES, acceptedRows: rows });
  }, 120_000);

  it(`takes lines of ${MAX_LINE_CHARS} characters (the widest header: thousands of columns); one character more is a 400 naming the limit`, async () => {
    // header "time,kW,kvar,c4,c5,…" padded with columns to exactly MAX_LINE_CHARS characters
    const names = ["time", "kW", "kvar"];
    let header = names.join(",");
    for (let k = 4; header.length + `,c${k}`.length <= MAX_LINE_CHARS; k++) header += `,c${k}`;
    header += ",".padEnd(MAX_LINE_CHARS - header.length, "z");
    expect(header.length).toBe(MAX_LINE_CHARS);
    const columns = header.split(",").length;
    const empties = ",".repeat(columns - 3);
    const row = (i: number) => `${stamp(i)},100,40${empties}`;
    const r = await post(csvStream(header, 1440, row));
    expect(r.statusCode, r.body.slice(0, 300)).toBe(200);
    expect(r.body.length).toBeLessThan(TEN_MB);
    expect(r.json().input.header).toHaveLength(columns);

    const wide = await post(csvStream(header + "z", 1440, row));
    expect(wide.statusCode).toBe(400);
    expect(wide.json()).toMatchObject({ type: "/problems/csv-line-too-long", detail: `line 1 is longer than ${MAX_LINE_CHARS} characters` });
    // a data row past the limit, inside one streamed piece, is refused the same way
    const longRow = await post(csvStream("time,kW,kvar,note", 10, (i) => `${stamp(i)},100,40,${"y".repeat(i === 5 ? MAX_LINE_CHARS : 1)}`));
    expect(longRow.statusCode).toBe(400);
    expect(longRow.json().detail).toBe(`line 7 is longer than ${MAX_LINE_CHARS} characters`);
  }, 60_000);
});
