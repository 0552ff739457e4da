/** The methods and standards behind the figures, each with its source; rules of thumb are marked as such. */
import type { ReportInput, Section } from "../types.js";

type Standing = "standard" | "textbook method" | "rule of thumb" | "common practice";

const METHODS: readonly [string, string, string, Standing][] = [
  ["Power triangle", "S = √(P² + Q²), PF = P/S, Q = P·tan(acos PF); I = S/(√3·V_LL) three-phase", "Textbook circuit theory; true-PF readings split per IEEE 1459-2010", "textbook method"],
  ["kvar to the target", "Q_c = P·(tan φ₁ − tan φ₂) = P × multiplier (the handbook kvar/kW table)", "Power-triangle method at constant kW", "textbook method"],
  ["Loss reduction", "1 − (PF₁/PF₂)², losses proportional to I² at constant kW", "I²R losses at constant real power", "common practice"],
  ["Capacitor output", "Q = Q_r·(V/V_r)²·(f/f_r); with reactor p: Q_eff = Q_C/(1 − p), U_C = U/(1 − p)", "IEEE 18 rating basis; series reactor circuit", "standard"],
  ["Short-circuit strength S_sc", "MVA method: 1/S_sc = 1/S_utility + (Z%/100)/S_T", "MVA method of short-circuit calculation", "textbook method"],
  ["Parallel resonance", "h = √(S_sc/Q_C) without reactor; h = √(1/(Q_C/S_sc + p)) with reactor p; tuning h_t = 1/√p", "IEEE 519 / IEEE 1036 application practice", "textbook method"],
  ["Near-harmonic flag", "resonance within ±10 % of an order the site produces", "Band chosen by the project", "common practice"],
  ["Harmonic study advised", "drive load above 15 % of the transformer kVA", "Makers' application guides, not a standard", "rule of thumb"],
  ["Fixed bank limit", "fixed bank at most 15 % of the transformer kVA, else automatic", "Makers' application guides", "rule of thumb"],
  ["Impedance scan", "|Z(h)| of source (R + jhX) ∥ linear load R = V²/P ∥ stage branch R_r + j(h·p·X_C − X_C/h)", "Driving-point impedance, per-phase model", "textbook method"],
  ["Voltage distortion limits", "THD_v and individual harmonic limits by bus voltage", "IEEE 519-2014 Table 1", "standard"],
  ["Capacitor duty", "rms voltage 110 %, peak voltage 120 %, rms current 135 %, kvar 135 % of rating", "IEEE 18", "standard"],
  ["Discharge", "50 V within 1 min (up to 1000 V); 75 V within 3 min; R ≤ t/(k·C·ln(√2·U_N/U_R))", "NFPA 70 460.6; IEC 60831-1", "standard"],
  ["Conductors and disconnect", "at least 135 % of the capacitor's rated current", "NFPA 70 460.8(A), 460.8(C)", "standard"],
  ["Overcurrent device", "next standard ampere rating at or above the chosen multiple (fuse 165 %, breaker 150 %)", "NFPA 70 240.6(A) for ratings; multiples from makers' practice", "rule of thumb"],
  ["Motor-terminal capacitors", "at most the kvar that corrects no-load PF to unity at the voltage read (90 % of it by default), a standard size at its rating", "IEEE Std 141 and motor makers' tables (from memory)", "common practice"],
  ["Motor-terminal conductors and overload", "capacitor conductors ≥ 135 % of its rated current and ≥ ⅓ of the motor-circuit conductors' ampacity; overload relay set to the corrected current", "NFPA 70 460.8(A), 460.9", "standard"],
  ["Voltage rise on switching", "ΔV % ≈ Q/S_sc × 100", "Short-circuit ratio estimate", "common practice"],
];

export function methodsSection(input: ReportInput): Section {
  return {
    id: "methods",
    heading: "Methods and standards",
    blocks: [
      {
        kind: "table",
        header: ["Quantity", "Formula or rule", "Source", "Standing"],
        align: ["left", "left", "left", "left"],
        rows: METHODS.map((m) => [...m]),
        note: "\"Rule of thumb\" and \"common practice\" entries are judgement, not a standard's requirement: check them against the site and the makers' data.",
      },
      { kind: "paragraph", text: `Computed by the pfc-sizing engine, version ${input.result.engineVersion}. Standards are cited by clause; the editions in force where the bank is installed govern.` },
    ],
  };
}
