import type { TransformerInput, UtilityInput } from "../inputs.js";

/** S_sc = S_T / Z_T (per unit): transformer on an infinite upstream bus, the usual worst case. */
export function transformerShortCircuitKVA(transformerKVA: number, impedancePct: number): number {
  return (transformerKVA * 100) / impedancePct;
}

export interface ShortCircuitResult {
  /** Three-phase short-circuit strength at the capacitor bus, kVA. */
  shortCircuitKVA: number;
  /** Transformer alone on an infinite source: S_tx/(Z%/100). */
  transformerShortCircuitKVA: number | null;
  /** Utility fault level at the transformer primary, kVA, or null for an infinite source. */
  utilityShortCircuitKVA: number | null;
}

/**
 * Series source impedances add in per unit: S_sc = 1 / (1/S_utility + (Z%/100)/S_tx)
 * (the MVA method of short-circuit calculation). An absent utility is an infinite source.
 */
export function shortCircuitAtBus(transformer: TransformerInput | undefined, utility: UtilityInput | undefined): ShortCircuitResult | null {
  const utilityKVA = utility ? utility.faultMVA * 1000 : null;
  const txKVA = transformer ? transformerShortCircuitKVA(transformer.kVA, transformer.impedancePct) : null;
  if (utilityKVA === null && txKVA === null) return null;
  const inverse = (utilityKVA ? 1 / utilityKVA : 0) + (txKVA ? 1 / txKVA : 0);
  return {
    shortCircuitKVA: 1 / inverse,
    transformerShortCircuitKVA: txKVA,
    utilityShortCircuitKVA: utilityKVA,
  };
}
