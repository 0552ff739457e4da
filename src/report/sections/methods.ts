/**
 * The methods and standards behind the figures, each with its source; rules of thumb are marked as such. Every number
 * in this table is read from the constant the engine uses, so the table cannot drift from the engine.
 */
import { CONDUCTOR_AMPACITY_FACTOR, DEFAULT_OCPD_FACTOR, DISCONNECT_FACTOR } from "../../core/bank/protection.js";
import { FIXED_SHARE_WITHOUT_LIGHT_LOAD } from "../../core/bank/demand.js";
import { DEFAULT_COVERAGE } from "../../core/bank/step-plan.js";
import { dischargeRequirements } from "../../core/bank/discharge.js";
import { IEEE18_LIMITS_PCT } from "../../core/harmonics/duty.js";
import { DEFAULT_VOLTAGE_MARGIN_FACTOR } from "../../core/harmonics/detuned.js";
import { NONLINEAR_STUDY_SHARE, RESONANCE_BAND_PCT } from "../../core/harmonics/resonance.js";
import { DEFAULT_LEADING_LIMIT_PF, DEFAULT_RESPONSE_THRESHOLD } from "../../core/interval/controller.js";
import { DEFAULT_SELF_EXCITATION_SHARE } from "../../core/placement/placement.js";
import { INTERVAL_RANGE_MARGIN } from "../../core/pipeline/scope.js";
import type { ReportInput, Section } from "../types.js";

type Standing = "standard" | "textbook method" | "rule of thumb" | "common practice";
export type MethodRow = readonly [quantity: string, rule: string, source: string, standing: Standing];

const pct = (fraction: number) => `${+(fraction * 100).toFixed(2)} %`;

/** The rows, built from the engine's constants at the bus voltage (discharge limits depend on it). */
export function methodRows(voltageV: number): MethodRow[] {
  const discharge = dischargeRequirements(voltageV)
    .map((r) => `${r.residualV} V within ${r.timeS >= 60 ? `${r.timeS / 60} min` : `${r.timeS} s`} (${r.citation})`)
    .join("; ");
  const d = IEEE18_LIMITS_PCT;
  return [
    [
      "Power triangle",
      "S = √(P² + Q²), PF = P/S, Q = P·tan(acos PF); I = S/(√3·V_LL) three-phase, S/V single-phase",
      "Textbook circuit theory; true-PF readings split per IEEE 1459-2010",
      "textbook method",
    ],
    [
      "kvar to the target",
      "Q_c = P·(tan φ₁ − tan φ₂) = P × multiplier (the handbook kvar/kW table); a leading site takes its excess out of service",
      "Power-triangle method at constant kW",
      "textbook method",
    ],
    ["Loss reduction", "1 − (PF₁/PF₂)², losses proportional to I² at constant kW", "I²R losses at constant real power", "common practice"],
    [
      "Capacitor output",
      "Q = Q_r·(V/V_r)²·(f/f_r); with reactor p: Q_eff = Q_C/(1 − p), U_C = U/(1 − p)",
      "IEEE 18 rating basis; series reactor circuit",
      "standard",
    ],
    ["Short-circuit strength S_sc", "MVA method: 1/S_sc = 1/S_utility + (Z%/100)/S_T", "MVA method of short-circuit calculation", "textbook method"],
    [
      "Parallel resonance",
      "h = √(S_sc/Q_C) without reactor; h = √(1/(Q_C/S_sc + p)) with reactor p; tuning h_t = 1/√p",
      "IEEE 519 / IEEE 1036 application practice",
      "textbook method",
    ],
    [
      "Near-harmonic flag",
      `resonance within ±${RESONANCE_BAND_PCT} % of an order the site produces`,
      "Band chosen by the project",
      "common practice",
    ],
    [
      "Harmonic study advised",
      `drive load above ${pct(NONLINEAR_STUDY_SHARE)} of the transformer kVA`,
      "Makers' application guides, not a standard",
      "rule of thumb",
    ],
    [
      "Fixed part of the bank",
      `at most the minimum reactive demand (interval data, or a light-load reading); with neither, at most ${pct(FIXED_SHARE_WITHOUT_LIGHT_LOAD)} of the transformer kVA and below the need`,
      "Avoids leading PF at light load",
      "common practice",
    ],
    [
      "Switched steps",
      `standard nameplate sizes at the capacitor's rated voltage (delivered kvar = nameplate·(V/V_r)²/(1 − p)) in 1:1:1, 1:2:2 or 1:2:4 programs, ranked by the intervals meeting the target (design coverage ${pct(DEFAULT_COVERAGE)}), then fewest steps, then fewest switching operations`,
      "Controller makers' practice",
      "common practice",
    ],
    [
      "Controller rule",
      `best-combination switching; dead band from the target to unity widened by ${pct(DEFAULT_RESPONSE_THRESHOLD)} of the smallest step; never leading beyond PF ${DEFAULT_LEADING_LIMIT_PF}`,
      "Controller makers' practice",
      "common practice",
    ],
    [
      "Impedance scan",
      "|Z(h)| of source (R + jhX) ∥ linear load R = V²/P ∥ stage branch R_r + j(h·p·X_C − X_C/h)",
      "Driving-point impedance, per-phase model",
      "textbook method",
    ],
    ["Voltage distortion limits", "THD_v and individual harmonic limits by bus voltage", "IEEE 519-2014 Table 1", "standard"],
    [
      "Capacitor duty",
      `rms voltage ${d.rmsVoltage} %, peak voltage ${d.peakVoltage} %, rms current ${d.rmsCurrent} %, kvar ${d.reactivePower} % of rating`,
      "IEEE 18",
      "standard",
    ],
    [
      "Detuned capacitor voltage",
      `rating at least U/(1 − p) × ${DEFAULT_VOLTAGE_MARGIN_FACTOR}, the next standard voltage`,
      "Series reactor circuit; margin chosen by the project",
      "common practice",
    ],
    ["Discharge", `${discharge}; R ≤ t/(k·C·ln(√2·U_N/U_R))`, "NFPA 70 460.6; IEC 60831-1", "standard"],
    [
      "Conductors and disconnect",
      `at least ${pct(CONDUCTOR_AMPACITY_FACTOR)} (conductors) and ${pct(DISCONNECT_FACTOR)} (disconnect) of the capacitor's rated current`,
      "NFPA 70 460.8(A), 460.8(C)",
      "standard",
    ],
    [
      "Overcurrent device",
      `next standard ampere rating at or above the chosen multiple (fuse ${pct(DEFAULT_OCPD_FACTOR.fuse)}, breaker ${pct(DEFAULT_OCPD_FACTOR.breaker)})`,
      "NFPA 70 240.6(A) for ratings; multiples from makers' practice",
      "rule of thumb",
    ],
    [
      "Motor-terminal capacitors",
      `at most ${pct(DEFAULT_SELF_EXCITATION_SHARE)} of the kvar that corrects no-load PF to unity at the voltage read (self-excitation limit), a standard size at its rating`,
      "IEEE Std 141 and motor makers' tables (from memory)",
      "common practice",
    ],
    [
      "Motor-terminal conductors and overload",
      `capacitor conductors at least ${pct(CONDUCTOR_AMPACITY_FACTOR)} of its rated current and one third of the motor-circuit conductors' ampacity; overload relay set to the corrected current`,
      "NFPA 70 460.8(A), 460.9",
      "standard",
    ],
    [
      "Survey against interval data",
      `a whole-site reading more than ${pct(INTERVAL_RANGE_MARGIN)} outside the interval data's 1st–100th percentile range is flagged`,
      "Chosen by the project",
      "common practice",
    ],
    ["Voltage rise on switching", "ΔV % ≈ Q/S_sc × 100", "Short-circuit ratio estimate", "common practice"],
  ];
}

export function methodsSection(input: ReportInput): Section {
  return {
    id: "methods",
    heading: "Methods and standards",
    blocks: [
      {
        kind: "table",
        header: ["Quantity", "Formula or rule", "Source", "Standing"],
        align: ["left", "left", "left", "left"],
        rows: methodRows(input.result.system.voltageV).map((m) => [...m]),
        note: '"Rule of thumb" and "common practice" entries are judgement, not a standard\'s requirement: check them against the site and the makers\' data.',
      },
      { kind: "paragraph", text: "Standards are cited by clause; the editions in force where the bank is installed govern." },
    ],
  };
}
