import { SQRT3, type Phases } from "../conventions.js";

/** Capacitor output scales with the square of applied voltage: Q = Q_r·(V/V_r)² (IEEE Std 18 rating basis). */
export function kvarAtVoltage(ratedKvar: number, voltageV: number, ratedVoltageV: number): number {
  return ratedKvar * (voltageV / ratedVoltageV) ** 2;
}

/** Capacitor output scales with frequency: Q = Q_r·f/f_r (X_C = 1/(2πfC)). */
export function kvarAtFrequency(ratedKvar: number, frequencyHz: number, ratedFrequencyHz: number): number {
  return (ratedKvar * frequencyHz) / ratedFrequencyHz;
}

/** Line current of a capacitor bank: I = Q/(√3·V_LL) three-phase, Q/V single-phase. */
export function capacitorCurrentA(kvar: number, voltageV: number, phases: Phases = 3): number {
  return (kvar * 1000) / (phases === 3 ? SQRT3 * voltageV : voltageV);
}

/** Capacitive reactance X_C = 1/(2πfC), ohm. */
export function capacitiveReactanceOhm(capacitanceF: number, frequencyHz: number): number {
  return 1 / (2 * Math.PI * frequencyHz * capacitanceF);
}

/** Inductive reactance X_L = 2πfL, ohm. */
export function inductiveReactanceOhm(inductanceH: number, frequencyHz: number): number {
  return 2 * Math.PI * frequencyHz * inductanceH;
}

/** Series RLC impedance magnitude |Z| = √(R² + (X_L − X_C)²). */
export function seriesRlcImpedanceOhm(rOhm: number, xLOhm: number, xCOhm: number): number {
  return Math.hypot(rOhm, xLOhm - xCOhm);
}

export interface CapacitancePerPhase {
  /** µF of each of the three capacitors when connected in delta (each sees V_LL). */
  deltaUF: number;
  /** µF of each of the three capacitors when connected in wye (each sees V_LL/√3). */
  wyeUF: number;
}

/** Capacitance per phase for a three-phase bank of Q kvar at V_LL: C = Q/(3·2πf·V²) from Q = V²·2πfC per unit. */
export function capacitancePerPhase(kvar: number, voltageV: number, frequencyHz: number): CapacitancePerPhase {
  const w = 2 * Math.PI * frequencyHz;
  const perUnitVar = (kvar * 1000) / 3;
  return {
    deltaUF: (perUnitVar / (w * voltageV * voltageV)) * 1e6,
    wyeUF: (perUnitVar / (w * (voltageV / SQRT3) ** 2)) * 1e6,
  };
}

/** Single-phase capacitance for Q kvar at V: C = Q/(2πf·V²). */
export function capacitanceSinglePhaseUF(kvar: number, voltageV: number, frequencyHz: number): number {
  return ((kvar * 1000) / (2 * Math.PI * frequencyHz * voltageV * voltageV)) * 1e6;
}

/** Wye-equivalent reactance per phase of a three-phase bank: X_C = V_LL²/Q. */
export function bankReactanceOhm(kvar: number, voltageV: number): number {
  return (voltageV * voltageV) / (kvar * 1000);
}

/** Fundamental voltage across the capacitor with a series reactor of p = X_L/X_C: U_C = U/(1 − p). */
export function capacitorVoltageWithReactorV(busVoltageV: number, reactorFraction: number): number {
  return busVoltageV / (1 - reactorFraction);
}

/** Effective kvar delivered by a detuned branch: Q_eff = Q_C/(1 − p), Q_C at bus voltage. */
export function effectiveKvarWithReactor(capacitorKvarAtBus: number, reactorFraction: number): number {
  return capacitorKvarAtBus / (1 - reactorFraction);
}

/** Series tuning order of a detuned branch: h_t = 1/√p. */
export function tuningOrder(reactorFraction: number): number {
  return 1 / Math.sqrt(reactorFraction);
}

/** Controller response threshold C/k = Q_step·1000/(√3·V·CT ratio): the smallest step's current at the CT secondary (trade formula). */
export function controllerResponseA(stepKvar: number, voltageV: number, ctRatio: number, phases: Phases = 3): number {
  return (stepKvar * 1000) / ((phases === 3 ? SQRT3 : 1) * voltageV * ctRatio);
}

/** IEEE Std 18 continuous rms voltage limit: 110 % of rated. */
export const IEEE18_MAX_VOLTAGE_RATIO = 1.1;
