import { describe, expect, it } from "vitest";
import { buildReportModel, renderReportPdf, renderReportPdfWithStats } from "../../src/report/index.js";
import { fontCovers } from "../../src/report/pdf-fonts.js";
import { pdfSafe } from "../../src/report/pdf-text.js";
import { fullReportInput, plainInput, sized } from "./fixtures.js";
import { readPdf } from "./pdfjs.js";

const input = fullReportInput();
const { result } = input;
const model = buildReportModel(input);

describe("report PDF", () => {
  it("carries the sections, key figures and every caution title as text", async () => {
    const buf = await renderReportPdf(model);
    expect(buf.subarray(0, 5).toString("latin1")).toBe("%PDF-");
    const { pages, size } = await readPdf(buf);
    expect(size.map(Math.round)).toEqual([595, 842]); // A4 in points
    const all = pages.join(" ");
    for (const h of [
      "Building and survey",
      "Readings and power triangle per load",
      "Site before and after correction",
      "Capacitor bank",
      "Resonance and harmonics",
      "Economics",
      "Warnings",
      "Safety cautions",
      "Methods and standards",
    ])
      expect(all).toContain(h);
    expect(all).toContain(`from PF ${result.site.displacementPF.toFixed(3)} lagging, ${result.correction.kVABefore.toFixed(1)} kVA`);
    expect(all).toContain(`${result.correction.kvarRequired.toFixed(1)} kvar`);
    for (const s of result.recommendedBank?.stages ?? []) expect(all).toContain((s.resonanceOrder as number).toFixed(2));
    for (const l of result.loads) expect(all).toContain(l.kW.toFixed(1));
    for (const w of result.warnings) expect(all).toContain(w.code);
    for (const c of result.cautions) expect(all).toContain(`CAUTION: ${c.title}`);
    expect(all).toContain("srv_TEST123");
    // The report's symbols print as in the HTML (the embedded font has them), and nothing became "?".
    expect(all).toContain("h = √(S_sc/Q)");
    expect(all).toMatch(/φ \d+\.\d°/);
    expect(all).toContain("PF₁");
    expect(JSON.stringify(model)).not.toContain("?");
    expect(all).not.toContain("?");
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
    const polylinePoints = charts.reduce(
      (n, b) => n + (b.kind === "chart" ? b.chart.shapes.reduce((m, s) => m + (s.kind === "polyline" ? s.points.length - 1 : 0), 0) : 0),
      0,
    );
    expect(polylinePoints).toBeGreaterThan(500);
    expect(lineTos).toBeGreaterThanOrEqual(polylinePoints);
    expect(raw).toMatch(/\[[\d. ]+\] 0 d/); // dash patterns set for the stage lines
  });

  it("renders a plain site on Letter paper and still carries the mandatory cautions", async () => {
    const pi = plainInput();
    const r = sized(pi);
    const buf = await renderReportPdf(buildReportModel({ inputs: pi, result: { ...r, cautions: [] } }), { size: "LETTER" });
    const { pages, size } = await readPdf(buf);
    expect(size.map(Math.round)).toEqual([612, 792]);
    const all = pages.join(" ");
    for (const t of [
      "Stored charge and discharge time",
      "Lockout/tagout and verification",
      "Never on a drive's output",
      "Motor-terminal capacitors and self-excitation",
      "Switching transients",
      "Generator operation",
      "Ventilation and ambient temperature",
      "Local codes and licensed practice",
    ])
      expect(all).toContain(`CAUTION: ${t}`);
    expect(all).toContain("Resonance was not screened");
    expect(all).toContain("Economics not evaluated");
  });
});

describe("PDF text mapping", () => {
  it("keeps what the embedded font draws and marks the rest", () => {
    // Symbols of the report, Latin Extended, Greek and Cyrillic: DejaVu Sans has them all (its coverage table).
    for (const t of ["φ √3 I² ≤ ≥ Σ PF₁ − ∥ µF 35.2° 4 × 50 ± – · é", "Łódź Ţesătorie Țară Şiş İğdır Příliš", "Ωμέγα Щёлково"])
      expect(pdfSafe(t)).toBe(t);
    // Not in DejaVu Sans: a Han character, an emoji (one "?" for its two UTF-16 units), a control character.
    expect(pdfSafe("漢 🔥 a\u0007b")).toBe("? ? a?b");
    expect(pdfSafe("a\tb\r\nc")).toBe("a b \nc");
    // pdfSafe passes printable ASCII through unchecked: the font must cover it all.
    for (let cp = 0x20; cp <= 0x7e; cp++) expect(fontCovers(cp), String.fromCodePoint(cp)).toBe(true);
  });
});
