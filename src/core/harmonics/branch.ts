/** A capacitor stage as one series branch: reactor (optional) + capacitor, per phase of the wye equivalent. */
import { effectiveKvarWithReactor, kvarAtFrequency, kvarAtVoltage } from "../bank/capacitor.js";
import { complex, type Complex } from "./complex.js";

export interface CapacitorBranch {
  /** X_C at the system fundamental. */
  capacitorReactanceOhm: number;
  /** X_L = p·X_C at the fundamental; 0 for a plain bank. */
  reactorReactanceOhm: number;
  /** R of the reactor = X_L / quality factor, held constant with h (real AC resistance rises: conservative). */
  reactorResistanceOhm: number;
  reactorPct: number;
}

/** Typical X/R of an iron-core detuning reactor at the fundamental; from memory, no standard. */
export const DEFAULT_REACTOR_QUALITY_FACTOR = 50;

/** Q_c = Q_r·(V/V_r)²·(f/f_r): a capacitor's kvar scales with V² and with frequency (Q = V²·2πfC). */
export function capacitorKvarAtSystem(
  ratedKvar: number,
  ratedVoltageV: number,
  ratedFrequencyHz: number,
  voltageV: number,
  frequencyHz: number,
): number {
  return kvarAtFrequency(kvarAtVoltage(ratedKvar, voltageV, ratedVoltageV), frequencyHz, ratedFrequencyHz);
}

/** X_C = V_LL²/Q_c (3-phase kvar at system voltage), the per-phase wye reactance; single-phase, V²/Q of the one capacitor. */
export function capacitorBranch(
  voltageV: number,
  capacitorKvar: number,
  reactorPct: number,
  reactorQualityFactor = DEFAULT_REACTOR_QUALITY_FACTOR,
): CapacitorBranch {
  const capacitorReactanceOhm = (voltageV * voltageV) / (capacitorKvar * 1000);
  const reactorReactanceOhm = (reactorPct / 100) * capacitorReactanceOhm;
  return {
    capacitorReactanceOhm,
    reactorReactanceOhm,
    reactorResistanceOhm: reactorReactanceOhm / reactorQualityFactor,
    reactorPct,
  };
}

/** Z_cap(h) = R_r + j·(h·p·X_C − X_C/h). */
export function branchImpedance(branch: CapacitorBranch, h: number): Complex {
  return complex(branch.reactorResistanceOhm, h * branch.reactorReactanceOhm - branch.capacitorReactanceOhm / h);
}

/** Effective kvar of a detuned branch at system voltage: V²/(X_C − X_L) = Q_c/(1 − p). */
export function effectiveKvar(capacitorKvar: number, reactorPct: number): number {
  return effectiveKvarWithReactor(capacitorKvar, reactorPct / 100);
}
