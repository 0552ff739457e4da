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
  const sorted = [...new Set(units)].sort((a, b) => a - b);
  const largest = sorted[sorted.length - 1] ?? 1;
  const maxJ = 4 * Math.max(1, Math.ceil(switchedNeededKvar / (minSteps * largest)));
  const unitSet = new Set(sorted);
  const isMultiple = (x: number): boolean => {
    const j = Math.round(x / largest);
    return j >= 2 && j <= maxJ && j * largest === x;
  };
  const available = (x: number) => unitSet.has(x) || isMultiple(x);
  const usableUnits = sorted.filter((u) => multipliers.every((m) => available(m * u)));
  const mMax = Math.max(1, ...multipliers);
  // j·L is usable when every m·j is at most maxJ (m·j ≥ 2 always holds for j ≥ 2).
  const maxUsableJ = Math.floor(maxJ / mMax);
  const multiples = Math.max(0, maxUsableJ - 1);
  const u = usableUnits.length;
  const at = (i: number) => (i < u ? (usableUnits[i] as number) : (i - u + 2) * largest);
  const short = (k: number, base: number, need: number) => k * base < need - REACH_EPS_KVAR;
  return {
    length: u + multiples,
    at,
    firstReaching(k, needKvar) {
      for (let i = 0; i < u; i++) if (!short(k, usableUnits[i] as number, needKvar)) return i;
      if (multiples === 0) return u;
      let j = Math.max(2, Math.ceil(needKvar / (k * largest)));
      // the estimate is within one of the answer; settle it with the same comparison as the listed search
      while (j > 2 && !short(k, (j - 1) * largest, needKvar)) j--;
      while (j <= maxUsableJ && short(k, j * largest, needKvar)) j++;
      return j > maxUsableJ ? u + multiples : u + j - 2;
    },
    indexNear(kvar) {
      const near = (b: number) => Math.abs(b - kvar) <= 1e-6 * b;
      for (let i = 0; i < u; i++) if (near(usableUnits[i] as number)) return i;
      const j = Math.round(kvar / largest);
      for (const c of [j - 1, j]) if (c >= 2 && c <= maxUsableJ && near(c * largest)) return u + c - 2;
      return -1;
    },
  };
}
