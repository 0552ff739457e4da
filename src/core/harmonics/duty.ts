/** Capacitor duty of a stage against the IEEE Std 18 continuous limits. */
import { capacitorBranch, capacitorKvarAtSystem, DEFAULT_REACTOR_QUALITY_FACTOR } from "./branch.js";
import type { Phases } from "../conventions.js";
import { capacitorCurrentA } from "../bank/capacitor.js";
import { branchVoltageV } from "./network.js";
import { limitCheck, MAX_HARMONIC_ORDER, type LimitCheck, type SpectrumLine } from "./study-types.js";

/** IEEE Std 18-2012 continuous limits, percent of rating (from memory). */
export const IEEE18_LIMITS_PCT = { rmsVoltage: 110, peakVoltage: 120, rmsCurrent: 135, reactivePower: 135 } as const;

export interface CapacitorRating {
  /** Nameplate voltage, line-to-line (single-phase: between its two terminals). */
  ratedVoltageV: number;
  /** Nameplate kvar (3-phase, or 1-phase on a single-phase system) at rated voltage and frequency (sum of the stage's switched steps). */
  ratedKvar: number;
  ratedFrequencyHz: number;
}

export interface CapacitorDutyInput {
  voltageV: number;
  frequencyHz: number;
  /** Default 3; 1 works the single capacitor between the two conductors. */
  phases?: Phases;
  rating: CapacitorRating;
  reactorPct: number;
  reactorQualityFactor?: number;
  /** Bus harmonic voltages, percent of the fundamental branch voltage (branchVoltageV), orders ≥ 2. */
  busHarmonics: readonly SpectrumLine[];
}

export interface DutyQuantity extends LimitCheck {
  /** Above 100 % of rating: IEEE 18 limits are for contingencies, not a design basis. */
  aboveRating: boolean;
}

export interface CapacitorOrderDuty {
  order: number;
  voltagePhaseV: number;
  currentA: number;
}

export interface CapacitorDutyCheck {
  /** Rated voltage across one capacitor of the model: V_r/√3 (wye equivalent), or V_r on single-phase. */
  ratedPhaseV: number;
  /** Q_r/(√3·V_r) three-phase, Q_r/V_r single-phase: the sizing's capacitorCurrentA. */
  ratedCurrentA: number;
  /** Per order across the capacitor (order 1 included). */
  orders: CapacitorOrderDuty[];
  rmsVoltage: DutyQuantity;
  peakVoltage: DutyQuantity;
  rmsCurrent: DutyQuantity;
  reactivePower: DutyQuantity;
  pass: boolean;
  aboveRating: boolean;
}

function quantity(valuePct: number, limitPct: number): DutyQuantity {
  const c = limitCheck(valuePct, limitPct);
  return { valuePct: c.valuePct, limitPct: c.limitPct, marginPct: c.marginPct, pass: c.pass, aboveRating: valuePct > 100 };
}

/** The bus side of a duty check: everything but the harmonic voltages. */
export type CapacitorDutyBasis = Omit<CapacitorDutyInput, "busHarmonics">;

/**
 * Bus harmonic voltages for the duty loop, order and percent per line: orders run 2 to 50, so one buffer serves
 * almost every call (a longer list gets its own).
 */
let scratchOrders = new Float64Array(MAX_HARMONIC_ORDER);
let scratchPcts = new Float64Array(MAX_HARMONIC_ORDER);

function scratchFor(count: number): void {
  if (count <= scratchOrders.length) return;
  scratchOrders = new Float64Array(count);
  scratchPcts = new Float64Array(count);
}

/**
 * Voltage across the capacitor: V_c,1 = V_phase/(1 − p) (fundamental rise with a series reactor) and
 * V_c,h = I_c,h·X_C/h with I_c,h = V_bus,h/|Z_cap(h)|. Peak ratio = Σ V_c,h / V_rated (rms values:
 * every harmonic crest assumed to coincide, worst case, the √2 cancels). Three-phase: per phase of the wye equivalent,
 * kvar = 3·V·I; single-phase: the one capacitor between the conductors, kvar = V·I.
 */
export function capacitorDuty(input: CapacitorDutyInput): CapacitorDutyCheck {
  const lines = input.busHarmonics;
  scratchFor(lines.length);
  for (let i = 0; i < lines.length; i++) {
    scratchOrders[i] = lines[i]!.order;
    scratchPcts[i] = lines[i]!.pct;
  }
  return dutyAt(input, lines.length);
}

/** capacitorDuty with the bus voltages of a bus study (BusDistortion.lines), without copying them into a spectrum. */
export function capacitorDutyOnBus(input: CapacitorDutyBasis, lines: readonly { order: number; voltagePct: number }[]): CapacitorDutyCheck {
  scratchFor(lines.length);
  for (let i = 0; i < lines.length; i++) {
    scratchOrders[i] = lines[i]!.order;
    scratchPcts[i] = lines[i]!.voltagePct;
  }
  return dutyAt(input, lines.length);
}

/** The check over the first `count` lines of the scratch buffers. */
function dutyAt(input: CapacitorDutyBasis, count: number): CapacitorDutyCheck {
  const { rating, voltageV, reactorPct } = input;
  const qc = capacitorKvarAtSystem(rating.ratedKvar, rating.ratedVoltageV, rating.ratedFrequencyHz, voltageV, input.frequencyHz);
  const branch = capacitorBranch(voltageV, qc, reactorPct, input.reactorQualityFactor ?? DEFAULT_REACTOR_QUALITY_FACTOR);
  const xc = branch.capacitorReactanceOhm;
  const xl = branch.reactorReactanceOhm;
  const rr = branch.reactorResistanceOhm;
  const phases = input.phases ?? 3;
  const ratedPhaseV = branchVoltageV(rating.ratedVoltageV, phases);
  const ratedCurrentA = capacitorCurrentA(rating.ratedKvar, rating.ratedVoltageV, phases);
  const busBranchV = branchVoltageV(voltageV, phases);

  // sums over the orders, order 1 first, in the order of the table below
  const vc1 = busBranchV / (1 - reactorPct / 100);
  const i1 = vc1 / xc;
  const orders: CapacitorOrderDuty[] = [{ order: 1, voltagePhaseV: vc1, currentA: i1 }];
  let sumV2 = vc1 ** 2;
  let sumV = vc1;
  let sumI2 = i1 ** 2;
  let sumKvar = (phases * vc1 * i1) / 1000; // 3 capacitors of the wye equivalent, or 1
  for (let i = 0; i < count; i++) {
    const h = scratchOrders[i]!;
    const busPhaseV = (scratchPcts[i]! / 100) * busBranchV;
    // |Z_cap(h)| = |R_r + j·(h·X_L − X_C/h)| (branchImpedance), without a complex value per order; √(r² + x²) rather
    // than Math.hypot, several times slower: ohms of a capacitor branch are far from overflow or underflow
    const x = h * xl - xc / h;
    const currentA = busPhaseV / Math.sqrt(rr * rr + x * x);
    const voltagePhaseV = (currentA * xc) / h;
    orders.push({ order: h, voltagePhaseV, currentA });
    sumV2 += voltagePhaseV ** 2;
    sumV += voltagePhaseV;
    sumI2 += currentA ** 2;
    sumKvar += (phases * voltagePhaseV * currentA) / 1000;
  }
  const rmsVoltage = quantity((Math.sqrt(sumV2) / ratedPhaseV) * 100, IEEE18_LIMITS_PCT.rmsVoltage);
  const peakVoltage = quantity((sumV / ratedPhaseV) * 100, IEEE18_LIMITS_PCT.peakVoltage);
  const rmsCurrent = quantity((Math.sqrt(sumI2) / ratedCurrentA) * 100, IEEE18_LIMITS_PCT.rmsCurrent);
  const reactivePower = quantity((sumKvar / rating.ratedKvar) * 100, IEEE18_LIMITS_PCT.reactivePower);
  return {
    ratedPhaseV,
    ratedCurrentA,
    orders,
    rmsVoltage,
    peakVoltage,
    rmsCurrent,
    reactivePower,
    pass: rmsVoltage.pass && peakVoltage.pass && rmsCurrent.pass && reactivePower.pass,
    aboveRating: rmsVoltage.aboveRating || peakVoltage.aboveRating || rmsCurrent.aboveRating || reactivePower.aboveRating,
  };
}
