import { apparentKVA, kVAFromVoltsAmps, senseOfKvar, tanPhi, type Phases, type Sense } from "../conventions.js";
import type { Measurement } from "../inputs.js";
import { warning, type InputIssue, type Warning } from "../warnings.js";

/** The fundamental power triangle of one reading (before any multiplication by quantity). */
export interface PowerTriangle {
  kW: number;
  /** Signed: > 0 lagging, < 0 leading. */
  kvar: number;
  /** Fundamental apparent power √(kW² + kvar²). */
  kVA: number;
  displacementPF: number;
  sense: Sense;
}

export interface MeasuredTriangle extends PowerTriangle {
  /** The meter's apparent power when it was read directly or from V·I (includes distortion on a true-rms meter). */
  measuredKVA?: number;
  /** The PF the meter showed, when pfType = "true". */
  truePF?: number;
}

export interface TriangleOutcome {
  triangle?: MeasuredTriangle;
  issues: InputIssue[];
  warnings: Warning[];
}

/** Meter tolerance: kW up to 1 % above kVA is read as unity PF (common practice, no source). */
export const KW_OVER_KVA_TOLERANCE = 0.01;

function signOf(sense: Sense | undefined): number {
  return sense === "leading" ? -1 : sense === "unity" ? 0 : 1;
}

/**
 * Turn one reading into its power triangle. `at` is the reading's path in the request
 * (e.g. ["loads", 3, "measurement"]) so issues and warnings can name the field.
 */
export function triangleOf(m: Measurement, phases: Phases, at: (string | number)[]): TriangleOutcome {
  const issues: InputIssue[] = [];
  const warnings: Warning[] = [];

  let kW: number;
  let meterPF: number;
  let sense: Sense;
  let measuredKVA: number | undefined;

  switch (m.method) {
    case "kw_kvar": {
      kW = m.kW;
      const s = apparentKVA(m.kW, m.kvar);
      meterPF = s > 0 ? m.kW / s : 1;
      sense = senseOfKvar(m.kvar, s);
      break;
    }
    case "kw_pf":
      kW = m.kW;
      meterPF = m.pf;
      sense = m.pf === 1 ? "unity" : m.sense;
      break;
    case "v_i_pf": {
      measuredKVA = kVAFromVoltsAmps(m.volts, m.amps, phases);
      kW = measuredKVA * m.pf;
      meterPF = m.pf;
      sense = m.pf === 1 ? "unity" : m.sense;
      break;
    }
    case "kw_kva":
    case "v_i_kw": {
      const kVA = m.method === "kw_kva" ? m.kVA : kVAFromVoltsAmps(m.volts, m.amps, phases);
      kW = m.kW;
      measuredKVA = kVA;
      if (kW > kVA * (1 + KW_OVER_KVA_TOLERANCE)) {
        issues.push({
          path: [...at, "kW"],
          message: `kW exceeds kVA (${kW} kW against ${round3(kVA)} kVA): check the readings`,
        });
        return { issues, warnings };
      }
      if (kW > kVA) {
        warnings.push(
          warning(
            "kw_clamped_to_kva",
            `kW is ${round3(kW - kVA)} above kVA, within 1 % meter tolerance: read as unity power factor`,
            pathOf(at, "kW"),
          ),
        );
        meterPF = 1;
      } else {
        meterPF = kW / kVA;
      }
      sense = meterPF === 1 ? "unity" : (m.sense ?? "lagging");
      break;
    }
  }

  if (sense === "unity" && meterPF < 0.995 && m.method !== "kw_kvar") {
    issues.push({
      path: [...at, "sense"],
      message: `sense is "unity" but the reading gives PF ${round3(meterPF)}: choose lagging or leading`,
    });
    return { issues, warnings };
  }

  let displacementPF = meterPF;
  let truePF: number | undefined;
  if (m.pfType === "true") {
    truePF = meterPF;
    if (m.currentTHDPct !== undefined) {
      // DPF = PF_true·√(1 + THD_i²): distortion factor of a sinusoidal-voltage bus (IEEE Std 1459-2010 decomposition).
      const thd = m.currentTHDPct / 100;
      displacementPF = Math.min(1, meterPF * Math.sqrt(1 + thd * thd));
      warnings.push(
        warning(
          "displacement_pf_derived",
          `displacement PF ${round3(displacementPF)} derived from true PF ${round3(meterPF)} and current THD ${m.currentTHDPct} %`,
          pathOf(at, "pfType"),
        ),
      );
    } else {
      warnings.push(
        warning(
          "true_pf_without_thd",
          "a true-PF reading without current THD is used as if it were displacement PF; capacitors correct only the displacement part, so the kvar may be overstated: add currentTHDPct",
          pathOf(at, "pfType"),
        ),
      );
    }
  }

  // A kvar reading is used as read unless a true-PF correction changed the PF.
  const kvar =
    m.method === "kw_kvar" && m.pfType !== "true"
      ? m.kvar
      : sense === "unity" || displacementPF >= 1
        ? 0
        : signOf(sense) * kW * tanPhi(displacementPF);
  const kVA = apparentKVA(kW, kvar);
  const triangle: MeasuredTriangle = {
    kW,
    kvar,
    kVA,
    displacementPF: kVA > 0 ? kW / kVA : 1,
    sense: senseOfKvar(kvar, kVA),
  };
  if (measuredKVA !== undefined) triangle.measuredKVA = measuredKVA;
  if (truePF !== undefined) triangle.truePF = truePF;
  return { triangle, issues, warnings };
}

export function scaleTriangle<T extends PowerTriangle>(t: T, quantity: number): T {
  if (quantity === 1) return t;
  const out = { ...t, kW: t.kW * quantity, kvar: t.kvar * quantity, kVA: t.kVA * quantity };
  const withMeasured = out as T & { measuredKVA?: number };
  if (withMeasured.measuredKVA !== undefined) withMeasured.measuredKVA *= quantity;
  return out;
}

/** The dotted path of a field of the reading, e.g. "loads.3.measurement.kW". */
function pathOf(at: (string | number)[], field: string): string {
  return [...at, field].join(".");
}

function round3(x: number): number {
  return Math.round(x * 1000) / 1000;
}
