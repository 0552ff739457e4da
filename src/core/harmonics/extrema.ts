/**
 * Resonance peaks and series dips of |Z(h)| located without a frequency grid.
 *
 * Lossless, the bus susceptance is B(h) = −1/(h·X_s) + Σ h/(X_C·(1 − p·h²)); between consecutive branch tuning orders
 * 1/√p it is V-shaped in magnitude, so |Z| = 1/|B| has exactly one maximum between two tuning orders (the parallel
 * resonance, parallelResonanceOrders) and one minimum at each tuning order (the series dip). Damping (R_s, the
 * reactors' R, the load resistance) moves and flattens these extrema but leaves that order in place: so each peak
 * is sought between two neighbouring tuning orders, each dip between the two lossless resonances around its tuning
 * order, by a safeguarded Newton search on the slope of the exact |Y(h)|² (refineExtremum), and kept only if it is a
 * true interior extremum of the range. Tuning orders within SAME_TUNING_REL of each other are one (equal reactor
 * percentages on capacitors of different kvar tune a rounding apart): one dip, searched between the resonances
 * around the group, and no peak inside it.
 */
import { parallelResonanceOrders, SAME_TUNING_REL, type Branch } from "./combined-stages.js";
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

/**
 * d|Y|²/dh and d²|Y|²/dh² of the bus admittance Y(h) = 1/Z(h) (Z_s ∥ R_load ∥ branches), into out[0] and out[1].
 * Each series element z = r + j·x(h) has y = 1/z, y′ = −j·x′·y², y″ = −j·x″·y² − 2·x′²·y³ (differentiating y = 1/z
 * twice); the source has x = h·X_s, a branch x = h·X_L − X_C/h. Then |Y|²′ = 2·Re(Ȳ·Y′) and
 * |Y|²″ = 2·(|Y′|² + Re(Ȳ·Y″)). Plain numbers, no allocation: the search's inner loop. NaN when a lossless branch
 * shorts the bus at h.
 */
function admittanceSlopes(model: BusModel, h: number, out: Float64Array): void {
  // the source: r = R_s, x = h·X_s, x′ = X_s, x″ = 0
  const rs = model.source.resistanceOhm;
  const xs1 = model.source.reactanceOhm;
  const xs = h * xs1;
  const ds = rs * rs + xs * xs;
  let yr = rs / ds;
  let yi = -xs / ds;
  let ar = yr * yr - yi * yi; // y²
  let ai = 2 * yr * yi;
  let d1r = xs1 * ai;
  let d1i = -xs1 * ar;
  let d2r = -2 * xs1 * xs1 * (ar * yr - ai * yi);
  let d2i = -2 * xs1 * xs1 * (ar * yi + ai * yr);
  if (model.loadResistanceOhm !== null) yr += 1 / model.loadResistanceOhm;
  const branches = model.branches;
  const invH = 1 / h;
  for (let i = 0; i < branches.length; i++) {
    const br = branches[i]!;
    const r = br.reactorResistanceOhm;
    const xl = br.reactorReactanceOhm;
    const xc = br.capacitorReactanceOhm;
    const x = h * xl - xc * invH;
    const x1 = xl + xc * invH * invH;
    const x2 = -2 * xc * invH * invH * invH;
    const d = r * r + x * x;
    if (d === 0) {
      out[0] = Number.NaN;
      out[1] = Number.NaN;
      return;
    }
    const er = r / d;
    const ei = -x / d;
    ar = er * er - ei * ei;
    ai = 2 * er * ei;
    const k = 2 * x1 * x1;
    yr += er;
    yi += ei;
    d1r += x1 * ai;
    d1i -= x1 * ar;
    d2r += x2 * ai - k * (ar * er - ai * ei);
    d2i += -x2 * ar - k * (ar * ei + ai * er);
  }
  out[0] = 2 * (yr * d1r + yi * d1i);
  out[1] = 2 * (d1r * d1r + d1i * d1i + yr * d2r + yi * d2i);
}

const slopes = new Float64Array(2);

const GOLDEN = (Math.sqrt(5) - 1) / 2;

/**
 * Golden-section search for the extremum of |Z(h)| in [lo, hi] (sign 1: maximum, −1: minimum): the fallback when
 * the slope of |Y|² does not bracket the extremum at the range's ends or the start.
 */
function goldenExtremum(model: BusModel, lo: number, hi: number, sign: 1 | -1): number {
  let a = lo;
  let b = hi;
  let c = b - GOLDEN * (b - a);
  let d = a + GOLDEN * (b - a);
  let fc = sign * drivingPointImpedanceOhm(model, c);
  let fd = sign * drivingPointImpedanceOhm(model, d);
  for (let i = 0; i < 100 && b - a > 1e-12 * b; i++) {
    if (fc > fd) {
      b = d;
      d = c;
      fd = fc;
      c = b - GOLDEN * (b - a);
      fc = sign * drivingPointImpedanceOhm(model, c);
    } else {
      a = c;
      c = d;
      fc = fd;
      d = a + GOLDEN * (b - a);
      fd = sign * drivingPointImpedanceOhm(model, d);
    }
  }
  return (a + b) / 2;
}

/** Interior points probedExtremum tries: enough to catch a damped extremum the lossless picture does not predict. */
const PROBES = 16;

/**
 * An interval where the lossless picture predicts no extremum (no resonance inside it, so no start): the slope is
 * probed at PROBES interior points; a sign change there is refined like any other, otherwise the extremum lies at an
 * end (no interior extremum: the caller drops it).
 */
function probedExtremum(model: BusModel, lo: number, hi: number, sign: 1 | -1): number {
  let prevH = lo;
  const gLo = signedSlope(model, lo, sign);
  // |Y|² falling from the first probe on: the slope is negative at every probe, so none would find a peak
  if (sign === 1 && admittanceFallsFrom(model, lo + (hi - lo) / (PROBES + 1))) return gLo >= 0 ? lo : hi;
  let prevG = gLo;
  for (let i = 1; i <= PROBES + 1; i++) {
    const h = i > PROBES ? hi : lo + ((hi - lo) * i) / (PROBES + 1);
    const gh = signedSlope(model, h, sign);
    if (prevG < 0 && gh > 0) return refineExtremum(model, prevH, h, sign, (prevH + h) / 2);
    prevH = h;
    prevG = gh;
  }
  return gLo >= 0 ? lo : hi;
}

/**
 * Whether |Y(h)|² falls for every order from h up, shown term by term: each branch is inductive by more than its
 * resistance (x = h·X_L − X_C/h ≥ r, so its conductance r/(r² + x²) and its susceptance's magnitude x/(r² + x²) both
 * fall as x rises with h), and h·X_s ≥ R_s (likewise for the source); the load's conductance is constant. Every
 * conductance falls and the susceptances, all of one sign, fall in magnitude together, so G² + B² falls. Plain
 * algebra; a plain branch (x < 0) or an order below R_s/X_s gives false.
 */
function admittanceFallsFrom(model: BusModel, h: number): boolean {
  if (!(h * model.source.reactanceOhm >= model.source.resistanceOhm)) return false;
  for (const br of model.branches) if (!(h * br.reactorReactanceOhm - br.capacitorReactanceOhm / h >= br.reactorResistanceOhm)) return false;
  return true;
}

/** sign·d|Y|²/dh: rises through 0 at the sought extremum (a module function, not a closure: the search's inner loop). */
function signedSlope(model: BusModel, h: number, sign: 1 | -1): number {
  admittanceSlopes(model, h, slopes);
  return sign * slopes[0]!;
}

/** Relative width in h at which the search stops: far below any figure the study reports. */
const REFINE_REL = 1e-14;

/**
 * The extremum of |Z(h)| in [lo, hi] (sign 1: maximum, −1: minimum), to ~1e-14 in h: a root of d|Y|²/dh, found by
 * Newton's method kept inside a bracket that bisection shrinks whenever a Newton step would leave it (the safeguarded
 * Newton–Raphson of Press et al., Numerical Recipes, §9.4). A peak of |Z| is a minimum of |Y|², a dip a maximum.
 * `start` (the lossless resonance or tuning order, when known) is where Newton begins. When the slope does not change
 * sign over the range, the extremum is at an end of it (the caller then finds no interior extremum there).
 */
export function refineExtremum(model: BusModel, lo: number, hi: number, sign: 1 | -1, start?: number): number {
  let a = lo;
  let b = hi;
  // An end next to a tuning order or a resonance can sit just past the neighbouring extremum of the other kind,
  // so its slope has the wrong sign: then the start (near the sought extremum) is one end of the bracket.
  if (!(signedSlope(model, a, sign) < 0 && signedSlope(model, b, sign) > 0)) {
    if (start === undefined || !(start > lo && start < hi)) return probedExtremum(model, lo, hi, sign);
    const gs = signedSlope(model, start, sign);
    if (gs === 0) return start;
    if (Number.isNaN(gs)) return goldenExtremum(model, lo, hi, sign);
    let found = false;
    // the start is on one side of the extremum: the other end is tried halfway to the range's end, then nearer it
    for (let k = 1; k <= 8 && !found; k++) {
      const reach = 1 - 1 / 2 ** k;
      if (gs < 0) {
        a = start;
        b = start + (hi - start) * reach;
        found = signedSlope(model, b, sign) > 0;
      } else {
        a = start - (start - lo) * reach;
        b = start;
        found = signedSlope(model, a, sign) < 0;
      }
    }
    if (!found) return goldenExtremum(model, lo, hi, sign);
  }
  let h = start !== undefined && start >= a && start <= b ? start : (a + b) / 2;
  for (let i = 0; i < 200; i++) {
    admittanceSlopes(model, h, slopes);
    const gh = sign * slopes[0]!;
    const dg = sign * slopes[1]!;
    if (gh === 0) return h;
    if (Number.isNaN(gh)) return h;
    if (gh < 0) a = h;
    else b = h;
    const newton = h - gh / dg;
    // Newton's step below the search's resolution: converged. (Its step can round onto h, an end of the bracket:
    // a bisection from there would only walk some 40 halvings back to h.)
    if (dg > 0 && Math.abs(newton - h) <= REFINE_REL * h) return newton;
    const next = dg > 0 && newton > a && newton < b ? newton : (a + b) / 2;
    if (Math.abs(next - h) <= REFINE_REL * h || b - a <= REFINE_REL * b) return next;
    h = next;
  }
  return h;
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

/**
 * The detuned branches' tuning orders 1/√p, ascending, those within SAME_TUNING_REL of the group's lowest as one
 * group: a flat list of [lowest, highest] pairs.
 */
function tuningGroups(model: BusModel): number[] {
  const orders: number[] = [];
  for (const br of model.branches) {
    if (!(br.reactorReactanceOhm > 0) || !(br.capacitorReactanceOhm > 0)) continue;
    const h = Math.sqrt(br.capacitorReactanceOhm / br.reactorReactanceOhm);
    if (Number.isFinite(h)) orders.push(h);
  }
  if (orders.length > 1) orders.sort((a, b) => a - b);
  const groups: number[] = [];
  for (const h of orders) {
    const n = groups.length;
    if (n > 0 && h <= groups[n - 2]! * (1 + SAME_TUNING_REL)) groups[n - 1] = h;
    else groups.push(h, h);
  }
  return groups;
}

/**
 * The lossless parallel resonances of the bus, without any that falls inside a group of tuning orders: between two
 * poles a rounding apart the closed form's root means nothing (and its bisection may land outside the pair).
 */
function losslessResonances(model: BusModel, groups: readonly number[], toOrder: number): number[] {
  const live: Branch[] = [];
  for (const b of model.branches) {
    // 1/X in place of kvar and short-circuit kVA: the same equation scaled by V², so the same roots.
    if (b.capacitorReactanceOhm > 0 && Number.isFinite(b.capacitorReactanceOhm))
      live.push({ capacitorKvar: 1 / b.capacitorReactanceOhm, reactorFraction: b.reactorReactanceOhm / b.capacitorReactanceOhm });
  }
  const all = parallelResonanceOrders(live, 1 / model.source.reactanceOhm, toOrder);
  let grouped = false;
  for (let g = 0; g < groups.length; g += 2) grouped ||= groups[g + 1]! > groups[g]!;
  if (!grouped) return all;
  const out: number[] = [];
  for (const r of all) {
    let inside = false;
    for (let g = 0; g < groups.length && !inside; g += 2) {
      const lo = groups[g]!;
      const hi = groups[g + 1]!;
      inside = hi > lo && r >= lo * (1 - SAME_TUNING_REL) && r <= hi * (1 + SAME_TUNING_REL);
    }
    if (!inside) out.push(r);
  }
  return out;
}

/**
 * Two extrema of a kind closer than CHECK_REL are one: searches from neighbouring tuning orders a little more than
 * SAME_TUNING_REL apart can both end at (or beside) the one dip damping leaves there, and isExtremum's neighbours lie
 * beyond both. The more extreme is kept.
 */
function oneExtremum(h1: number, h2: number): boolean {
  return Math.abs(h2 - h1) <= CHECK_REL * Math.max(h1, h2);
}

/** The first resonance strictly inside (lo, hi), if any. */
function resonanceWithin(resonances: readonly number[], lo: number, hi: number): number | undefined {
  for (const r of resonances) if (r > lo && r < hi) return r;
  return undefined;
}

/**
 * The extremum of |Z(h)| (sign 1: a peak, −1: a dip) searched in (lo, hi) ∩ (fromOrder, toOrder) from `start`, or
 * null when that search ends at an end of the range (no interior extremum there) or fails the extremum check.
 */
function extremumIn(
  model: BusModel,
  lo: number,
  hi: number,
  sign: 1 | -1,
  start: number | undefined,
  fromOrder: number,
  toOrder: number,
): number | null {
  const a = Math.max(lo, fromOrder);
  const b = Math.min(hi, toOrder);
  if (!(b > a)) return null;
  const h = refineExtremum(model, a, b, sign, start);
  if (h === a || h === b) return null;
  return isExtremum(model, h, sign, fromOrder, toOrder) ? h : null;
}

/** Peaks and dips of |Z(h)| strictly inside (fromOrder, toOrder), ascending by order. */
export function impedanceExtrema(model: BusModel, fromOrder: number, toOrder: number): { peaks: ResonancePeak[]; dips: ImpedanceDip[] } {
  const peaks: ResonancePeak[] = [];
  const dips: ImpedanceDip[] = [];
  let live = false;
  for (const b of model.branches) live ||= b.capacitorReactanceOhm > 0 && Number.isFinite(b.capacitorReactanceOhm);
  if (!live) return { peaks, dips };
  const groups = tuningGroups(model);
  const resonances = losslessResonances(model, groups, toOrder);
  // a peak between each two neighbouring groups of tuning orders (and below the first, above the last), none inside one
  for (let g = 0; g <= groups.length; g += 2) {
    const lo = g === 0 ? 0 : groups[g - 1]!;
    const hi = g === groups.length ? Number.POSITIVE_INFINITY : groups[g]!;
    // the lossless resonance in this interval, where there is one, is where the search starts
    const h = extremumIn(model, lo, hi, 1, resonanceWithin(resonances, lo, hi), fromOrder, toOrder);
    if (h === null) continue;
    const z = drivingPointImpedanceOhm(model, h);
    const prev = peaks[peaks.length - 1];
    if (prev && oneExtremum(prev.order, h)) {
      if (prev.impedanceOhm >= z) continue;
      peaks.pop();
    }
    peaks.push({
      order: h,
      impedanceOhm: z,
      timesSourceImpedance: z / sourceImpedanceOhmAt(model.source, h),
      timesBaseImpedance: z / model.source.baseImpedanceOhm,
    });
  }
  // a dip at each group, between the lossless resonances around it
  for (let g = 0; g < groups.length; g += 2) {
    const first = groups[g]!;
    const last = groups[g + 1]!;
    let below = 0;
    let above = Number.POSITIVE_INFINITY;
    for (const r of resonances) {
      if (r < first) below = r;
      else if (r > last && above === Number.POSITIVE_INFINITY) above = r;
    }
    const h = extremumIn(model, below, above, -1, first === last ? first : (first + last) / 2, fromOrder, toOrder);
    if (h === null) continue;
    const z = drivingPointImpedanceOhm(model, h);
    const prev = dips[dips.length - 1];
    if (prev && oneExtremum(prev.order, h)) {
      if (prev.impedanceOhm <= z) continue;
      dips.pop();
    }
    dips.push({ order: h, impedanceOhm: z });
  }
  return { peaks, dips };
}
