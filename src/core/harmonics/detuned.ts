import { nearestStandardKvar, standardCapacitorVoltageV } from "../bank/standard-sizes.js";

/** Detuned (reactor-protected) bank proposal: reactor %, capacitor voltage rating and nameplate kvar per step. */

export interface DetuningChoice {
  reactorPct: number;
  /** 1/√p, rounded as the trade quotes it. */
  tuningOrder: number;
}

/** The three detuning ratios in common use and their tuning orders (industry practice). */
export const DETUNING_CHOICES: readonly DetuningChoice[] = [
  { reactorPct: 5.67, tuningOrder: 4.2 },
  { reactorPct: 7, tuningOrder: 3.78 },
  { reactorPct: 14, tuningOrder: 2.67 },
];

/** Allowance over U/(1 − p) for the harmonic voltage on the capacitor; own choice within the usual 1.05–1.10. */
export const DEFAULT_VOLTAGE_MARGIN_FACTOR = 1.05;

export type KvarRounding = "nearest_standard" | "none";

export interface DetunedDesignInput {
  voltageV: number;
  frequencyHz: number;
  /** Effective kvar each step must deliver at system voltage. */
  requiredEffectiveKvarPerStep: readonly number[];
  presentOrders: readonly number[];
  thirdHarmonicSignificant: boolean;
  voltageMarginFactor?: number;
  kvarRounding?: KvarRounding;
  /** Force a detuning ratio (e.g. a retry one step lower); otherwise the rule below chooses. */
  reactorPct?: number;
}

export interface DetunedStep {
  nameplateKvar: number;
  effectiveKvar: number;
  requiredEffectiveKvar: number;
}

export interface DetunedDesign {
  reactorPct: number;
  tuningOrder: number;
  ratedVoltageV: number;
  ratedFrequencyHz: number;
  /** Fundamental voltage on the capacitor, V/(1 − p), line-to-line. */
  capacitorFundamentalVoltageV: number;
  steps: DetunedStep[];
  rationale: string[];
}

/**
 * Own rule: 14 % when the 3rd is significant; 5.67 % only when nothing below the 7th is present
 * (e.g. twelve-pulse sources) — its 4.2 tuning sits too close to a 5th that capacitor ageing
 * (C falls, tuning rises) would drift towards; 7 % otherwise (the default).
 */
export function chooseDetuning(presentOrders: readonly number[], thirdHarmonicSignificant: boolean): { choice: DetuningChoice; reason: string } {
  const [p567, p7, p14] = DETUNING_CHOICES as [DetuningChoice, DetuningChoice, DetuningChoice];
  const lowest = presentOrders.length > 0 ? Math.min(...presentOrders) : Infinity;
  if (thirdHarmonicSignificant) return { choice: p14, reason: "3rd harmonic significant: 14 % (tuned to 2.67) keeps the resonance below the 3rd" };
  if (lowest >= 7)
    return { choice: p567, reason: `lowest present order is ${lowest}: 5.67 % (tuned to 4.2) is enough and raises the capacitor voltage least` };
  return { choice: p7, reason: "7 % (tuned to 3.78), the default for 5th-and-above spectra" };
}

/** 3rd significant: injected I_3 ≥ 5 % of the sources' fundamental, or background V_3 ≥ 0.5 % (own rule, no standard). */
export function isThirdHarmonicSignificant(thirdCurrentA: number, fundamentalA: number, backgroundThirdPct: number): boolean {
  return (fundamentalA > 0 && thirdCurrentA >= 0.05 * fundamentalA) || backgroundThirdPct >= 0.5;
}

/** Next lower tuning (larger reactor %) after the given one, or null when none is left. */
export function nextLowerDetuning(reactorPct: number): DetuningChoice | null {
  return DETUNING_CHOICES.find((c) => c.reactorPct > reactorPct) ?? null;
}

/** Q_nameplate = Q_eff·(1 − p)·(V_r/V)²: the capacitor delivers Q_r(V/V_r)², the reactor lifts it by 1/(1 − p). */
export function proposeDetunedDesign(input: DetunedDesignInput): DetunedDesign {
  const rationale: string[] = [];
  let choice: DetuningChoice;
  if (input.reactorPct !== undefined) {
    const forced = input.reactorPct;
    choice = DETUNING_CHOICES.find((c) => c.reactorPct === forced) ?? { reactorPct: forced, tuningOrder: 1 / Math.sqrt(forced / 100) };
    rationale.push(`reactor ${forced} % (tuned to ${choice.tuningOrder}) chosen by the caller`);
  } else {
    const chosen = chooseDetuning(input.presentOrders, input.thirdHarmonicSignificant);
    choice = chosen.choice;
    rationale.push(chosen.reason);
  }
  const p = choice.reactorPct / 100;
  const below = input.presentOrders.filter((n) => n <= choice.tuningOrder * 1.1);
  if (below.length > 0)
    rationale.push(`orders ${below.join(", ")} lie below or near the tuning order, where the stage can still amplify them: check the rerun`);

  const margin = input.voltageMarginFactor ?? DEFAULT_VOLTAGE_MARGIN_FACTOR;
  const capacitorFundamentalVoltageV = input.voltageV / (1 - p);
  const ratedVoltageV = standardCapacitorVoltageV(capacitorFundamentalVoltageV * margin);
  rationale.push(
    `capacitor voltage ${ratedVoltageV} V >= ${input.voltageV} V/(1 - ${p.toFixed(4)})·${margin} = ${(capacitorFundamentalVoltageV * margin).toFixed(1)} V`,
  );

  const rounding = input.kvarRounding ?? "nearest_standard";
  const scale = (1 - p) * (ratedVoltageV / input.voltageV) ** 2;
  const steps = input.requiredEffectiveKvarPerStep.map((required) => {
    const exact = required * scale;
    const nameplateKvar = rounding === "none" ? exact : nearestStandardKvar(exact);
    return { nameplateKvar, effectiveKvar: nameplateKvar / scale, requiredEffectiveKvar: required };
  });
  return {
    reactorPct: choice.reactorPct,
    tuningOrder: choice.tuningOrder,
    ratedVoltageV,
    ratedFrequencyHz: input.frequencyHz,
    capacitorFundamentalVoltageV,
    steps,
    rationale,
  };
}
