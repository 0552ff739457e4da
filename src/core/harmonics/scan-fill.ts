/**
 * The frequency scan's inner loop: |Z(h)| on a uniform grid with one division and one square root per point.
 *
 * Method (plain algebra of parallel impedances, no approximation). Branch k at order h, with u = h²·X_L − X_C
 * (= h times its reactance h·X_L − X_C/h), has admittance 1/(r + j·u/h) = (r·h² − j·h·u)/D with D = r²·h² + u², so no
 * 1/h is needed; the source R_s + j·h·X_s has (R_s − j·h·X_s)/(R_s² + h²·X_s²); the linear load adds G_0. The loop
 * keeps the bus admittance as one fraction (n_g + j·n_b)/den, adding a term p/D as (n·D + p·den)/(den·D), and ends with
 * |Z| = den/√(n_g² + n_b²): every step is a product or a sum, so the rounding per term is that of summing reciprocals,
 * and the cancellation of the susceptance near a parallel resonance is the circuit's own, as in the term-by-term sum.
 *
 * Range (why no overflow, no loss to subnormals, and no Math.hypot): each denominator term is multiplied by a constant
 * c = 1/√(D_min·D_max) of its bounds over the scanned orders (the fraction is unchanged by scaling a term's numerator
 * and denominator alike), so it stays within [1/ρ, ρ], ρ = √(D_max/D_min). With S = Σ log2 ρ over the source and the
 * branches, every partial den lies in [2^−S, 2^S]; the partial conductance lies in [G_lo, G_max] and the partial
 * |susceptance| is at most B_max (bounds below), so every n_g, n_b and product in the loop is at most
 * 2^S·max(1, G_max, B_max), and n_g ≥ 2^−S·G_lo > 0. planScan accepts a model only when both stay inside 2^±400: then
 * n_g² + n_b² lies in [2^−800, 2^801], a normal double, and the division cannot overflow. Otherwise it returns null
 * and the caller uses the reciprocal-per-term loop (network.ts fillImpedanceOhm), which needs no such bound.
 */
import type { BusModel } from "./network.js";

/** log2 of the largest magnitude allowed in the loop; squares stay below 2^801, far from 2^1024 and from 2^−1022. */
const RANGE_LOG2 = 400;
const BRANCH_STRIDE = 5;

/** Constants of one model over one range of orders; branch k at offset 5k: c·r², c·r, X_L, X_C, c (its scale). */
export interface ScanPlan {
  sourceRSq: number;
  sourceR: number;
  sourceXSq: number;
  sourceX: number;
  loadG: number;
  branches: Float64Array;
}

/** Bounds of D = a + h²·b over h ∈ [lo, hi] (a, b ≥ 0): the source's R_s² + h²·X_s². */
function sourceBounds(r: number, x: number, lo: number, hi: number): [number, number] {
  return [r * r + lo * lo * x * x, r * r + hi * hi * x * x];
}

/** Bounds of D = r²·h² + u², u = h²·X_L − X_C rising with h, over h ∈ [lo, hi]; u may cross 0 (the tuning order). */
function branchBounds(r: number, xl: number, xc: number, lo: number, hi: number): { dMin: number; dMax: number; uMax: number } {
  const uLo = lo * lo * xl - xc;
  const uHi = hi * hi * xl - xc;
  const uMax = Math.max(Math.abs(uLo), Math.abs(uHi));
  const uMin = uLo <= 0 && uHi >= 0 ? 0 : Math.min(Math.abs(uLo), Math.abs(uHi));
  return { dMin: r * r * lo * lo + uMin * uMin, dMax: r * r * hi * hi + uMax * uMax, uMax };
}

const usable = (dMin: number, dMax: number) => dMin > 0 && Number.isFinite(dMax);

/**
 * The loop's constants for orders in [fromOrder, toOrder], or null when the range bound of the header cannot be shown
 * (a branch that can short the bus, no source resistance, non-finite or extreme parameters, very many branches).
 */
export function planScan(model: BusModel, fromOrder: number, toOrder: number): ScanPlan | null {
  const lo = fromOrder;
  const hi = toOrder;
  const rs = model.source.resistanceOhm;
  const xs = model.source.reactanceOhm;
  const g0 = model.loadResistanceOhm === null ? 0 : 1 / model.loadResistanceOhm;
  if (!(lo > 0 && hi >= lo && Number.isFinite(hi) && rs > 0 && xs >= 0 && g0 >= 0 && Number.isFinite(g0))) return null;
  const [dsMin, dsMax] = sourceBounds(rs, xs, lo, hi);
  if (!usable(dsMin, dsMax)) return null;
  const cs = 1 / (Math.sqrt(dsMin) * Math.sqrt(dsMax));
  let spanLog2 = 0.5 * (Math.log2(dsMax) - Math.log2(dsMin));
  let gMax = rs / dsMin + g0;
  let bMax = (hi * xs) / dsMin;
  const gLo = rs / dsMax;
  const m = model.branches.length;
  const branches = new Float64Array(BRANCH_STRIDE * m);
  for (let k = 0; k < m; k++) {
    const br = model.branches[k]!;
    const r = br.reactorResistanceOhm;
    const xl = br.reactorReactanceOhm;
    const xc = br.capacitorReactanceOhm;
    if (!(r >= 0 && xl >= 0 && xc >= 0)) return null;
    const { dMin, dMax, uMax } = branchBounds(r, xl, xc, lo, hi);
    if (!usable(dMin, dMax)) return null;
    const c = 1 / (Math.sqrt(dMin) * Math.sqrt(dMax));
    spanLog2 += 0.5 * (Math.log2(dMax) - Math.log2(dMin));
    gMax += (r * hi * hi) / dMin;
    bMax += (hi * uMax) / dMin;
    branches.set([c * r * r, c * r, xl, xc, c], BRANCH_STRIDE * k);
  }
  const high = spanLog2 + Math.max(0, Math.log2(gMax), Math.log2(bMax));
  const low = spanLog2 + Math.max(0, -Math.log2(gLo));
  if (!(high <= RANGE_LOG2 && low <= RANGE_LOG2)) return null;
  return { sourceRSq: cs * rs * rs, sourceR: cs * rs, sourceXSq: cs * xs * xs, sourceX: cs * xs, loadG: g0, branches };
}

/**
 * out[i] = |Z(from + i·step)| and ordersH[i] = from + i·step (not accumulated, so no drift), for a plan made for a
 * range holding every one of these orders.
 */
export function fillPlannedImpedanceOhm(plan: ScanPlan, fromOrder: number, stepOrder: number, ordersH: Float64Array, out: Float64Array): void {
  if (plan.branches.length === 0) return fillSourceOnly(plan, fromOrder, stepOrder, ordersH, out);
  const { sourceRSq, sourceR, sourceXSq, sourceX, loadG, branches } = plan;
  const end = branches.length;
  const n = out.length;
  // The first branch is peeled into locals (the service scans one branch at a time); the rest go through the loop.
  const a0 = branches[0]!;
  const cr0 = branches[1]!;
  const xl0 = branches[2]!;
  const xc0 = branches[3]!;
  const c0 = branches[4]!;
  for (let i = 0; i < n; i++) {
    const h = fromOrder + i * stepOrder;
    ordersH[i] = h;
    const h2 = h * h;
    const ds = sourceRSq + h2 * sourceXSq;
    const u0 = h2 * xl0 - xc0;
    const cu0 = c0 * u0;
    const d0 = a0 * h2 + u0 * cu0;
    let ng = (sourceR + loadG * ds) * d0 + cr0 * h2 * ds;
    let nb = -h * sourceX * d0 - h * cu0 * ds;
    let den = ds * d0;
    for (let k = BRANCH_STRIDE; k < end; k += BRANCH_STRIDE) {
      const u = h2 * branches[k + 2]! - branches[k + 3]!;
      const cu = branches[k + 4]! * u;
      // the scaled D: c·r²·h² + u·(c·u)
      const d = branches[k]! * h2 + u * cu;
      ng = ng * d + branches[k + 1]! * h2 * den;
      nb = nb * d - h * cu * den;
      den *= d;
    }
    out[i] = den / Math.sqrt(ng * ng + nb * nb);
  }
}

/** The bus without capacitors: source ∥ load. */
function fillSourceOnly(plan: ScanPlan, fromOrder: number, stepOrder: number, ordersH: Float64Array, out: Float64Array): void {
  const { sourceRSq, sourceR, sourceXSq, sourceX, loadG } = plan;
  for (let i = 0; i < out.length; i++) {
    const h = fromOrder + i * stepOrder;
    ordersH[i] = h;
    const ds = sourceRSq + h * h * sourceXSq;
    const ng = sourceR + loadG * ds;
    const nb = -h * sourceX;
    out[i] = ds / Math.sqrt(ng * ng + nb * nb);
  }
}
