/** The report routes on the real app, as src/app.ts registers them. */
import type { FastifyInstance } from "fastify";
import { parse } from "node-html-parser";
import { getDocument } from "pdfjs-dist/legacy/build/pdf.mjs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { exampleSizingBody } from "../helpers/bodies.js";
import { makeStoreApp } from "../helpers/db.js";
import { inject } from "../helpers/auth.js";

let app: FastifyInstance;
let surveyId: string;
let result: { site: { kW: number }; correction: { kvarRequired: number; pfAfter: number; kVAAfter: number } };

const building = {
  name: "Report test hall <B2>",
  address: "1 Test Road",
  system: { voltageV: 480, frequencyHz: 60, phases: 3 },
  transformer: { kVA: 1500, impedancePct: 5.75, xOverR: 6 },
  utility: { faultMVA: 250 },
};
const survey = {
  surveyedAt: "2024-05-02T09:00:00+02:00",
  surveyor: "R. Tester",
  notes: "feeder readings",
  targetPF: 0.95,
  loads: [
    { label: "Drive line", kind: "drive", measurement: { method: "kw_pf", kW: 75, pf: 0.95, sense: "lagging" } },
    { label: "Compressor", kind: "motor", measurement: { method: "v_i_pf", volts: 480, amps: 160, pf: 0.8, sense: "lagging" } },
  ],
};

async function pdfText(buf: Buffer): Promise<{ text: string; width: number }> {
  const doc = await getDocument({ data: new Uint8Array(buf), isEvalSupported: false, disableFontFace: true, verbosity: 0 }).promise;
  let text = "";
  for (let i = 1; i <= doc.numPages; i++)
    text += (await (await doc.getPage(i)).getTextContent()).items.map((it) => ("str" in it ? it.str : "")).join(" ") + " ";
  const width = (await doc.getPage(1)).view[2] as number;
  await doc.destroy();
  return { text: text.replace(/\s+/g, " "), width };
}

beforeAll(async () => {
  ({ app } = await makeStoreApp());
  const b = await inject(app, { method: "POST", url: "/v1/buildings", payload: building });
  expect(b.statusCode).toBe(201);
  const s = await inject(app, { method: "POST", url: `/v1/buildings/${b.json().id}/surveys`, payload: survey });
  expect(s.statusCode).toBe(201);
  surveyId = s.json().id;
  result = s.json().result;
  const r2 = await inject(app, {
    method: "POST",
    url: `/v1/surveys/${surveyId}/revisions`,
    payload: { ...survey, reason: "second compressor", loads: [...survey.loads, { ...survey.loads[1], label: "Compressor 2" }] },
  });
  expect(r2.statusCode).toBe(201);
});
afterAll(() => app.close());

describe("GET /v1/surveys/{id}/report", () => {
  it("answers the latest revision as a self-contained HTML document", async () => {
    const res = await inject(app, `/v1/surveys/${surveyId}/report`);
    expect(res.statusCode).toBe(200);
    expect(res.headers["content-type"]).toBe("text/html; charset=utf-8");
    expect(res.headers["content-security-policy"]).toContain("default-src 'none'");
    const doc = parse(res.body);
    const text = doc.text.replace(/\s+/g, " ");
    expect(text).toContain("Report test hall <B2>");
    expect(res.body).toContain("Report test hall &lt;B2&gt;");
    expect(text).toContain(`survey ${surveyId}, revision 2`);
    expect(text).toContain("second compressor");
    expect(text).toContain("R. Tester");
    expect(doc.querySelectorAll("#readings table.data tbody tr").map((tr) => tr.querySelector("td")?.text)).toEqual([
      "Drive line",
      "Compressor",
      "Compressor 2",
    ]);
  });

  it("answers an earlier revision when asked, and 404 problems for unknown surveys and revisions", async () => {
    const r1 = await inject(app, `/v1/surveys/${surveyId}/report?revision=1`);
    expect(r1.statusCode).toBe(200);
    const text = parse(r1.body).text.replace(/\s+/g, " ");
    expect(text).toContain(`revision 1`);
    expect(text).toContain(`PF ${result.correction.pfAfter.toFixed(3)} lagging and ${result.correction.kVAAfter.toFixed(1)} kVA`);
    for (const url of ["/v1/surveys/srv_nope/report", `/v1/surveys/${surveyId}/report?revision=9`, "/v1/surveys/srv_nope/report.pdf"]) {
      const res = await inject(app, url);
      expect(res.statusCode, url).toBe(404);
      expect(res.headers["content-type"]).toContain("application/problem+json");
      expect(res.json().type).toMatch(/not-found$/);
    }
    const bad = await inject(app, `/v1/surveys/${surveyId}/report?revision=zero`);
    expect(bad.statusCode).toBe(400);
    expect(bad.json().errors[0].path).toBe("revision");
  });
});

describe("GET /v1/surveys/{id}/report.pdf", () => {
  it("answers a PDF attachment with the survey's figures, A4 by default and Letter on request", async () => {
    const res = await inject(app, `/v1/surveys/${surveyId}/report.pdf?revision=1`);
    expect(res.statusCode).toBe(200);
    expect(res.headers["content-type"]).toBe("application/pdf");
    expect(res.headers["content-disposition"]).toBe(`attachment; filename="${surveyId}-r1-report.pdf"`);
    const { text, width } = await pdfText(res.rawPayload);
    expect(Math.round(width)).toBe(595);
    expect(text).toContain(`${result.site.kW.toFixed(1)} kW`);
    expect(text).toContain("CAUTION: Stored charge and discharge time");
    const letter = await inject(app, `/v1/surveys/${surveyId}/report.pdf?paper=letter`);
    expect(Math.round((await pdfText(letter.rawPayload)).width)).toBe(612);
    expect((await inject(app, `/v1/surveys/${surveyId}/report.pdf?paper=a3`)).statusCode).toBe(400);
  });
});

describe("POST /v1/sizing/report", () => {
  it("sizes the body and answers its report as HTML, or PDF with format=pdf", async () => {
    const html = await inject(app, { method: "POST", url: "/v1/sizing/report", payload: exampleSizingBody() });
    expect(html.statusCode).toBe(200);
    expect(html.headers["content-type"]).toBe("text/html; charset=utf-8");
    const sized = (await inject(app, { method: "POST", url: "/v1/sizing", payload: exampleSizingBody() })).json();
    const text = parse(html.body).text.replace(/\s+/g, " ");
    expect(text).toContain("sizing request (not stored)");
    expect(text).toContain(`from PF ${sized.site.displacementPF.toFixed(3)} lagging, ${sized.correction.kVABefore.toFixed(1)} kVA`);
    const pdf = await inject(app, { method: "POST", url: "/v1/sizing/report?format=pdf", payload: exampleSizingBody() });
    expect(pdf.headers["content-type"]).toBe("application/pdf");
    expect(pdf.headers["content-disposition"]).toBe('attachment; filename="sizing-report.pdf"');
    expect(pdf.rawPayload.subarray(0, 5).toString("latin1")).toBe("%PDF-");
  });

  it("rejects an invalid body with a 400 problem naming the field", async () => {
    const body = exampleSizingBody();
    body.loads[0].measurement.pf = 1.4;
    const res = await inject(app, { method: "POST", url: "/v1/sizing/report", payload: body });
    expect(res.statusCode).toBe(400);
    expect(res.headers["content-type"]).toContain("application/problem+json");
    expect(res.json().errors.map((e: { path: string }) => e.path)).toContain("loads.0.measurement.pf");
  });
});
