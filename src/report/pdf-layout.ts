/**
 * Page layout of the PDF as plain arithmetic on measured boxes: which box goes on which page, and where.
 * No pdfkit here: the flow measures blocks into boxes, this decides the pages, the flow then draws them.
 *
 * Rules (the usual book-typesetting ones: keep-with-next, keep-together, no short last page):
 * - a box marked keep "always" (a heading, a table's head) never ends a page: it moves with the box after it;
 * - boxes chained by keep "prefer" (the rows of a short table) move to the next page together when they fit on one,
 *   unless that would leave more than a third of this page blank: then they break after their first kept part;
 * - a break before a box with a repeated header (a table row) draws that header first on the new page;
 * - the last page is not left with a stray block: first the gaps are tightened to pull it back, else the page
 *   before gives up enough of its end that the last page is not almost empty.
 */

export type Keep = "always" | "prefer";

export interface LayoutBox {
  /** What the box is ("heading", "row", …): for the layout summary and tests. */
  kind: string;
  heightPt: number;
  /** Space below the box; dropped at a page foot, scaled when the layout tightens. */
  gapAfterPt: number;
  keepWithNext?: Keep;
  /** Height of a header drawn above this box when a page starts with it (0 or absent: none). */
  repeatHeightPt?: number;
  /** Always start a page with this box (the detail after page 1's verdict). */
  pageBreakBefore?: boolean;
}

export interface Placement {
  box: number;
  yPt: number;
  /** Draw the box's repeated header at yPt, and the box itself below it. */
  withRepeat: boolean;
}

export interface Page {
  placements: Placement[];
  /** From the frame's top to the foot of the last box. */
  usedPt: number;
}

export interface Frame {
  topPt: number;
  bottomPt: number;
}

export interface PaginateOptions {
  /** Multiplies every gap (1 by default). */
  gapScale?: number;
  /** Start a new page before these boxes (when they do not already start one). */
  breakBefore?: ReadonlySet<number>;
}

/** A last page filled less than this share of the frame is "almost empty". */
export const STRAY_PAGE_SHARE = 0.25;
/** A "prefer" chain does not move to the next page when that would leave more than this share of the page blank. */
export const MAX_BLANK_SHARE = 1 / 3;
/** Gap scales tried, in order, to pull a stray last page back onto the page before. */
const TIGHTER_GAPS = [0.75, 0.5];

/** Last index of the run from `i` whose boxes are chained by a keep of at least `strength`. */
function runEnd(boxes: readonly LayoutBox[], i: number, strength: Keep): number {
  let j = i;
  while (j < boxes.length - 1) {
    const keep = boxes[j]?.keepWithNext;
    if (keep === "always" || (strength === "prefer" && keep === "prefer")) j++;
    else break;
  }
  return j;
}

export function paginate(boxes: readonly LayoutBox[], frame: Frame, options: PaginateOptions = {}): Page[] {
  const scale = options.gapScale ?? 1;
  const gap = (k: number) => (boxes[k]?.gapAfterPt ?? 0) * scale;
  /** Height of boxes i..j stacked, without the gap after j. */
  const span = (i: number, j: number) => {
    let h = 0;
    for (let k = i; k <= j; k++) h += (boxes[k]?.heightPt ?? 0) + (k < j ? gap(k) : 0);
    return h;
  };
  const repeatOf = (k: number) => boxes[k]?.repeatHeightPt ?? 0;
  const body = frame.bottomPt - frame.topPt;
  const pages: Page[] = [{ placements: [], usedPt: 0 }];
  let y = frame.topPt;
  let startsPage = true;
  const newPage = () => {
    pages.push({ placements: [], usedPt: 0 });
    y = frame.topPt;
    startsPage = true;
  };
  const place = (k: number) => {
    const page = pages[pages.length - 1] as Page;
    const withRepeat = startsPage && page.placements.length === 0 && pages.length > 1 && repeatOf(k) > 0;
    page.placements.push({ box: k, yPt: y, withRepeat });
    y += (withRepeat ? repeatOf(k) : 0) + (boxes[k]?.heightPt ?? 0);
    page.usedPt = y - frame.topPt;
    y += gap(k);
    startsPage = false;
  };

  let i = 0;
  // Once a "prefer" chain is broken, the rest of it flows like free boxes (no half-empty page after all).
  let flowingUntil = -1;
  while (i < boxes.length) {
    if (!startsPage && (options.breakBefore?.has(i) || boxes[i]?.pageBreakBefore)) newPage();
    const must = runEnd(boxes, i, "always");
    const prefer = i <= flowingUntil ? must : runEnd(boxes, i, "prefer");
    const hMust = span(i, must);
    const hPrefer = span(i, prefer);
    const fitsHere = (h: number) => y + h <= frame.bottomPt;
    const fitsFresh = (h: number) => repeatOf(i) + h <= body;
    if (fitsHere(hPrefer)) {
      // The whole chain fits: place its first unbreakable part; the rest follows on this page.
    } else if (!startsPage && fitsFresh(hPrefer) && frame.bottomPt - y <= MAX_BLANK_SHARE * body) newPage();
    else {
      flowingUntil = Math.max(flowingUntil, prefer);
      // Break the chain, but only after its first unbreakable part.
      if (!fitsHere(hMust) && !startsPage) newPage();
    }
    for (let k = i; k <= must; k++) place(k);
    i = must + 1;
  }
  return pages;
}

/**
 * The break to try when the last page is almost empty: the latest free break on the page before (not after a
 * kept box, not its first box) that hands the last page at least the stray share while that page keeps as much,
 * or undefined.
 */
function balancingBreak(boxes: readonly LayoutBox[], pages: readonly Page[], frame: Frame, scale: number): number | undefined {
  const last = pages[pages.length - 1] as Page;
  const before = pages[pages.length - 2] as Page;
  const body = frame.bottomPt - frame.topPt;
  const need = STRAY_PAGE_SHARE * body;
  const firstOfLast = last.placements[0]?.box ?? boxes.length;
  for (let p = before.placements.length - 1; p >= 1; p--) {
    const { box: k, yPt } = before.placements[p] as Placement;
    if (boxes[k - 1]?.keepWithNext) continue;
    // Moving boxes k.. to the last page: their height, a gap, then what the last page already holds.
    const moved = before.usedPt - (yPt - frame.topPt) + (boxes[firstOfLast - 1]?.gapAfterPt ?? 0) * scale;
    // Neither page may end up almost empty.
    if (moved + last.usedPt > body || yPt - frame.topPt < need) return undefined;
    if (moved + last.usedPt >= need) return k;
  }
  return undefined;
}

/** Pages for `boxes`: `paginate` plus the rule against an almost empty last page. */
export function arrange(boxes: readonly LayoutBox[], frame: Frame): { pages: Page[]; gapScale: number } {
  const body = frame.bottomPt - frame.topPt;
  const stray = (pages: readonly Page[]) => pages.length > 1 && (pages[pages.length - 1] as Page).usedPt < STRAY_PAGE_SHARE * body;
  let pages = paginate(boxes, frame);
  let gapScale = 1;
  if (!stray(pages)) return { pages, gapScale };
  for (const scale of TIGHTER_GAPS) {
    const tighter = paginate(boxes, frame, { gapScale: scale });
    if (tighter.length < pages.length) {
      pages = tighter;
      gapScale = scale;
      break;
    }
  }
  if (!stray(pages)) return { pages, gapScale };
  const k = balancingBreak(boxes, pages, frame, gapScale);
  if (k === undefined) return { pages, gapScale };
  const balanced = paginate(boxes, frame, { gapScale, breakBefore: new Set([k]) });
  return balanced.length === pages.length && !stray(balanced) ? { pages: balanced, gapScale } : { pages, gapScale };
}
