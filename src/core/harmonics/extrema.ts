/**
 * Resonance peaks and series dips of |Z(h)| located without a frequency grid.
 *
 * Lossless, the bus susceptance is B(h) = −1/(h·X_s) + Σ h/(X_C·(1 − p·h²)); between consecutive branch tuning orders
 * 1/√p it is V-shaped in magnitude, so |Z| = 1/|B| has exactly one maximum between two tuning orders (the parallel
 * resonance, parallelResonanceOrders) and one minimum at each tuning order (the series dip). Damping (R_s, the
 * reactors' R, the load resistance) moves and flattens these extrema but leaves that order in place: so each peak
 * is sought between two neighbouring tuning orders, each dip between the two lossless resonances around its tuning
 * order, by golden-section search on the exact |Z(h)|, and kept only if it is a true interior extremum of the range.
 */
import { parallelResonanceOrders } from "./combined-stages.js";
import { drivingPointImpedanceOhm, sourceImpedanceOhmAt, type BusModel } from "./network.js";

/** A parallel resonance: a local maximum of |Z(h)|. */
export interface ResonancePeak {
  order: number;
  impedanceOhm: number;
  /** |Z(h)| / |Z_s(h)|: how much the bank amplifies the source impedance at that order. */
  timesSourceImpedance: number;
  /** |Z(h)| / Z_base. */
  timesBaseImpedance: number;
}

/** A series-tuned dip: a local minimum of |Z(h)| (a detuned stage near h = 1/√p). */
export interface ImpedanceDip {
  order: number;
  impedanceOhm: number;
}

const GOLDEN = (Math.sqrt(5) - 1) / 2;

/** Golden-section search for the extremum of |Z(h)| in [lo, hi] (sign 1: maximum, −1: minimum), to ~1e-12 in h. */
export function refineExtremum(model: BusModel, lo: number, hi: number, sign: 1 | -1): number {
  let a = lo;
  let b = hi;
  let c = b - GOLDEN * (b - a);
  let d = a + GOLDEN * (b - a);
  let fc = sign * drivingPointImpedanceOhm(model, c);
  let fd = sign * drivingPointImpedanceOhm(model, d);
  for (let i = 0; i < 100 && b - a > 1e-12 * b; i++) {
    if (fc > fd) {
      b = d; d = c; fd = fc;
      c = b - GOLDEN * (b - a);
      fc = sign * drivingPointImpedanceOhm(model, c);
    } else {
      a = c; c = d; fc = fd;
      d = a + GOLDEN * (b - a);
      fd = sign * drivingPointImpedanceOhm(model, d);
    }
  }
  return (a + b) / 2;
}

/**
 * Relative step of the "is it a true extremum" check: a quarter of the width of the sharpest peak the model can
 * make (X/R ≤ 100 at h ≤ 50 gives Q ≤ 5000, half-width 1e-4 in h/h_r), and far above the search's 1e-12.
 */
const CHECK_REL = 2.5e-5;

function isExtremum(model: BusModel, h: number, sign: 1 | -1, fromOrder: number, toOrder: number): boolean {
  const lo = h * (1 - CHECK_REL);
  const hi = h * (1 + CHECK_REL);
  if (!(lo > fromOrder && hi < toOrder)) return false;
  const z = sign * drivingPointImpedanceOhm(model, h);
  return z > sign * drivingPointImpedanceOhm(model, lo) && z > sign * drivingPointImpedanceOhm(model, hi);
}

/** The distinct tuning orders 1/√p of the model's detuned branches, ascending. */
function tuningOrders(model: BusModel): number[] {
  const out: number[] = [];
  for (const br of model.branches) {
    if (!(br.reactorReactanceOhm > 0) || !(br.capacitorReactanceOhm > 0)) continue;
    const h = Math.sqrt(br.capacitorReactanceOhm / br.reactorReactanceOhm);
    if (Number.isFinite(h) && !out.includes(h)) out.push(h);
  }
  return out.sort((a, b) => a - b);
}

/** Peaks and dips of |Z(h)| strictly inside (fromOrder, toOrder), ascending by order. */
export function impedanceExtrema(model: BusModel, fromOrder: number, toOrder: number): { peaks: ResonancePeak[]; dips: ImpedanceDip[] } {
  const peaks: ResonancePeak[] = [];
  const dips: ImpedanceDip[] = [];
  const live = model.branches.filter((b) => b.capacitorReactanceOhm > 0 && Number.isFinite(b.capacitorReactanceOhm));
  if (live.length === 0) return { peaks, dips };
  const tunings = tuningOrders(model);
  // 1/X in place of kvar and short-circuit kVA: the same equation scaled by V², so the same roots.
  const resonances = parallelResonanceOrders(
    live.map((b) => ({ capacitorKvar: 1 / b.capacitorReactanceOhm, reactorFraction: b.reactorReactanceOhm / b.capacitorReactanceOhm })),
    1 / model.source.reactanceOhm,
    toOrder,
  );
  const clip = (lo: number, hi: number): [number, number] | null => {
    const a = Math.max(lo, fromOrder);
    const b = Math.min(hi, toOrder);
    return b > a ? [a, b] : null;
  };
  const edges = [0, ...tunings, Number.POSITIVE_INFINITY];
  for (let i = 0; i + 1 < edges.length; i++) {
    const range = clip(edges[i]!, edges[i + 1]!);
    if (!range) continue;
    const h = refineExtremum(model, range[0], range[1], 1);
    if (!isExtremum(model, h, 1, fromOrder, toOrder)) continue;
    const z = drivingPointImpedanceOhm(model, h);
    peaks.push({ order: h, impedanceOhm: z, timesSourceImpedance: z / sourceImpedanceOhmAt(model.source, h), timesBaseImpedance: z / model.source.baseImpedanceOhm });
  }
  for (const ht of tunings) {
    const below = resonances.filter((r) => r < ht).pop() ?? 0;
    const above = resonances.find((r) => r > ht) ?? Number.POSITIVE_INFINITY;
    const range = clip(below, above);
    if (!range) continue;
    const h = refineExtremum(model, range[0], range[1], -1);
    if (isExtremum(model, h, -1, fromOrder, toOrder)) dips.push({ order: h, impedanceOhm: drivingPointImpedanceOhm(model, h) });
  }
  return { peaks, dips };
}
