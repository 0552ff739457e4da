/** Closed-form resonance estimates and the "near a harmonic" test, in the study's units (percent reactor). */
import { tuningOrder as tuningOrderOfFraction } from "../capacitor.js";
import { parallelResonanceOrder } from "../resonance.js";

/**
 * Parallel resonance order of a stage with the source, h = √(1/(Q_c/S_sc + p)), IEEE 519 practice;
 * with p = 0 it is the familiar √(S_sc/Q_c). From X_s·h + p·X_C·h = X_C/h with X_s ≈ Z_base (high X/R).
 */
export function estimatedParallelResonanceOrder(shortCircuitKVA: number, capacitorKvar: number, reactorPct = 0): number {
  return parallelResonanceOrder(capacitorKvar, shortCircuitKVA, reactorPct / 100);
}

/** Series tuning order of a detuned stage, h_t = 1/√p (where h·p·X_C = X_C/h); null for a plain bank. */
export function tuningOrder(reactorPct: number): number | null {
  return reactorPct > 0 ? tuningOrderOfFraction(reactorPct / 100) : null;
}

/** A resonance within ±10 % of a present harmonic is a hazard (common practice, no source). */
export const RESONANCE_BAND_PCT = 10;

/** Present orders n whose band n·(1 ± band) holds at least one of the resonance orders. */
export function ordersNearResonance(
  resonanceOrders: readonly number[],
  presentOrders: readonly number[],
  bandPct = RESONANCE_BAND_PCT,
): number[] {
  const f = bandPct / 100;
  return presentOrders.filter((n) => resonanceOrders.some((h) => Math.abs(h - n) <= f * n));
}
