/** Discharge resistors of a capacitor step: the requirement by voltage class and the largest resistance meeting it. */
import { capacitancePerPhase, capacitanceSinglePhaseUF } from "./capacitor.js";
import { SQRT3, type Phases } from "../conventions.js";
import { warning, type Warning } from "../warnings.js";

export type CapacitorConnection = "delta" | "wye" | "single_phase";

/** How the discharge resistors are connected to the capacitors. */
export type DischargeConnection = "across_each_capacitor" | "star_across_delta" | "two_across_delta" | "delta_across_wye";

/**
 * Factor k of R ≤ t/(k·C·ln(√2·U_N/U_R)) (IEC 60831-1 method), C the capacitance of one capacitor element.
 * Derived from the slowest decay mode τ = k·R·C of the disconnected bank (node analysis, ours):
 * - across_each_capacitor: each R directly across its C, τ = RC → k = 1.
 * - star_across_delta: three R in star on a delta of C; star→delta gives 3R across each C, τ = 3RC → k = 3.
 * - two_across_delta: R across two of the three delta C (V connection); with the third node as reference,
 *   det = y_ab·y_bc + y_bc·y_ca + y_ca·y_ab = 0 with y_ab = y_bc = sC + 1/R, y_ca = sC gives
 *   (sC + 1/R)(3sC + 1/R) = 0: τ = RC (mode 1, −1, 0) and τ = 3RC (mode 1, 1, −2) → k = 3.
 * - delta_across_wye: three R in delta between the lines of a wye of C with a floating star point; with the star
 *   point at the mean, sC·v + 3v/R = 0, τ = RC/3 → k = 1/3.
 */
export const DISCHARGE_K: Record<DischargeConnection, number> = {
  across_each_capacitor: 1,
  star_across_delta: 3,
  two_across_delta: 3,
  delta_across_wye: 1 / 3,
};

export type DischargeStandard = "nfpa70" | "iec";

export interface DischargeRequirement {
  standard: DischargeStandard;
  citation: string;
  timeS: number;
  residualV: number;
  basis: string;
}

/** Discharge requirement by voltage class; above 1000 V the figures are from memory and flagged so. */
export function dischargeRequirements(voltageV: number, standards: readonly DischargeStandard[] = ["nfpa70", "iec"]): DischargeRequirement[] {
  const lv = voltageV <= 1000;
  const all: DischargeRequirement[] = [
    lv
      ? {
          standard: "nfpa70",
          citation: "NFPA 70 460.6(A)",
          timeS: 60,
          residualV: 50,
          basis: "50 V or less within 1 min, capacitors 1000 V and below",
        }
      : {
          standard: "nfpa70",
          citation: "NFPA 70 460.28(A)",
          timeS: 300,
          residualV: 50,
          basis: "50 V or less within 5 min over 1000 V (from memory: check the edition in force)",
        },
    lv
      ? { standard: "iec", citation: "IEC 60831-1", timeS: 180, residualV: 75, basis: "75 V or less within 3 min, capacitors up to 1000 V" }
      : {
          standard: "iec",
          citation: "IEC 60871-1",
          timeS: 600,
          residualV: 75,
          basis: "75 V or less within 10 min over 1000 V (from memory: check the edition in force)",
        },
  ];
  return all.filter((r) => standards.includes(r.standard));
}

/** Largest discharge resistance: R ≤ t/(k·C·ln(√2·U_N/U_R)) (IEC 60831-1 method); Infinity when √2·U_N ≤ U_R. */
export function maxDischargeResistanceOhm(timeS: number, k: number, capacitanceF: number, ratedElementV: number, residualV: number): number {
  const ratio = (Math.SQRT2 * ratedElementV) / residualV;
  return ratio <= 1 ? Number.POSITIVE_INFINITY : timeS / (k * capacitanceF * Math.log(ratio));
}

/** Time for the peak rated voltage √2·U_N to fall to U: t = k·R·C·ln(√2·U_N/U). */
export function dischargeTimeS(resistanceOhm: number, k: number, capacitanceF: number, ratedElementV: number, residualV: number): number {
  return k * resistanceOhm * capacitanceF * Math.log((Math.SQRT2 * ratedElementV) / residualV);
}

export interface DischargeOptions {
  capacitorConnection?: CapacitorConnection;
  resistorConnection?: DischargeConnection;
  standards?: readonly DischargeStandard[];
}

export interface DischargeDesign {
  kvar: number;
  ratedVoltageV: number;
  capacitorConnection: CapacitorConnection;
  resistorConnection: DischargeConnection;
  k: number;
  /** Capacitance of one capacitor element, F. */
  capacitanceF: number;
  /** Rated voltage across one element U_N. */
  elementVoltageV: number;
  requirements: (DischargeRequirement & { maxResistanceOhm: number })[];
  governingCitation: string;
  maxResistanceOhm: number;
  resistorCount: number;
  resistorVoltageV: number;
  /** P = U²/R at rated voltage with R = maxResistanceOhm (a lower R dissipates more). */
  dissipationPerResistorW: number;
  dissipationTotalW: number;
  /** Time to 10 % of rated voltage with R = maxResistanceOhm: the least reclosing delay for the controller. */
  timeTo10PctS: number;
}

const VALID: Record<CapacitorConnection, DischargeConnection[]> = {
  delta: ["across_each_capacitor", "star_across_delta", "two_across_delta"],
  wye: ["across_each_capacitor", "delta_across_wye"],
  single_phase: ["across_each_capacitor"],
};

/** Discharge resistors for a step of `kvar` nameplate at its rated voltage and frequency. */
export function dischargeDesign(
  kvar: number,
  ratedVoltageV: number,
  frequencyHz: number,
  phases: Phases,
  options: DischargeOptions = {},
  path?: string,
): { discharge: DischargeDesign; warnings: Warning[] } {
  const warnings: Warning[] = [];
  const capConn: CapacitorConnection = phases === 1 ? "single_phase" : (options.capacitorConnection ?? "delta");
  let resConn = options.resistorConnection ?? "across_each_capacitor";
  if (!VALID[capConn].includes(resConn)) {
    warnings.push(
      warning("discharge_connection_invalid", `${resConn} does not apply to a ${capConn} bank; resistors across each capacitor are assumed`, path),
    );
    resConn = "across_each_capacitor";
  }
  const k = DISCHARGE_K[resConn];
  const cpp = capacitancePerPhase(kvar, ratedVoltageV, frequencyHz);
  const capacitanceF =
    (capConn === "single_phase" ? capacitanceSinglePhaseUF(kvar, ratedVoltageV, frequencyHz) : capConn === "delta" ? cpp.deltaUF : cpp.wyeUF) * 1e-6;
  const elementVoltageV = capConn === "wye" ? ratedVoltageV / SQRT3 : ratedVoltageV;
  // A limit at or above the capacitor's peak voltage √2·U_N is met without a resistor: it sets no maximum, and is
  // left out (its maximum would be infinite). With none left the caller has no resistor to size (Infinity below).
  const requirements = dischargeRequirements(ratedVoltageV, options.standards)
    .map((r) => ({ ...r, maxResistanceOhm: maxDischargeResistanceOhm(r.timeS, k, capacitanceF, elementVoltageV, r.residualV) }))
    .filter((r) => Number.isFinite(r.maxResistanceOhm));
  let governing = requirements[0];
  for (const r of requirements) if (governing === undefined || r.maxResistanceOhm < governing.maxResistanceOhm) governing = r;
  const maxResistanceOhm = governing?.maxResistanceOhm ?? Number.POSITIVE_INFINITY;
  const resistorCount = resConn === "two_across_delta" ? 2 : capConn === "single_phase" ? 1 : 3;
  const resistorVoltageV =
    resConn === "star_across_delta" ? ratedVoltageV / SQRT3 : resConn === "across_each_capacitor" ? elementVoltageV : ratedVoltageV;
  const perW = (resistorVoltageV * resistorVoltageV) / maxResistanceOhm;
  return {
    discharge: {
      kvar,
      ratedVoltageV,
      capacitorConnection: capConn,
      resistorConnection: resConn,
      k,
      capacitanceF,
      elementVoltageV,
      requirements,
      governingCitation: governing?.citation ?? "none",
      maxResistanceOhm,
      resistorCount,
      resistorVoltageV,
      dissipationPerResistorW: perW,
      dissipationTotalW: perW * resistorCount,
      // Residual ≤ 10 % of rated before re-energising (IEC 60831-1 practice, from memory).
      timeTo10PctS: dischargeTimeS(maxResistanceOhm, k, capacitanceF, elementVoltageV, 0.1 * elementVoltageV),
    },
    warnings,
  };
}
