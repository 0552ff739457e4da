import { Readable } from "node:stream";
import type { FastifyInstance } from "fastify";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { CSV, makeIntervalApp } from "../core/interval/app-fixture.js";
import { inject } from "../helpers/auth.js";

let app: FastifyInstance;
let close: () => Promise<void>;
beforeAll(async () => ({ app, close } = await makeIntervalApp()));
afterAll(async () => close());

const URL = "/v1/interval-analyses";
const good = "time,kW,kvar\n2026-03-01 00:00,100,50\n2026-03-01 00:15,100,50\n2026-03-01 00:30,100,50\n";
const post = (query: string, payload: string | Readable, headers: Record<string, string> = CSV) =>
  inject(app, { method: "POST", url: URL + query, headers, payload });

function expectProblem(r: { statusCode: number; headers: Record<string, unknown>; json: () => any }, status: number) {
  expect(r.statusCode).toBe(status);
  expect(r.headers["content-type"]).toMatch(/^application\/problem\+json/);
  const p = r.json();
  expect(p).toMatchObject({ status, type: expect.stringMatching(/^\/problems\/[a-z-]+$/), title: expect.any(String), detail: expect.any(String) });
  return p;
}

describe("POST /v1/interval-analyses — 400: options", () => {
  it.each([
    ["?targetPF=0.5", "targetPF", /at least 0.8/],
    ["?targetPF=abc", "targetPF", /number/],
    ["?timeZone=Mars/Base", "timeZone", /IANA/],
    ["?bankSteps=50,abc", "bankSteps", /comma-separated/],
    ["?bankSteps=" + Array(17).fill(10).join(","), "bankSteps", /at most 16/],
    ["?ctRatio=200", "voltageV", /go together/],
    ["?dateOrder=ymd", "dateOrder", /mdy or dmy/],
    ["?targetpf=0.9", "targetpf", /unknown option/],
    ["?intervalMinutes=0", "intervalMinutes", /at least/],
  ])("%s names %s", async (query, path, message) => {
    const p = expectProblem(await post(query, good), 400);
    expect(p.errors).toEqual(expect.arrayContaining([{ path, message: expect.stringMatching(message) }]));
  });
});

describe("POST /v1/interval-analyses — 400/422: the CSV", () => {
  it("400 when the header lacks a needed column, naming the column option", async () => {
    const p = expectProblem(await post("", "time,kW\n2026-03-01 00:00,1\n"), 400);
    expect(p.type).toMatch(/csv-header$/);
    expect(p.errors).toEqual([{ path: "kvarColumn", message: expect.stringMatching(/no kvar, PF or kVA column/) }]);
    expect(p.header).toEqual(["time", "kW"]);
  });

  it("422 above 5 % bad rows, with each first error's line, column and reason", async () => {
    const rows = Array.from(
      { length: 40 },
      (_, i) => `2026-03-01 ${String(Math.floor(i / 4)).padStart(2, "0")}:${String((i % 4) * 15).padStart(2, "0")},100,50`,
    );
    rows[4] = "2026-03-01 01:00,100"; // line 6: one field short
    rows[9] = "2026-03-01 02:15,1e,50"; // line 11
    rows[20] = "2026-02-30 05:00,100,50"; // line 22
    const p = expectProblem(await post("", ["time,kW,kvar", ...rows].join("\n")), 422);
    expect(p.type).toMatch(/csv-bad-rows$/);
    expect(p.detail).toBe("3 of 40 rows (7.5 %) are bad, above the 5 % limit");
    expect(p.errors).toEqual([
      { path: "line.6", message: "wrong column count: 2 fields, the header has 3" },
      { path: "line.11.kW", message: "unparseable number" },
      { path: "line.22.time", message: expect.stringMatching(/^bad timestamp: date or time out of range/) },
    ]);
    expect(p.badRows).toMatchObject({
      count: 3,
      limitFraction: 0.05,
      first: [{ line: 6 }, { line: 11, value: "1e" }, { line: 22, value: "2026-02-30 05:00" }],
    });
  });

  it("422 for an empty body, a header alone, or one interval", async () => {
    expect(expectProblem(await post("", ""), 422).type).toMatch(/csv-no-data$/);
    expect(expectProblem(await post("", "time,kW,kvar\n"), 422).detail).toBe("no data rows after the header");
    expect(expectProblem(await post("", "time,kW,kvar\n2026-03-01 00:00,1,1\n"), 422).type).toMatch(/too-few-intervals$/);
  });

  it("422 for a day-first date without dateOrder, reported on its line", async () => {
    const csv = "time,kW,kvar\n13/03/2026 00:00,1,1\n14/03/2026 00:00,1,1\n";
    const p = expectProblem(await post("", csv), 422);
    expect(p.errors[0]).toEqual({ path: "line.2.time", message: expect.stringMatching(/set dateOrder=dmy/) });
  });
});

describe("POST /v1/interval-analyses — 413 and 415", () => {
  it("413 when the declared length is above 64 MiB (nothing read)", async () => {
    const r = await inject(app, { method: "POST", url: URL, headers: { ...CSV, "content-length": String(64 * 1024 * 1024 + 1) }, payload: good });
    const p = expectProblem(r, 413);
    expect(p.detail).toMatch(/limit is 67108864 bytes \(64 MiB\)/);
  });

  it("413 when a streamed body passes 64 MiB", async () => {
    const note = "x".repeat(8000);
    let i = 0;
    const body = new Readable({
      read() {
        if (i === 0) this.push("time,kW,kvar,note\n");
        // 8 000-character rows: ~8 400 rows reach 64 MiB, far below the row limit
        for (let k = 0; k < 64; k++, i++) this.push(`${new Date(Date.UTC(2026, 0, 1) + i * 60_000).toISOString()},1,1,${note}\n`);
        if (i > 20_000) this.push(null);
      },
    });
    const p = expectProblem(await post("", body), 413);
    expect(p.detail).toMatch(/exceeds 67108864 bytes/);
  }, 60_000);

  it("415 for JSON or no content type, saying what to send", async () => {
    const p = expectProblem(await inject(app, { method: "POST", url: URL, payload: { a: 1 } }), 415);
    expect(p.detail).toMatch(/text\/csv or as multipart\/form-data/);
    expectProblem(await inject(app, { method: "POST", url: URL, headers: { "content-type": "application/xml" }, payload: "<a/>" }), 415);
  });

  it("the rest of the API keeps its JSON parser", async () => {
    const r = await inject(app, { method: "POST", url: "/v1/sizing", payload: {} });
    expect(r.statusCode).toBe(400);
  });
});
