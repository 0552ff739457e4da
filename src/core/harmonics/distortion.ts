/** Bus harmonic voltages and THD_v from injected currents and the driving-point impedance. */
import type { InjectedCurrents } from "./injection.js";
import { branchVoltageV, drivingPointImpedanceOhm, type BusModel } from "./network.js";
import { MAX_HARMONIC_ORDER, type SpectrumLine } from "./study-types.js";

export interface BusHarmonicLine {
  order: number;
  currentA: number;
  impedanceOhm: number;
  /** I_h·|Z(h)|, volts across a branch of the model (phase volts; on single-phase, line volts), from this bus's own injection. */
  injectedPhaseV: number;
  injectedPct: number;
  backgroundPct: number;
  /** Injected + background, percent of the fundamental phase voltage. */
  voltagePct: number;
  voltagePhaseV: number;
}

export interface BusDistortion {
  lines: BusHarmonicLine[];
  thdVPct: number;
  worstIndividual: { order: number; pct: number } | null;
}

/** THD = √(Σ V_h²)/V_1·100, over the orders given (IEEE Std 519 definition). */
export function thdPct(pcts: readonly number[]): number {
  let sum = 0;
  for (const p of pcts) sum += p * p;
  return Math.sqrt(sum);
}

/** Background percent per order (summed when an order repeats), per background list: every stage of a study shares it. */
const backgroundArrays = new WeakMap<readonly SpectrumLine[], Float64Array>();

function backgroundByOrder(background: readonly SpectrumLine[]): Float64Array {
  let bg = backgroundArrays.get(background);
  if (!bg) {
    bg = new Float64Array(MAX_HARMONIC_ORDER + 1);
    for (const line of background) bg[line.order] = bg[line.order]! + line.pct;
    backgroundArrays.set(background, bg);
  }
  return bg;
}

/**
 * V_h = I_h·|Z(h)| at each integer order; site background voltage is added arithmetically per order
 * (in phase with the injection: worst case), and is not itself amplified by the bank.
 */
export function busDistortion(model: BusModel, currents: InjectedCurrents, background: readonly SpectrumLine[] = []): BusDistortion {
  const phaseV = branchVoltageV(model.voltageV, model.phases);
  const bg = backgroundByOrder(background);
  const lines: BusHarmonicLine[] = [];
  for (let h = 2; h <= MAX_HARMONIC_ORDER; h++) {
    const currentA = currents.byOrderA[h] ?? 0;
    const backgroundPct = bg[h]!;
    if (currentA === 0 && backgroundPct === 0) continue;
    const impedanceOhm = drivingPointImpedanceOhm(model, h);
    const injectedPhaseV = currentA * impedanceOhm;
    const injectedPct = (injectedPhaseV / phaseV) * 100;
    const voltagePct = injectedPct + backgroundPct;
    lines.push({
      order: h,
      currentA,
      impedanceOhm,
      injectedPhaseV,
      injectedPct,
      backgroundPct,
      voltagePct,
      voltagePhaseV: (voltagePct / 100) * phaseV,
    });
  }
  let worstIndividual: BusDistortion["worstIndividual"] = null;
  for (const l of lines) if (!worstIndividual || l.voltagePct > worstIndividual.pct) worstIndividual = { order: l.order, pct: l.voltagePct };
  return { lines, thdVPct: thdPct(lines.map((l) => l.voltagePct)), worstIndividual };
}
