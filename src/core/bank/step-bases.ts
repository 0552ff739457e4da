/**
 * The bases (smallest steps) a switched program may start from, in ascending order, held as a formula rather than a
 * list. The sizes a step may take are the unit sizes plus j·L, the largest unit L several times in parallel on one
 * contactor, for 2 ≤ j ≤ 4·max(1, ⌈need/(minSteps·L)⌉). Listed, they grow with the kvar (a 10⁷ kvar need is 10⁵
 * sizes and more); indexed, the step search does the same work at 10 kvar and at 10⁹ kvar.
 */
export interface BaseLadder {
  readonly length: number;
  /** The i-th base, ascending. */
  at(i: number): number;
  /** Index of the first base whose program total k·base reaches `needKvar` (the search's round-up); `length` if none. */
  firstReaching(k: number, needKvar: number): number;
  /** Index of the first base within 1e-6 of `kvar`; -1 if none. */
  indexNear(kvar: number): number;
}

/** The tolerance the search has always used on "reaches the need": 1e-9 kvar. */
const REACH_EPS_KVAR = 1e-9;

/**
 * `units` are the unit sizes (delivered kvar), `multipliers` the distinct multiples of the base the program uses
 * (powers of two, so m·(j·L) = (m·j)·L exactly in floating point). A base is usable when every multiple of it is
 * an available size.
 */
export function baseLadder(units: readonly number[], switchedNeededKvar: number, minSteps: number, multipliers: readonly number[]): BaseLadder {
  return new Ladder(units, switchedNeededKvar, minSteps, multipliers);
}

/** A base within 1e-6 (relative) of `kvar`. */
function isNear(base: number, kvar: number): boolean {
  return Math.abs(base - kvar) <= 1e-6 * base;
}

class Ladder implements BaseLadder {
  readonly length: number;
  private readonly usableUnits: number[];
  private readonly largest: number;
  private readonly maxUsableJ: number;

  constructor(units: readonly number[], switchedNeededKvar: number, minSteps: number, multipliers: readonly number[]) {
    const sorted = [...new Set(units)].sort((a, b) => a - b);
    const largest = sorted[sorted.length - 1] ?? 1;
    const maxJ = 4 * Math.max(1, Math.ceil(switchedNeededKvar / (minSteps * largest)));
    const unitSet = new Set(sorted);
    const available = (x: number): boolean => {
      if (unitSet.has(x)) return true;
      const j = Math.round(x / largest);
      return j >= 2 && j <= maxJ && j * largest === x;
    };
    this.usableUnits = sorted.filter((u) => multipliers.every((m) => available(m * u)));
    this.largest = largest;
    // j·L is usable when every m·j is at most maxJ (m·j ≥ 2 always holds for j ≥ 2).
    this.maxUsableJ = Math.floor(maxJ / Math.max(1, ...multipliers));
    this.length = this.usableUnits.length + Math.max(0, this.maxUsableJ - 1);
  }

  at(i: number): number {
    const u = this.usableUnits.length;
    return i < u ? (this.usableUnits[i] as number) : (i - u + 2) * this.largest;
  }

  firstReaching(k: number, needKvar: number): number {
    const u = this.usableUnits.length;
    // "short": k·base < need − ε, written out at each use (no closure per call: the search calls this per step count)
    const floor = needKvar - REACH_EPS_KVAR;
    for (let i = 0; i < u; i++) if (!(k * (this.usableUnits[i] as number) < floor)) return i;
    if (this.maxUsableJ < 2) return u;
    const L = this.largest;
    let j = Math.max(2, Math.ceil(needKvar / (k * L)));
    // the estimate is within one of the answer; settle it with the same comparison as the listed search
    while (j > 2 && !(k * ((j - 1) * L) < floor)) j--;
    while (j <= this.maxUsableJ && k * (j * L) < floor) j++;
    return j > this.maxUsableJ ? this.length : u + j - 2;
  }

  indexNear(kvar: number): number {
    const u = this.usableUnits.length;
    for (let i = 0; i < u; i++) if (isNear(this.usableUnits[i] as number, kvar)) return i;
    const j = Math.round(kvar / this.largest);
    for (const c of [j - 1, j]) if (c >= 2 && c <= this.maxUsableJ && isNear(c * this.largest, kvar)) return u + c - 2;
    return -1;
  }
}
