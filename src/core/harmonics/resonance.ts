/**
 * Resonance of capacitor stages with the supply: the closed-form parallel-resonance order, the ±10 % "near a
 * harmonic" band, the orders a site's sources make, and the switching voltage rise. One home for each; the bank
 * screen and the harmonic study both call these.
 */
import type { HarmonicSourceKind, LoadInput } from "../inputs.js";

/**
 * Parallel resonance order of a capacitor stage with the source:
 * h = √(1 / (Q_C/S_sc + p)); without a reactor (p = 0) this is √(S_sc/Q_C) (IEEE Std 519 / 1036 practice).
 * Derivation: the source reactance X_s·h plus the reactor p·X_C·h cancels the capacitor X_C/h (X_s ≈ Z_base, high X/R).
 */
export function parallelResonanceOrder(capacitorKvar: number, shortCircuitKVA: number, reactorFraction = 0): number {
  return Math.sqrt(1 / (capacitorKvar / shortCircuitKVA + reactorFraction));
}

/** Bus voltage rise when a bank switches in: ΔV % ≈ Q/S_sc·100 (common practice). */
export function voltageRisePct(kvar: number, shortCircuitKVA: number): number {
  return (kvar / shortCircuitKVA) * 100;
}

/** A resonance within ±10 % of a present harmonic is a hazard (common practice, no source). */
export const RESONANCE_BAND_PCT = 10;

/** True when the resonance order h lies within ±bandPct % of the harmonic order n. */
export function withinResonanceBand(h: number, n: number, bandPct = RESONANCE_BAND_PCT): boolean {
  return Math.abs(h - n) <= (bandPct / 100) * n;
}

/** The present harmonic order whose band holds h (the closest when two do), or null. */
export function nearHarmonic(h: number, orders: readonly number[], bandPct = RESONANCE_BAND_PCT): number | null {
  let best: number | null = null;
  for (const n of orders) {
    if (withinResonanceBand(h, n, bandPct) && (best === null || Math.abs(h - n) < Math.abs(h - best))) best = n;
  }
  return best;
}

/** Present orders n whose band holds at least one of the resonance orders. */
export function ordersNearResonance(resonanceOrders: readonly number[], presentOrders: readonly number[], bandPct = RESONANCE_BAND_PCT): number[] {
  const out: number[] = [];
  // indexed loops: every stage of a study calls this, and for-of with a break allocated its iterator's results
  for (let i = 0; i < presentOrders.length; i++) {
    const n = presentOrders[i]!;
    for (let j = 0; j < resonanceOrders.length; j++) {
      if (withinResonanceBand(resonanceOrders[j]!, n, bandPct)) {
        out.push(n);
        break;
      }
    }
  }
  return out;
}

/** Nonlinear load above 15 % of the transformer calls for a harmonic study (rule of thumb from makers' guides, not a standard). */
export const NONLINEAR_STUDY_SHARE = 0.15;

/** Characteristic orders of each source family: six-pulse 6k ± 1, twelve-pulse 12k ± 1, single-phase electronics triplens. */
const ORDERS_BY_SOURCE: Record<HarmonicSourceKind, number[]> = {
  six_pulse: [5, 7, 11, 13],
  twelve_pulse: [11, 13],
  single_phase_electronic: [3],
};

/** The harmonic orders the site produces, from its drives, its declared sources and any measured spectra. */
export function harmonicOrdersPresent(loads: LoadInput[], sources: HarmonicSourceKind[] = []): number[] {
  const set = new Set<number>();
  if (loads.some((l) => l.kind === "drive" && !l.harmonics)) ORDERS_BY_SOURCE.six_pulse.forEach((h) => set.add(h));
  for (const s of sources) ORDERS_BY_SOURCE[s].forEach((h) => set.add(h));
  for (const l of loads) for (const c of l.harmonics ?? []) if (c.pct >= 1) set.add(c.order);
  return [...set].sort((a, b) => a - b);
}
