import { getDocument } from "pdfjs-dist/legacy/build/pdf.mjs";
import { describe, expect, it } from "vitest";
import { buildReportModel, renderReportPdf, renderReportPdfWithStats } from "../../src/report/index.js";
import { pdfSafe } from "../../src/report/pdf-text.js";
import { fullReportInput, plainInput, sized } from "./fixtures.js";

async function pdfText(buf: Buffer): Promise<{ pages: string[]; size: number[] }> {
  const doc = await getDocument({ data: new Uint8Array(buf), isEvalSupported: false, disableFontFace: true, verbosity: 0 }).promise;
  const pages: string[] = [];
  for (let i = 1; i <= doc.numPages; i++) {
    const page = await doc.getPage(i);
    const content = await page.getTextContent();
    pages.push(content.items.map((it) => ("str" in it ? it.str : "")).join(" ").replace(/\s+/g, " "));
  }
  const first = await doc.getPage(1);
  const size = first.view.slice(2);
  await doc.destroy();
  return { pages, size };
}

const input = fullReportInput();
const { result } = input;
const model = buildReportModel(input);

describe("report PDF", () => {
  it("carries the sections, key figures and every caution title as text", async () => {
    const buf = await renderReportPdf(model);
    expect(buf.subarray(0, 5).toString("latin1")).toBe("%PDF-");
    const { pages, size } = await pdfText(buf);
    expect(size.map(Math.round)).toEqual([595, 842]); // A4 in points
    const all = pages.join(" ");
    for (const h of ["Building and survey", "Readings and power triangle per load", "Site before and after correction", "Capacitor bank", "Resonance and harmonics", "Economics", "Warnings", "Safety cautions", "Methods and standards"])
      expect(all).toContain(h);
    expect(all).toContain(`from PF ${result.site.displacementPF.toFixed(3)} lagging, ${result.correction.kVABefore.toFixed(1)} kVA`);
    expect(all).toContain(`${result.correction.kvarRequired.toFixed(1)} kvar`);
    for (const s of result.recommendedBank?.stages ?? []) expect(all).toContain((s.resonanceOrder as number).toFixed(2));
    for (const l of result.loads) expect(all).toContain(l.kW.toFixed(1));
    for (const w of result.warnings) expect(all).toContain(w.code);
    for (const c of result.cautions) expect(all).toContain(`CAUTION: ${c.title}`);
    expect(all).toContain("srv_TEST123");
    // Symbols outside WinAnsi are spelled out, not dropped or turned into "?".
    expect(all).toContain("h = sqrt(S_sc/Q)");
    expect(all).toMatch(/phi \d+\.\d°/);
    expect(all).not.toContain("√");
    // Every page carries the running footer with its number.
    pages.forEach((p, i) => expect(p).toContain(`page ${i + 1} of ${pages.length}`));
  });

  it("draws the charts as vector paths, not images", async () => {
    const { pdf, stats } = await renderReportPdfWithStats(model, { compress: false });
    const charts = model.sections.flatMap((s) => s.blocks).filter((b) => b.kind === "chart");
    expect(stats.charts).toBe(charts.length);
    const shapes = charts.reduce((n, b) => n + (b.kind === "chart" ? b.chart.shapes.length : 0), 0);
    expect(stats.chartPrimitives).toBe(shapes);
    const raw = pdf.toString("latin1");
    expect(raw).not.toMatch(/\/Subtype\s*\/Image/);
    // Each polyline point after the first is one lineTo; the scan lines alone have hundreds.
    const lineTos = raw.match(/[\d.-]+ [\d.-]+ l\n/g)?.length ?? 0;
    const polylinePoints = charts.reduce((n, b) => n + (b.kind === "chart" ? b.chart.shapes.reduce((m, s) => m + (s.kind === "polyline" ? s.points.length - 1 : 0), 0) : 0), 0);
    expect(polylinePoints).toBeGreaterThan(500);
    expect(lineTos).toBeGreaterThanOrEqual(polylinePoints);
    expect(raw).toMatch(/\[[\d. ]+\] 0 d/); // dash patterns set for the stage lines
  });

  it("renders a plain site on Letter paper and still carries the mandatory cautions", async () => {
    const pi = plainInput();
    const r = sized(pi);
    const buf = await renderReportPdf(buildReportModel({ inputs: pi, result: { ...r, cautions: [] } }), { size: "LETTER" });
    const { pages, size } = await pdfText(buf);
    expect(size.map(Math.round)).toEqual([612, 792]);
    const all = pages.join(" ");
    for (const t of ["Stored charge and discharge time", "Lockout/tagout and verification", "Never on a drive's output", "Motor-terminal capacitors and self-excitation", "Switching transients", "Generator operation", "Ventilation and ambient temperature", "Local codes and licensed practice"])
      expect(all).toContain(`CAUTION: ${t}`);
    expect(all).toContain("Resonance was not screened");
    expect(all).toContain("Economics not evaluated");
  });
});

describe("PDF text mapping", () => {
  it("spells out symbols the built-in fonts lack and keeps WinAnsi ones", () => {
    expect(pdfSafe("φ √3 I² ≤ ≥ Σ PF₁ − ∥")).toBe("phi sqrt(3) I^2 <= >= Sum  PF1 - ||");
    expect(pdfSafe("h = √(S_sc/Q), 1/√p")).toBe("h = sqrt(S_sc/Q), 1/sqrt(p)");
    expect(pdfSafe("µF 35.2° 4 × 50 ± – · é")).toBe("µF 35.2° 4 × 50 ± – · é");
    expect(pdfSafe("漢")).toBe("?");
  });
});
