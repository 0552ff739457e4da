import type { ColumnArrays } from "../../core/interval/parser.js";

/**
 * Column arrays of parsed uploads, kept for the next upload instead of allocated anew. A year of 1-minute rows
 * fills four arrays of 4 MB each, and writing fresh memory costs a page fault every 4 KB — on a small virtual
 * machine that first touch, not the parsing, was most of the time spent filling the columns. Reused arrays are
 * already resident, so the resident set also stays flat from one upload to the next.
 *
 * At most MAX_KEPT arrays and MAX_KEPT_BYTES are kept, and none once no upload has come for IDLE_MS.
 */
const MAX_KEPT = 8;
const MAX_KEPT_BYTES = 64 * 1024 * 1024;
const IDLE_MS = 60_000;

const kept: Float64Array[] = [];
let idle: ReturnType<typeof setTimeout> | null = null;

function touched(): void {
  if (idle) clearTimeout(idle);
  idle = setTimeout(() => {
    kept.length = 0;
    idle = null;
  }, IDLE_MS);
  idle.unref();
}

export const columnPool: ColumnArrays = {
  /** The smallest kept array of at least `length` elements, else a new one. */
  take(length) {
    touched();
    let best = -1;
    for (let i = 0; i < kept.length; i++) {
      const a = kept[i] as Float64Array;
      if (a.length >= length && (best < 0 || a.length < (kept[best] as Float64Array).length)) best = i;
    }
    return best >= 0 ? (kept.splice(best, 1)[0] as Float64Array) : new Float64Array(length);
  },
  /** Keep an array whose contents are no longer needed (a whole buffer: views are widened to it). */
  give(array) {
    if (!(array.buffer instanceof ArrayBuffer) || array.buffer.byteLength === 0) return; // shared or detached
    const whole = array.byteOffset === 0 && array.length * 8 === array.buffer.byteLength ? array : new Float64Array(array.buffer);
    if (kept.includes(whole) || kept.some((a) => a.buffer === whole.buffer)) return;
    let bytes = whole.byteLength;
    for (const a of kept) bytes += a.byteLength;
    if (kept.length >= MAX_KEPT || bytes > MAX_KEPT_BYTES) return;
    kept.push(whole);
    touched();
  },
};
