import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { arrange, type Frame, type LayoutBox, MAX_BLANK_SHARE, type Page, paginate, STRAY_PAGE_SHARE } from "../../src/report/pdf-layout.js";

// A 700 pt text area (about an A4 page between margins); heights are invented round numbers.
const FRAME: Frame = { topPt: 50, bottomPt: 750 };
const BODY = FRAME.bottomPt - FRAME.topPt;

const box = (kind: string, heightPt: number, more: Partial<LayoutBox> = {}): LayoutBox => ({ kind, heightPt, gapAfterPt: 0, ...more });
const heading = (more: Partial<LayoutBox> = {}) => box("heading", 20, { gapAfterPt: 8, keepWithNext: "always", ...more });

/** Page number of each box. */
function pageOf(pages: readonly Page[]): Map<number, number> {
  const at = new Map<number, number>();
  pages.forEach((p, n) => p.placements.forEach((pl) => at.set(pl.box, n)));
  return at;
}

/** Invariants every layout keeps, whatever the boxes. */
function checkLayout(boxes: readonly LayoutBox[], pages: readonly Page[]): void {
  const placed = pages.flatMap((p) => p.placements.map((pl) => pl.box));
  expect(placed).toEqual(boxes.map((_, i) => i)); // every box once, in order
  pages.forEach((p, n) => {
    for (const pl of p.placements) {
      const b = boxes[pl.box] as LayoutBox;
      const h = b.heightPt + (pl.withRepeat ? (b.repeatHeightPt ?? 0) : 0);
      // Nothing crosses the foot (beyond float rounding of summed heights), except a box taller than a page, alone at the top.
      if (h <= BODY) expect(pl.yPt + h, `box ${pl.box} on page ${n + 1}`).toBeLessThanOrEqual(FRAME.bottomPt + 1e-3);
      else expect(pl.yPt).toBe(FRAME.topPt);
    }
    const last = p.placements[p.placements.length - 1];
    // A box kept "always" with the next never ends a page (a heading is never alone at a page's foot).
    if (n < pages.length - 1 && last) expect(boxes[last.box]?.keepWithNext, `last box of page ${n + 1}`).not.toBe("always");
  });
}

describe("PDF page layout: headings", () => {
  it("moves a heading that would sit at a page's foot to the next page with its first block", () => {
    // Filler leaves 40 pt: room for the 20 pt heading, not for the 60 pt paragraph after it.
    const boxes = [box("paragraph", BODY - 40, { gapAfterPt: 0 }), heading(), box("paragraph", 60)];
    const pages = paginate(boxes, FRAME);
    expect(pages.map((p) => p.placements.map((pl) => pl.box))).toEqual([[0], [1, 2]]);
    checkLayout(boxes, pages);
  });

  it("keeps a heading, a subheading and a table head with the first rows, and repeats the header after a break", () => {
    // 60 rows, kept like lines: the first with the second, the last but one with the last.
    const rows = Array.from({ length: 60 }, (_, k) =>
      box("row", 15, { repeatHeightPt: 14, ...(k === 0 || k === 58 ? { keepWithNext: "always" as const } : {}) }),
    );
    const boxes = [
      box("paragraph", BODY - 70, { gapAfterPt: 5 }),
      heading(),
      box("subheading", 18, { gapAfterPt: 5, keepWithNext: "always" }),
      box("table-head", 14, { keepWithNext: "always" }),
      ...rows,
    ];
    const pages = paginate(boxes, FRAME);
    checkLayout(boxes, pages);
    const at = pageOf(pages);
    // 70 − 5 pt left: heading 28 + subheading 23 fit, the table head and two rows (44) do not: all move together.
    expect([1, 2, 3, 4, 5].map((k) => at.get(k))).toEqual([1, 1, 1, 1, 1]);
    const secondPage = pages[1] as Page;
    expect(secondPage.placements[0]?.box).toBe(1);
    // The rows that run over carry the header on the next page.
    const third = pages[2] as Page;
    expect(third.placements[0]?.withRepeat).toBe(true);
    expect(third.placements.slice(1).every((pl) => !pl.withRepeat)).toBe(true);
    // Never one row alone at the top of the last page.
    expect(third.placements.length).toBeGreaterThanOrEqual(2);
  });

  it("moves a short table whole, but splits it rather than leave more than a third of a page blank", () => {
    const table = (n: number) => [
      box("table-head", 14, { keepWithNext: "always" as const }),
      ...Array.from({ length: n }, (_, k) => box("row", 20, { repeatHeightPt: 14, ...(k < n - 1 ? { keepWithNext: "prefer" as const } : {}) })),
    ];
    // 150 pt left, a 14 + 10 × 20 = 214 pt table: moves (150 pt < a third of 700 pt).
    const moved = [box("paragraph", BODY - 150), ...table(10)];
    expect(pageOf(paginate(moved, FRAME)).get(1)).toBe(1);
    // 300 pt left: the same table starts here and continues on the next page.
    const split = [box("paragraph", BODY - 300), ...table(20)];
    const pages = paginate(split, FRAME);
    checkLayout(split, pages);
    expect(pageOf(pages).get(1)).toBe(0);
    expect(300).toBeGreaterThan(MAX_BLANK_SHARE * BODY);
    // Once split, the rows fill the page: at most one row's height is left blank at its foot.
    expect(FRAME.bottomPt - FRAME.topPt - (pages[0] as Page).usedPt).toBeLessThan(20);
  });

  it("keeps the invariants for any run of boxes (property)", () => {
    const arbBox = fc.record({
      kind: fc.constantFrom("heading", "paragraph", "row", "chart"),
      heightPt: fc.double({ min: 5, max: 900, noNaN: true }),
      gapAfterPt: fc.constantFrom(0, 2, 5, 10),
      keepWithNext: fc.constantFrom(undefined, "always", "prefer"),
      repeatHeightPt: fc.constantFrom(undefined, 0, 14),
    });
    fc.assert(
      fc.property(fc.array(arbBox, { maxLength: 60 }), (raw) => {
        const boxes: LayoutBox[] = raw.map((b) => ({
          kind: b.kind,
          heightPt: b.heightPt,
          gapAfterPt: b.gapAfterPt,
          ...(b.keepWithNext ? { keepWithNext: b.keepWithNext } : {}),
          ...(b.repeatHeightPt !== undefined ? { repeatHeightPt: b.repeatHeightPt } : {}),
        }));
        // A chain of "always" boxes taller than a page (with its gaps and a repeated header) cannot fit any page:
        // leave those out.
        const chainTooTall = boxes.some((first, i) => {
          let h = first.repeatHeightPt ?? 0;
          for (let k = i; k < boxes.length; k++) {
            const b = boxes[k] as LayoutBox;
            h += b.heightPt;
            if (b.keepWithNext !== "always") break;
            h += b.gapAfterPt;
          }
          return h > BODY;
        });
        fc.pre(!chainTooTall);
        checkLayout(boxes, arrange(boxes, FRAME).pages);
      }),
      { numRuns: 300 },
    );
  });
});

describe("PDF page layout: the last page", () => {
  const filler = (n: number, heightPt: number, gapAfterPt: number) => Array.from({ length: n }, () => box("paragraph", heightPt, { gapAfterPt }));

  it("tightens the gaps to pull a stray last block back onto the page before", () => {
    // 7 × 90 + 6 × 10 = 690 pt fill page 1 and the 8th box (30 pt) is alone on page 2. At 3/4 gaps:
    // 630 + 7 × 7.5 + 30 = 712.5 > 700; at half gaps: 630 + 7 × 5 + 30 = 695 pt, one page.
    const boxes = [...filler(7, 90, 10), box("paragraph", 30)];
    const natural = paginate(boxes, FRAME);
    expect(natural.length).toBe(2);
    expect((natural[1] as Page).usedPt).toBeLessThan(STRAY_PAGE_SHARE * BODY);
    const { pages, gapScale } = arrange(boxes, FRAME);
    expect(pages.length).toBe(1);
    expect(gapScale).toBeLessThan(1);
    checkLayout(boxes, pages);
  });

  it("when the gaps cannot save the page, the page before hands enough to the last one", () => {
    // 20 boxes of 68 pt, 2 pt gaps: 10 per page (698 pt), and 2 pages full; a 20 pt box strays onto page 3.
    const boxes = [...filler(20, 68, 2), box("paragraph", 20)];
    const natural = paginate(boxes, FRAME);
    expect(natural.length).toBe(3);
    expect((natural[2] as Page).usedPt).toBeLessThan(STRAY_PAGE_SHARE * BODY);
    const { pages } = arrange(boxes, FRAME);
    expect(pages.length).toBe(3);
    expect((pages[2] as Page).usedPt).toBeGreaterThanOrEqual(STRAY_PAGE_SHARE * BODY);
    // No more moved than needed: page 2 keeps the most it can.
    expect((pages[2] as Page).placements.length).toBe(Math.ceil((STRAY_PAGE_SHARE * BODY - 20) / 70) + 1);
    checkLayout(boxes, pages);
  });

  it("leaves a last page alone when it is not almost empty, and never breaks after a kept box to fill it", () => {
    const full = [...filler(7, 90, 10), box("paragraph", 300)];
    expect(arrange(full, FRAME).pages).toEqual(paginate(full, FRAME));
    // The only free break on page 1 is before the heading: taking it would leave page 1 almost empty (110 pt), and
    // the heading cannot leave its paragraph, so the layout stays as it is (the gaps cannot save 20 pt either).
    const kept = [box("paragraph", 100, { gapAfterPt: 10 }), heading(), box("paragraph", BODY - 138), box("paragraph", 20)];
    const { pages } = arrange(kept, FRAME);
    checkLayout(kept, pages);
    expect(pages.map((p) => p.placements.map((pl) => pl.box))).toEqual([[0, 1, 2], [3]]);
  });
});
