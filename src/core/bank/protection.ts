/** Conductors, disconnecting means and overcurrent device of a capacitor circuit (one step or the whole bank). */
import { capacitorCurrentA } from "./capacitor.js";
import type { Phases } from "../conventions.js";
import { warning, type Warning } from "../warnings.js";

export { dischargeDesign, DISCHARGE_K, type DischargeConnection, type DischargeDesign, type DischargeOptions } from "./discharge.js";

/** Standard ampere ratings of fuses and inverse-time circuit breakers (NFPA 70 240.6(A)). */
export const STANDARD_AMPERE_RATINGS_A = [
  15, 20, 25, 30, 35, 40, 45, 50, 60, 70, 80, 90, 100, 110, 125, 150, 175, 200, 225, 250, 300, 350, 400, 450, 500, 600, 700, 800, 1000, 1200, 1600,
  2000, 2500, 3000, 4000, 5000, 6000,
] as const;

/** Additional standard ratings for fuses only (NFPA 70 240.6(A)). */
export const FUSE_ONLY_RATINGS_A = [1, 3, 6, 10, 601] as const;

/** Conductor ampacity ≥ 135 % of the capacitor's rated current (NFPA 70 460.8(A)). */
export const CONDUCTOR_AMPACITY_FACTOR = 1.35;
/** Conductors from a motor's terminals (or motor-circuit conductors) to its capacitor: ≥ ⅓ of the motor-circuit conductors' ampacity (NFPA 70 460.8(A)). */
export const MOTOR_CONDUCTOR_SHARE = 1 / 3;
/** Disconnecting means rated ≥ 135 % of the capacitor's rated current (NFPA 70 460.8(C)). */
export const DISCONNECT_FACTOR = 1.35;
/** Least multiple for the overcurrent device, matching the conductor rule (common practice). */
export const OCPD_FACTOR_MIN = 1.35;
/** Default multiples: 165 % for fuses, 150 % for breakers (common practice, makers' guidance, no single source). */
export const DEFAULT_OCPD_FACTOR = { fuse: 1.65, breaker: 1.5 } as const;

export type OvercurrentDevice = "fuse" | "breaker";

export interface ProtectionOptions {
  device?: OvercurrentDevice;
  /** Device rating as a multiple of the rated current, at least 1.35. */
  ocpdFactor?: number;
}

export interface CircuitProtection {
  label: string;
  kvar: number;
  ratedCurrentA: number;
  conductorMinAmpacityA: number;
  disconnectMinA: number;
  device: OvercurrentDevice;
  ocpdFactor: number;
  ocpdMinA: number;
  /** Next standard rating at or above ocpdMinA (NFPA 70 240.6(A)); null above 6000 A. */
  ocpdRatingA: number | null;
}

/** The next standard rating at or above a current, or null when above the table. */
export function nextStandardRatingA(minA: number, device: OvercurrentDevice): number | null {
  const list = device === "fuse" ? FUSE_RATINGS_ASCENDING : STANDARD_AMPERE_RATINGS_A;
  for (const r of list) if (r >= minA - 1e-9) return r;
  return null;
}

/** Every rating a fuse may have, ascending (the breaker list is ascending as written). */
const FUSE_RATINGS_ASCENDING: readonly number[] = [...FUSE_ONLY_RATINGS_A, ...STANDARD_AMPERE_RATINGS_A].sort((a, b) => a - b);

/** Rated line current of a capacitor circuit: Q·1000/(√3·V) three-phase, Q·1000/V single-phase. */
export function capacitorRatedCurrentA(kvar: number, voltageV: number, phases: Phases): number {
  return capacitorCurrentA(kvar, voltageV, phases);
}

/**
 * Least ampacity of the conductors connecting a capacitor to a motor's terminals or motor-circuit conductors
 * (NFPA 70 460.8(A)): at least 135 % of the capacitor's rated current and at least one third of the motor-circuit
 * conductors' ampacity. Without that ampacity only the 135 % part can be worked.
 */
export function terminalCapacitorConductorMinA(capacitorRatedA: number, motorConductorAmpacityA?: number): number {
  const byCurrent = capacitorRatedA * CONDUCTOR_AMPACITY_FACTOR;
  return motorConductorAmpacityA === undefined ? byCurrent : Math.max(byCurrent, motorConductorAmpacityA * MOTOR_CONDUCTOR_SHARE);
}

/**
 * Protection of one capacitor circuit carrying `currentA` (the rated current, or the larger operating current of a
 * detuned step). Conductors and disconnect at 135 % (NFPA 70 460.8(A), (C)); device at the chosen multiple, rounded up.
 */
export function circuitProtection(
  label: string,
  kvar: number,
  currentA: number,
  options: ProtectionOptions = {},
  path?: string,
): { protection: CircuitProtection; warnings: Warning[] } {
  const warnings: Warning[] = [];
  const device = options.device ?? "fuse";
  let factor = options.ocpdFactor ?? DEFAULT_OCPD_FACTOR[device];
  if (factor < OCPD_FACTOR_MIN) {
    warnings.push(
      warning(
        "ocpd_factor_below_minimum",
        `an overcurrent device at ${(factor * 100).toFixed(0)} % of rated current would trip on the capacitor's tolerance and harmonic current; 135 % is used`,
        path,
      ),
    );
    factor = OCPD_FACTOR_MIN;
  }
  const ocpdMinA = currentA * factor;
  const ocpdRatingA = nextStandardRatingA(ocpdMinA, device);
  if (ocpdRatingA === null) {
    warnings.push(
      warning(
        "ocpd_above_standard_ratings",
        `${label}: ${ocpdMinA.toFixed(0)} A is above the largest standard rating (6000 A, NFPA 70 240.6(A)); split the circuit`,
        path,
      ),
    );
  }
  return {
    protection: {
      label,
      kvar,
      ratedCurrentA: currentA,
      conductorMinAmpacityA: currentA * CONDUCTOR_AMPACITY_FACTOR,
      disconnectMinA: currentA * DISCONNECT_FACTOR,
      device,
      ocpdFactor: factor,
      ocpdMinA,
      ocpdRatingA,
    },
    warnings,
  };
}
