/** Harmonic current injected into the bus by the nonlinear loads, per branch of the network model. */
import type { Phases } from "../conventions.js";
import { thdPct } from "./distortion.js";
import { sixPulseSpectrum } from "./spectrum.js";
import { MAX_HARMONIC_ORDER, SQRT3, type SpectrumLine } from "./study-types.js";

/** What a source's kVA stands for: the meter's V·I (fundamental and harmonics together) or the fundamental alone. */
export type KVABasis = "rms" | "fundamental";

export interface HarmonicSourceInput {
  label: string;
  kVA: number;
  phases: Phases;
  /** Measured spectrum in percent of this load's fundamental current. */
  spectrum?: SpectrumLine[];
  /** A drive with no spectrum is given the typical six-pulse spectrum. */
  isDrive: boolean;
  /** Measured current THD, percent of the fundamental: a drive without a spectrum gets the typical one scaled to it. */
  currentTHDPct?: number;
  /** Default "fundamental"; "rms" when kVA is a true-rms reading, whose fundamental is then I_rms/√(1 + THD_i²). */
  kVABasis?: KVABasis;
}

/** Which spectrum a source was given. */
export type SpectrumBasis = "measured_spectrum" | "typical_six_pulse_scaled_to_measured_thd" | "typical_six_pulse";

export interface SourceSpectrumUse {
  label: string;
  spectrumBasis: SpectrumBasis;
  /** THD of the spectrum used, percent of the fundamental. */
  currentTHDPct: number;
  kVABasis: KVABasis;
  /** Fundamental current of the source in the network model, A. */
  fundamentalA: number;
  /** The same in plain words, for the result. */
  note: string;
}

/** "arithmetic": all sources in phase, the worst case; "rss": random phase angles, √Σ I². */
export type CombinationMethod = "arithmetic" | "rss";

export interface InjectedCurrents {
  /** Index = harmonic order (0 and 1 unused), value = current in A. */
  byOrderA: ArrayLike<number>;
  /** Σ of the sources' fundamental currents, A. */
  fundamentalA: number;
  /** Orders with a non-zero current, ascending. */
  orders: number[];
  /** Per source, in input order: the spectrum and fundamental it was given. */
  sources: SourceSpectrumUse[];
}

/**
 * Current per kVA in the network model. Three-phase system: I = S/(√3·V_LL) for a 3-phase load; a 1-phase load is
 * taken as line-to-neutral, I = S/(V_LL/√3), placed whole on one phase (the loaded phase: an upper bound).
 * Single-phase system: every load is across the two conductors, I = S/V (a load's own `phases` cannot differ there;
 * flagging a load that claims three phases is the readings' job, not the study's).
 */
export function fundamentalCurrentA(kVA: number, phases: Phases, voltageV: number, systemPhases: Phases = 3): number {
  if (systemPhases === 1) return (kVA * 1000) / voltageV;
  return phases === 3 ? (kVA * 1000) / (SQRT3 * voltageV) : (kVA * 1000 * SQRT3) / voltageV;
}

const TYPICAL = sixPulseSpectrum();
/** THD of the typical (ideal 1/h) six-pulse spectrum to the 49th: √(Σ (100/h)²) = 30.015 %. */
export const TYPICAL_SIX_PULSE_THD_PCT = thdPct(TYPICAL.map((l) => l.pct));

/**
 * A measured spectrum as given; else, for a drive, the typical six-pulse shape, scaled so its THD equals the
 * measured THD_i when there is one (the shape is assumed, the total is measured).
 */
export function sourceSpectrum(source: HarmonicSourceInput): { lines: SpectrumLine[]; basis: SpectrumBasis | null } {
  if (source.spectrum) return { lines: source.spectrum, basis: "measured_spectrum" };
  if (!source.isDrive) return { lines: [], basis: null };
  if (source.currentTHDPct === undefined) return { lines: TYPICAL, basis: "typical_six_pulse" };
  const k = source.currentTHDPct / TYPICAL_SIX_PULSE_THD_PCT;
  return { lines: TYPICAL.map((l) => ({ order: l.order, pct: l.pct * k })), basis: "typical_six_pulse_scaled_to_measured_thd" };
}

const BASIS_WORDS: Record<SpectrumBasis, string> = {
  measured_spectrum: "measured spectrum",
  typical_six_pulse: "typical six-pulse spectrum (I_h = I_1/h), no THD measured",
  typical_six_pulse_scaled_to_measured_thd: "typical six-pulse shape scaled to the measured THD_i",
};

export function injectedCurrents(
  sources: readonly HarmonicSourceInput[],
  voltageV: number,
  method: CombinationMethod = "arithmetic",
  systemPhases: Phases = 3,
): InjectedCurrents {
  // a plain array: a typed one this size lives outside the heap and is slow to make
  const acc: number[] = [];
  for (let h = 0; h <= MAX_HARMONIC_ORDER; h++) acc.push(0);
  let fundamentalA = 0;
  const uses: SourceSpectrumUse[] = [];
  for (const s of sources) {
    const { lines, basis } = sourceSpectrum(s);
    const thd = lines === TYPICAL ? TYPICAL_SIX_PULSE_THD_PCT : thdPct(lines.map((l) => l.pct));
    const kVABasis = s.kVABasis ?? "fundamental";
    const totalA = fundamentalCurrentA(s.kVA, s.phases, voltageV, systemPhases);
    // I_rms² = I_1²·(1 + THD²) (the rms of a sum of orthogonal sinusoids): the fundamental of an rms reading.
    const i1 = kVABasis === "rms" ? totalA / Math.sqrt(1 + (thd / 100) ** 2) : totalA;
    fundamentalA += i1;
    for (const line of lines) {
      const ih = (line.pct / 100) * i1;
      // orders are validated to 2…50; any other is dropped, as a typed array would drop it
      if (Number.isInteger(line.order) && line.order >= 0 && line.order <= MAX_HARMONIC_ORDER)
        acc[line.order] = acc[line.order]! + (method === "rss" ? ih * ih : ih);
    }
    if (basis !== null) {
      const current =
        kVABasis === "rms"
          ? `I_1 = I_rms/sqrt(1 + THD²) = ${totalA.toFixed(1)}/sqrt(1 + ${(thd / 100).toFixed(3)}²)`
          : "I_1 from its fundamental kVA";
      uses.push({
        label: s.label,
        spectrumBasis: basis,
        currentTHDPct: thd,
        kVABasis,
        fundamentalA: i1,
        note: `${s.label}: ${BASIS_WORDS[basis]}, THD_i ${thd.toFixed(1)} %; ${current} = ${i1.toFixed(1)} A`,
      });
    }
  }
  const byOrderA = method === "rss" ? acc.map(Math.sqrt) : acc;
  const orders: number[] = [];
  for (let h = 2; h <= MAX_HARMONIC_ORDER; h++) if (byOrderA[h]! > 0) orders.push(h);
  return { byOrderA, fundamentalA, orders, sources: uses };
}
