/**
 * The project's one statement of units and sign convention.
 *
 * - Real power in kW, reactive power in kvar, apparent power in kVA.
 * - kvar > 0 is lagging (inductive: the load consumes reactive power);
 *   kvar < 0 is leading (capacitive: the load supplies reactive power).
 * - A capacitor bank *supplies* reactive power: correcting a site by Q kvar
 *   moves the site's kvar from Q_site to Q_site − Q.
 * - Voltages named `voltageV` / `volts` are line-to-line on three-phase systems
 *   and line-to-neutral (the only one there is) on single-phase; names ending in
 *   `PhaseV` are per-phase (line-to-neutral) values of the wye equivalent.
 * - Impedances in ohms are per phase of the wye equivalent.
 */
export type Sense = "lagging" | "leading" | "unity";
export type Phases = 1 | 3;

export const SQRT3 = Math.sqrt(3);

/** Tolerance below which a reactive power is treated as zero (unity PF). */
export const UNITY_KVAR_EPS = 1e-9;

export function senseOfKvar(kvar: number, kVA: number): Sense {
  if (Math.abs(kvar) <= Math.max(UNITY_KVAR_EPS, kVA * 1e-9)) return "unity";
  return kvar > 0 ? "lagging" : "leading";
}

/** Apparent power of a phasor sum: S = √(P² + Q²). */
export function apparentKVA(kW: number, kvar: number): number {
  return Math.hypot(kW, kvar);
}

/** Line current from apparent power: I = S/(√3·V_LL) three-phase, S/V single-phase. */
export function lineCurrentA(kVA: number, voltageV: number, phases: Phases): number {
  return (kVA * 1000) / (phases === 3 ? SQRT3 * voltageV : voltageV);
}

/** Apparent power from volts and amps: √3·V_LL·I three-phase, V·I single-phase. */
export function kVAFromVoltsAmps(voltageV: number, currentA: number, phases: Phases): number {
  return ((phases === 3 ? SQRT3 : 1) * voltageV * currentA) / 1000;
}

/** tan φ from a power factor: the kvar per kW of a load at that PF. */
export function tanPhi(pf: number): number {
  return Math.tan(Math.acos(Math.min(1, Math.max(0, pf))));
}

export function round(value: number, digits: number): number {
  const f = 10 ** digits;
  return Math.round(value * f) / f;
}
