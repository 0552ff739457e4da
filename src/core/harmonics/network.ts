/**
 * Network at the capacitor bus, as seen at harmonic order h: source Z_s(h) ∥ linear-load resistance ∥ capacitor
 * branches. Three-phase: per phase of the wye equivalent. Single-phase: the loop between the two conductors at the
 * line voltage. Z_base = V²/S_sc, X_C = V²/Q and R = V²/P have the same form in both (V line-to-line, S, Q, P the
 * system's total three-phase or single-phase figures); only the voltage across a branch and the current per kVA differ.
 */
import { SQRT3, type Phases } from "../conventions.js";
import { complex, cParallel, type Complex } from "./complex.js";
import type { CapacitorBranch } from "./branch.js";
import { branchImpedance } from "./branch.js";

export interface NetworkInput {
  /** Bus voltage, line-to-line (on a single-phase system, the voltage between its two conductors). */
  voltageV: number;
  frequencyHz: number;
  /** Short-circuit power at the bus: three-phase, or single-phase on a single-phase system. */
  shortCircuitKVA: number;
  /** Default 3. */
  phases?: Phases;
  /** Source X/R at the fundamental; when absent it is estimated from transformerKVA. */
  xOverR?: number;
  transformerKVA?: number;
  /** kW of linear (non-drive) load on the bus; 0 or absent means no damping branch. */
  linearLoadKW?: number;
}

export type XOverRBasis = "given" | "transformer_rule_of_thumb" | "unknown_default";

export interface SourceImpedance {
  baseImpedanceOhm: number;
  /** Held constant with h (skin effect ignored): less damping than reality, so conservative. */
  resistanceOhm: number;
  /** At the fundamental; scales with h. */
  reactanceOhm: number;
  xOverR: number;
  xOverRBasis: XOverRBasis;
}

export interface BusModel {
  voltageV: number;
  frequencyHz: number;
  phases: Phases;
  source: SourceImpedance;
  /** Linear load as a resistance in parallel; null when there is none. */
  loadResistanceOhm: number | null;
  branches: readonly CapacitorBranch[];
}

/** Rule of thumb from typical transformer data, no standard: X/R grows with transformer size. */
const X_OVER_R_BY_KVA: readonly { upToKVA: number; xOverR: number }[] = [
  { upToKVA: 150, xOverR: 3 },
  { upToKVA: 500, xOverR: 5 },
  { upToKVA: 1000, xOverR: 6 },
  { upToKVA: 2500, xOverR: 8 },
];
const X_OVER_R_LARGE = 10;
/** With nothing known, the high end: less resistance gives sharper, larger resonance peaks (conservative). */
export const X_OVER_R_UNKNOWN = 10;

export function defaultXOverR(transformerKVA?: number): { xOverR: number; basis: XOverRBasis } {
  if (transformerKVA === undefined || !(transformerKVA > 0)) return { xOverR: X_OVER_R_UNKNOWN, basis: "unknown_default" };
  const band = X_OVER_R_BY_KVA.find((b) => transformerKVA <= b.upToKVA);
  return { xOverR: band ? band.xOverR : X_OVER_R_LARGE, basis: "transformer_rule_of_thumb" };
}

/** Z_base = V_LL²/S_sc split by the angle atan(X/R): the standard short-circuit impedance model. */
export function sourceImpedance(network: NetworkInput): SourceImpedance {
  const given = network.xOverR;
  const { xOverR, basis } = given !== undefined ? { xOverR: given, basis: "given" as const } : defaultXOverR(network.transformerKVA);
  const baseImpedanceOhm = (network.voltageV * network.voltageV) / (network.shortCircuitKVA * 1000);
  const reactanceOhm = baseImpedanceOhm * Math.sin(Math.atan(xOverR));
  return { baseImpedanceOhm, resistanceOhm: reactanceOhm / xOverR, reactanceOhm, xOverR, xOverRBasis: basis };
}

/** Linear loads as R = V_LL²/P in parallel (resistive damping model; motors' inductance ignored). */
export function loadDampingResistanceOhm(voltageV: number, linearLoadKW?: number): number | null {
  if (linearLoadKW === undefined || !(linearLoadKW > 0)) return null;
  return (voltageV * voltageV) / (linearLoadKW * 1000);
}

/**
 * The fundamental voltage across one branch of the model: V/√3 (line-to-neutral of the wye equivalent) on a
 * three-phase system, V itself (between the two conductors) on a single-phase one. Harmonic voltages are percent of it.
 */
export function branchVoltageV(voltageV: number, phases: Phases = 3): number {
  return phases === 3 ? voltageV / SQRT3 : voltageV;
}

export function buildBusModel(network: NetworkInput, branches: readonly CapacitorBranch[] = []): BusModel {
  return {
    voltageV: network.voltageV,
    frequencyHz: network.frequencyHz,
    phases: network.phases ?? 3,
    source: sourceImpedance(network),
    loadResistanceOhm: loadDampingResistanceOhm(network.voltageV, network.linearLoadKW),
    branches: [...branches],
  };
}

/** The model with other branches; fields written out (every stage of a study makes one), in BusModel's order. */
export function withBranches(model: BusModel, branches: readonly CapacitorBranch[]): BusModel {
  return {
    voltageV: model.voltageV,
    frequencyHz: model.frequencyHz,
    phases: model.phases,
    source: model.source,
    loadResistanceOhm: model.loadResistanceOhm,
    branches: branches.slice(),
  };
}

/** Z_s(h) = R_s + j·h·X_s. */
export function sourceImpedanceAt(source: SourceImpedance, h: number): Complex {
  return complex(source.resistanceOhm, h * source.reactanceOhm);
}

export function sourceImpedanceOhmAt(source: SourceImpedance, h: number): number {
  return Math.hypot(source.resistanceOhm, h * source.reactanceOhm);
}

/** Driving-point impedance Z(h) = Z_s ∥ R_load ∥ Z_branch…, combined pairwise. */
export function drivingPointImpedance(model: BusModel, h: number): Complex {
  let z = sourceImpedanceAt(model.source, h);
  if (model.loadResistanceOhm !== null) z = cParallel(z, complex(model.loadResistanceOhm));
  for (const b of model.branches) z = cParallel(z, branchImpedance(b, h));
  return z;
}

/**
 * |Z(h)| by summing admittances in plain numbers: no allocation, for the scan's inner loop.
 * Returns 0 when a branch is exactly series-tuned with no resistance (it shorts the bus).
 */
export function drivingPointImpedanceOhm(model: BusModel, h: number): number {
  const rs = model.source.resistanceOhm;
  const xs = h * model.source.reactanceOhm;
  const ds = rs * rs + xs * xs;
  let g = rs / ds;
  let b = -xs / ds;
  if (model.loadResistanceOhm !== null) g += 1 / model.loadResistanceOhm;
  const branches = model.branches;
  for (let i = 0; i < branches.length; i++) {
    const br = branches[i]!;
    const r = br.reactorResistanceOhm;
    const x = h * br.reactorReactanceOhm - br.capacitorReactanceOhm / h;
    const d = r * r + x * x;
    if (d === 0) return 0;
    g += r / d;
    b -= x / d;
  }
  return 1 / Math.sqrt(g * g + b * b);
}

/**
 * Fills out[i] = |Z(from + i·step)| for a whole scan: the same admittance sum as drivingPointImpedanceOhm
 * with every model field hoisted into locals, so the hot loop touches no objects and allocates nothing.
 */
export function fillImpedanceOhm(model: BusModel, fromOrder: number, stepOrder: number, ordersH: Float64Array, out: Float64Array): void {
  const rs = model.source.resistanceOhm;
  const xs1 = model.source.reactanceOhm;
  const g0 = model.loadResistanceOhm === null ? 0 : 1 / model.loadResistanceOhm;
  const m = model.branches.length;
  const rr = new Float64Array(m);
  const xl = new Float64Array(m);
  const xc = new Float64Array(m);
  model.branches.forEach((br, k) => {
    rr[k] = br.reactorResistanceOhm;
    xl[k] = br.reactorReactanceOhm;
    xc[k] = br.capacitorReactanceOhm;
  });
  const n = out.length;
  // One reciprocal per term instead of two divisions: the scan's cost is its divisions.
  for (let i = 0; i < n; i++) {
    const h = fromOrder + i * stepOrder;
    ordersH[i] = h;
    const invH = 1 / h;
    const xs = h * xs1;
    const invDs = 1 / (rs * rs + xs * xs);
    let g = rs * invDs + g0;
    let b = -xs * invDs;
    let shorted = false;
    for (let k = 0; k < m; k++) {
      const r = rr[k]!;
      const x = h * xl[k]! - xc[k]! * invH;
      const d = r * r + x * x;
      if (d === 0) {
        shorted = true;
        break;
      }
      const invD = 1 / d;
      g += r * invD;
      b -= x * invD;
    }
    out[i] = shorted ? 0 : 1 / Math.sqrt(g * g + b * b);
  }
}
