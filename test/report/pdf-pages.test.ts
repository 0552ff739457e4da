import { describe, expect, it } from "vitest";
import { buildReportModel } from "../../src/report/index.js";
import { arrange, type LayoutBox, type Page, paginate, STRAY_PAGE_SHARE } from "../../src/report/pdf-layout.js";
import { measureReportPdf, renderReportPdfWithStats } from "../../src/report/pdf.js";
import type { ReportModel } from "../../src/report/types.js";
import { fullReportInput, plainInput, sized } from "./fixtures.js";
import { readPdf } from "./pdfjs.js";

/** Margin of the PDF pages (15 mm) and the footer band above it: body text sits above y = 42.5 + 14 pt. */
const FOOTER_TOP_PT = (15 / 25.4) * 72 + 14;

/** The plain report with `n` one-line paragraphs added at the start of the first section or the end of the last. */
function padded(n: number, where: "first" | "last"): ReportModel {
  const pi = plainInput();
  const model = buildReportModel({ inputs: pi, result: sized(pi) });
  const filler = Array.from({ length: n }, (_, k) => ({
    kind: "paragraph" as const,
    text: `Site note ${k + 1}: reading repeated at the main switchboard.`,
  }));
  const section = where === "first" ? model.sections[0] : model.sections[model.sections.length - 1];
  if (!section) throw new Error("the report has no sections");
  section.blocks = where === "first" ? [...filler, ...section.blocks] : [...section.blocks, ...filler];
  return model;
}

const endsWithKept = (boxes: readonly LayoutBox[], pages: readonly Page[]) =>
  pages.slice(0, -1).filter((p) => boxes[p.placements[p.placements.length - 1]?.box ?? -1]?.keepWithNext === "always").length;
const endsWithHeading = (boxes: readonly LayoutBox[], pages: readonly Page[]) =>
  pages.slice(0, -1).filter((p) => ["heading", "subheading"].includes(boxes[p.placements[p.placements.length - 1]?.box ?? -1]?.kind ?? "")).length;
const withoutKeeps = (boxes: readonly LayoutBox[]) => boxes.map((b) => ({ ...b, keepWithNext: undefined }));

describe("report PDF pages", () => {
  it("never ends a page with a heading, wherever the headings fall", () => {
    let exercised = 0;
    for (let n = 0; n <= 12; n++) {
      const { boxes, frame } = measureReportPdf(padded(n, "first"));
      // Without the keep rule, some of these shifts put a heading last on a page: the rule has work to do.
      exercised += endsWithHeading(boxes, paginate(withoutKeeps(boxes), frame));
      expect(endsWithKept(boxes, arrange(boxes, frame).pages), `${n} lines added`).toBe(0);
    }
    expect(exercised).toBeGreaterThan(0);
  });

  it("draws what the layout says: no heading is the lowest text on a page (read back with pdfjs)", async () => {
    // The first shift that would strand a heading without the rule.
    const n = Array.from({ length: 13 }, (_, k) => k).find((k) => {
      const { boxes, frame } = measureReportPdf(padded(k, "first"));
      return endsWithHeading(boxes, paginate(withoutKeeps(boxes), frame)) > 0;
    });
    expect(n).toBeDefined();
    const model = padded(n as number, "first");
    const { pdf, stats } = await renderReportPdfWithStats(model);
    const { items, pages } = await readPdf(pdf);
    expect(pages.length).toBe(stats.pages);
    const headings = new Set([
      ...model.sections.map((s, i) => `${i + 1}. ${s.heading}`),
      ...model.sections.flatMap((s) => s.blocks.flatMap((b) => (b.kind === "subheading" ? [b.text] : []))),
    ]);
    items.forEach((page, i) => {
      const body = page.filter((it) => it.str.trim() !== "" && it.y > FOOTER_TOP_PT);
      const lowest = body.reduce((a, b) => (b.y < a.y ? b : a));
      expect(headings.has(lowest.str), `page ${i + 1} ends with "${lowest.str}"`).toBe(false);
    });
    stats.layout
      .slice(0, -1)
      .forEach((p, i) =>
        expect(["heading", "subheading", "table-head", "key-values-title"], `page ${i + 1}`).not.toContain(p.kinds[p.kinds.length - 1]),
      );
  });

  it("does not leave the last page almost empty", async () => {
    let strays = 0;
    let pulledBack = 0;
    let firstStray: { n: number; naturalPages: number } | undefined;
    for (let n = 0; n <= 8; n++) {
      const { boxes, frame } = measureReportPdf(padded(n, "last"));
      const body = frame.bottomPt - frame.topPt;
      const natural = paginate(boxes, frame);
      if (natural.length < 2 || (natural[natural.length - 1] as Page).usedPt >= STRAY_PAGE_SHARE * body) continue;
      strays++;
      firstStray ??= { n, naturalPages: natural.length };
      const { pages } = arrange(boxes, frame);
      if (pages.length < natural.length) pulledBack++;
      else expect((pages[pages.length - 1] as Page).usedPt, `${n} lines added`).toBeGreaterThanOrEqual(STRAY_PAGE_SHARE * body);
    }
    // The added lines walk the report's end down the page: some strand a few lines on a page of their own, and
    // (this report having about 5 pages of gaps to tighten) those pages are pulled back.
    expect(strays).toBeGreaterThan(0);
    expect(pulledBack).toBeGreaterThan(0);
    // Read one back: the PDF has one page less than the plain layout, and its last page is well filled.
    const stray = firstStray as { n: number; naturalPages: number };
    const { pdf, stats } = await renderReportPdfWithStats(padded(stray.n, "last"));
    const { items, size, pages } = await readPdf(pdf);
    expect(items.length).toBe(stray.naturalPages - 1);
    expect(stats.gapScale).toBeLessThan(1);
    expect(pages[pages.length - 1]).toContain(`page ${pages.length} of ${pages.length}`);
    const last = (items[items.length - 1] ?? []).filter((it) => it.str.trim() !== "" && it.y > FOOTER_TOP_PT);
    const lowestFromTopPt = (size[1] as number) - Math.min(...last.map((it) => it.y));
    const topPt = (15 / 25.4) * 72;
    // Baselines sit a few points above their box's foot: allow one line.
    expect(lowestFromTopPt - topPt).toBeGreaterThan(STRAY_PAGE_SHARE * stats.bodyHeightPt - 12);
  });

  it("splits survey notes of the longest allowed size line by line across pages, without overlap or overflow", async () => {
    // 5000 characters: the schema's limit for survey notes (src/http/schemas/surveys.ts).
    const sentence = "Feeder 4 at the Łódź annex read twice; the second reading stands. ";
    const longWord = `photo-ref:${"x".repeat(90)}`;
    const notes = `${sentence.repeat(35)}${longWord}\n${sentence.repeat(40)}`.slice(0, 5000).trim();
    const input = fullReportInput();
    const model = buildReportModel({ ...input, survey: { ...(input.survey as NonNullable<typeof input.survey>), notes } });
    const { pdf, stats } = await renderReportPdfWithStats(model);
    const { items } = await readPdf(pdf);
    expect(items.length).toBe(stats.pages);
    const body = items.map((page) => page.filter((it) => it.str.trim() !== "" && it.y > FOOTER_TOP_PT));
    const text = body
      .flat()
      .map((it) => it.str)
      .join(" ")
      .replace(/\s+/g, " ");
    // Every word comes back in order (the over-long word cut into pieces of one line each).
    expect(text.replace(/photo-ref:x+( x+)*/, "WORD")).toContain(notes.replace(longWord, "WORD").replace(/\s+/g, " "));
    // The notes' lines: one text item per line, each line below the one before (no line drawn twice or over another).
    const noteLines = body.map((page) => page.filter((it) => it.str.includes("Łódź annex") || /^(photo-ref:)?x{5,}$/.test(it.str)));
    const pagesWithNotes = noteLines.filter((l) => l.length > 0);
    expect(pagesWithNotes.length).toBeGreaterThan(1);
    for (const lines of pagesWithNotes) lines.slice(1).forEach((l, k) => expect((lines[k] as { y: number }).y - l.y).toBeGreaterThanOrEqual(9));
    // Nothing but the footer below the text area.
    items.forEach((page, i) =>
      page
        .filter((it) => it.str.trim() !== "" && it.y <= FOOTER_TOP_PT)
        .forEach((it) =>
          expect(it.str.startsWith("Power-factor correction report") || it.str === `page ${i + 1} of ${items.length}`, it.str).toBe(true),
        ),
    );
  });
});
