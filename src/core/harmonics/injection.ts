/** Harmonic current injected into the bus by the nonlinear loads, per phase of the wye equivalent. */
import type { Phases } from "../conventions.js";
import { sixPulseSpectrum } from "./spectrum.js";
import { MAX_HARMONIC_ORDER, SQRT3, type SpectrumLine } from "./study-types.js";

export interface HarmonicSourceInput {
  label: string;
  kVA: number;
  phases: Phases;
  /** Measured spectrum in percent of this load's fundamental current. */
  spectrum?: SpectrumLine[];
  /** A drive with no spectrum is given the ideal six-pulse spectrum. */
  isDrive: boolean;
}

/** "arithmetic": all sources in phase, the worst case; "rss": random phase angles, √Σ I². */
export type CombinationMethod = "arithmetic" | "rss";

export interface InjectedCurrents {
  /** Index = harmonic order (0 and 1 unused), value = phase current in A. */
  byOrderA: Float64Array;
  /** Σ of the sources' fundamental currents, A. */
  fundamentalA: number;
  /** Orders with a non-zero current, ascending. */
  orders: number[];
}

/**
 * I_1 = S/(√3·V_LL) for a 3-phase load; a 1-phase load is taken as line-to-neutral, I_1 = S/(V_LL/√3),
 * placed whole on one phase of the per-phase model (the loaded phase: an upper bound).
 */
export function fundamentalCurrentA(kVA: number, phases: Phases, voltageV: number): number {
  return phases === 3 ? (kVA * 1000) / (SQRT3 * voltageV) : (kVA * 1000 * SQRT3) / voltageV;
}

export function sourceSpectrum(source: HarmonicSourceInput): SpectrumLine[] {
  if (source.spectrum) return source.spectrum;
  return source.isDrive ? sixPulseSpectrum() : [];
}

export function injectedCurrents(
  sources: readonly HarmonicSourceInput[],
  voltageV: number,
  method: CombinationMethod = "arithmetic",
): InjectedCurrents {
  const acc = new Float64Array(MAX_HARMONIC_ORDER + 1);
  let fundamentalA = 0;
  for (const s of sources) {
    const i1 = fundamentalCurrentA(s.kVA, s.phases, voltageV);
    fundamentalA += i1;
    for (const line of sourceSpectrum(s)) {
      const ih = (line.pct / 100) * i1;
      acc[line.order] = acc[line.order]! + (method === "rss" ? ih * ih : ih);
    }
  }
  const byOrderA = method === "rss" ? acc.map(Math.sqrt) : acc;
  const orders: number[] = [];
  for (let h = 2; h <= MAX_HARMONIC_ORDER; h++) if (byOrderA[h]! > 0) orders.push(h);
  return { byOrderA, fundamentalA, orders };
}
