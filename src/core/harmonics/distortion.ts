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

/**
 * The orders a bus is worked at (an injected current or a background voltage there), ascending, with their current
 * and background: the same for every stage of a study, so worked out once per injection and background.
 */
interface PresentLines {
  background: readonly SpectrumLine[];
  orders: number[];
  currentA: number[];
  backgroundPct: number[];
}

const presentByInjection = new WeakMap<InjectedCurrents, PresentLines>();

function presentLines(currents: InjectedCurrents, background: readonly SpectrumLine[]): PresentLines {
  const cached = presentByInjection.get(currents);
  if (cached && cached.background === background) return cached;
  // background percent per order, summed when an order repeats (plain arrays: typed ones are slow to allocate)
  const bg: number[] = [];
  for (let h = 0; h <= MAX_HARMONIC_ORDER; h++) bg.push(0);
  for (const line of background) bg[line.order] = bg[line.order]! + line.pct;
  const lines: PresentLines = { background, orders: [], currentA: [], backgroundPct: [] };
  for (let h = 2; h <= MAX_HARMONIC_ORDER; h++) {
    const currentA = currents.byOrderA[h] ?? 0;
    const backgroundPct = bg[h]!;
    if (currentA === 0 && backgroundPct === 0) continue;
    lines.orders.push(h);
    lines.currentA.push(currentA);
    lines.backgroundPct.push(backgroundPct);
  }
  presentByInjection.set(currents, lines);
  return lines;
}

/**
 * V_h = I_h·|Z(h)| at each integer order; site background voltage is added arithmetically per order
 * (in phase with the injection: worst case), and is not itself amplified by the bank. THD as thdPct, summed in the
 * same loop.
 */
export function busDistortion(model: BusModel, currents: InjectedCurrents, background: readonly SpectrumLine[] = []): BusDistortion {
  const phaseV = branchVoltageV(model.voltageV, model.phases);
  const present = presentLines(currents, background);
  const lines: BusHarmonicLine[] = [];
  let sumSq = 0;
  let worstOrder = 0;
  let worstPct = 0;
  for (let i = 0; i < present.orders.length; i++) {
    const h = present.orders[i]!;
    const currentA = present.currentA[i]!;
    const backgroundPct = present.backgroundPct[i]!;
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
    sumSq += voltagePct * voltagePct;
    if (i === 0 || voltagePct > worstPct) {
      worstOrder = h;
      worstPct = voltagePct;
    }
  }
  return { lines, thdVPct: Math.sqrt(sumSq), worstIndividual: present.orders.length > 0 ? { order: worstOrder, pct: worstPct } : null };
}
