import type { FastifyInstance } from "fastify";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { expectClose } from "../helpers/tolerance.js";
import { makeIntervalApp } from "../core/interval/app-fixture.js";
import { csvOfSeries, ITOL, syntheticYear } from "../core/interval/fixtures.js";
import { api, inject } from "../helpers/auth.js";

let app: FastifyInstance;
let close: () => Promise<void>;
beforeAll(async () => ({ app, close } = await makeIntervalApp()));
afterAll(async () => close());

const URL = "/v1/interval-analyses";
/** A week of 15-minute data: 00–08 h 200 kW / 100 kvar, 08–24 h 600 kW / 450 kvar. */
const week = Buffer.from(
  csvOfSeries(
    syntheticYear(96, (k) => (k < 32 ? { kW: 200, kvar: 100 } : { kW: 600, kvar: 450 }), 7),
    "Timestamp,kW,kvar",
  ),
);

describe("POST /v1/interval-analyses (multipart/form-data)", () => {
  it("reads the file field with the options given as form fields before it", async () => {
    const r = await api(app)
      .post(URL)
      .field("targetPF", "0.9")
      .field("timeZone", "UTC")
      .field("fixedKvar", "50")
      .field("bankSteps", "50,100,100")
      .attach("file", week, { filename: "week.csv", contentType: "text/csv" });
    expect(r.status).toBe(200);
    expect(r.body.targetPF).toBe(0.9);
    expect(r.body.input.acceptedRows).toBe(7 * 96);
    // hand: 450 − 600·tan(acos 0.9) = 450 − 600·0.484322 = 159.41
    expectClose(r.body.neededKvar.hold100PctKvar, 450 - 600 * (Math.sqrt(1 - 0.81) / 0.9), ITOL.exact, "hold 100 % at 0.9");
    expect(r.body.simulation.bank).toEqual({ fixedKvar: 50, stepsKvar: [50, 100, 100] });
    expect(r.body.warnings.map((w: { code: string }) => w.code)).not.toContain("time_zone_assumed");
  });

  it("merges query options with form fields", async () => {
    const r = await api(app).post(`${URL}?targetPF=0.92`).field("kWColumn", "kW").attach("file", week, "week.csv");
    expect(r.status).toBe(200);
    expect(r.body.targetPF).toBe(0.92);
  });

  it("400 when an option comes both in the query and as a form field", async () => {
    const r = await api(app).post(`${URL}?targetPF=0.92`).field("targetPF", "0.9").attach("file", week, "week.csv");
    expect(r.status).toBe(400);
    expect(r.body.errors).toEqual([{ path: "targetPF", message: expect.stringMatching(/both in the query and as a form field/) }]);
  });

  it("400 for a form field after the file, a file under another name, or no file", async () => {
    const after = await api(app).post(URL).attach("file", week, "week.csv").field("targetPF", "0.9");
    expect(after.status).toBe(400);
    expect(after.body.errors[0]).toEqual({ path: "targetPF", message: "form fields must come before the file field" });
    const other = await api(app).post(URL).attach("data", week, "week.csv");
    expect(other.status).toBe(400);
    expect(other.body.errors[0].path).toBe("data");
    const none = await api(app).post(URL).field("targetPF", "0.9");
    expect(none.status).toBe(400);
    expect(none.body.errors[0]).toMatchObject({ path: "file" });
    expect(none.headers["content-type"]).toMatch(/^application\/problem\+json/);
  });

  it("a bad option in a form field is a 400 naming it", async () => {
    const r = await api(app).post(URL).field("bankSteps", "fifty").attach("file", week, "week.csv");
    expect(r.status).toBe(400);
    expect(r.body.errors[0].path).toBe("bankSteps");
  });

  it("bad rows in an uploaded file give a 422 with line numbers", async () => {
    const text = week.toString().split("\n");
    for (const k of [
      3, 5, 7, 9, 11, 13, 15, 17, 19, 21, 23, 25, 27, 29, 31, 33, 35, 37, 39, 41, 43, 45, 47, 49, 51, 53, 55, 57, 59, 61, 63, 65, 67, 69,
    ])
      text[k] = "oops";
    const r = await api(app)
      .post(URL)
      .attach("file", Buffer.from(text.join("\n")), "bad.csv");
    expect(r.status).toBe(422);
    expect(r.body.errors[0]).toEqual({ path: "line.4", message: "wrong column count: 1 field, the header has 3" });
  });

  it("a malformed multipart body is a 400, not a 500", async () => {
    for (const [type, body] of [
      ["multipart/form-data", "no boundary parameter"],
      ["multipart/form-data; boundary=xyz", '--xyz\r\nContent-Disposition: form-data; name="file"; filename="a.csv"\r\n\r\ntime,kW,kvar\n'],
    ]) {
      const r = await inject(app, { method: "POST", url: URL, headers: { "content-type": type! }, payload: body! });
      expect(r.statusCode, body).toBe(400);
      expect(r.json().type).toMatch(/bad-upload$/);
    }
  });
});
