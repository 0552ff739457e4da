/** Capacitor duty of a stage against the IEEE Std 18 continuous limits. */
import { capacitorBranch, capacitorKvarAtSystem, DEFAULT_REACTOR_QUALITY_FACTOR } from "./branch.js";
import type { Phases } from "../conventions.js";
import { capacitorCurrentA } from "../bank/capacitor.js";
import { branchVoltageV } from "./network.js";
import { limitCheck, type LimitCheck, type SpectrumLine } from "./study-types.js";

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
  return { ...limitCheck(valuePct, limitPct), aboveRating: valuePct > 100 };
}

/**
 * Voltage across the capacitor: V_c,1 = V_phase/(1 − p) (fundamental rise with a series reactor) and
 * V_c,h = I_c,h·X_C/h with I_c,h = V_bus,h/|Z_cap(h)|. Peak ratio = Σ V_c,h / V_rated (rms values:
 * every harmonic crest assumed to coincide, worst case, the √2 cancels). Three-phase: per phase of the wye equivalent,
 * kvar = 3·V·I; single-phase: the one capacitor between the conductors, kvar = V·I.
 */
export function capacitorDuty(input: CapacitorDutyInput): CapacitorDutyCheck {
  const { rating, voltageV, reactorPct } = input;
  const qc = capacitorKvarAtSystem(rating.ratedKvar, rating.ratedVoltageV, rating.ratedFrequencyHz, voltageV, input.frequencyHz);
  const branch = capacitorBranch(voltageV, qc, reactorPct, input.reactorQualityFactor ?? DEFAULT_REACTOR_QUALITY_FACTOR);
  const xc = branch.capacitorReactanceOhm;
  const phases = input.phases ?? 3;
  const ratedPhaseV = branchVoltageV(rating.ratedVoltageV, phases);
  const ratedCurrentA = capacitorCurrentA(rating.ratedKvar, rating.ratedVoltageV, phases);
  const busBranchV = branchVoltageV(voltageV, phases);

  const vc1 = busBranchV / (1 - reactorPct / 100);
  const orders: CapacitorOrderDuty[] = [{ order: 1, voltagePhaseV: vc1, currentA: vc1 / xc }];
  for (const line of input.busHarmonics) {
    const h = line.order;
    const busPhaseV = (line.pct / 100) * busBranchV;
    // |Z_cap(h)| = |R_r + j·(h·X_L − X_C/h)| (branchImpedance), without a complex value per order
    const currentA = busPhaseV / Math.hypot(branch.reactorResistanceOhm, h * branch.reactorReactanceOhm - branch.capacitorReactanceOhm / h);
    orders.push({ order: h, voltagePhaseV: (currentA * xc) / h, currentA });
  }

  let sumV2 = 0;
  let sumV = 0;
  let sumI2 = 0;
  let sumKvar = 0;
  for (const o of orders) {
    sumV2 += o.voltagePhaseV ** 2;
    sumV += o.voltagePhaseV;
    sumI2 += o.currentA ** 2;
    sumKvar += (phases * o.voltagePhaseV * o.currentA) / 1000; // 3 capacitors of the wye equivalent, or 1
  }
  const rmsVoltage = quantity((Math.sqrt(sumV2) / ratedPhaseV) * 100, IEEE18_LIMITS_PCT.rmsVoltage);
  const peakVoltage = quantity((sumV / ratedPhaseV) * 100, IEEE18_LIMITS_PCT.peakVoltage);
  const rmsCurrent = quantity((Math.sqrt(sumI2) / ratedCurrentA) * 100, IEEE18_LIMITS_PCT.rmsCurrent);
  const reactivePower = quantity((sumKvar / rating.ratedKvar) * 100, IEEE18_LIMITS_PCT.reactivePower);
  const all = [rmsVoltage, peakVoltage, rmsCurrent, reactivePower];
  return {
    ratedPhaseV,
    ratedCurrentA,
    orders,
    rmsVoltage,
    peakVoltage,
    rmsCurrent,
    reactivePower,
    pass: all.every((q) => q.pass),
    aboveRating: all.some((q) => q.aboveRating),
  };
}
