import { billingPF } from "../interval/months.js";

/**
 * Utility tariff forms that price reactive power, and the monthly charge each gives for a billing period.
 * The forms are the trade's; their names here are the project's own.
 */

/** A charge per kVA of billing demand (the month's peak kVA). */
export interface KvaDemandTariff {
  form: "kva_demand";
  chargePerKVA: number;
}

/** Which PF a PF-adjusted demand clause compares with its base. */
export type PfBasis = "average" | "at_peak";
export const DEFAULT_PF_BASIS: PfBasis = "average";

/**
 * A kW demand charge raised when PF falls below a base: billed kW = kW·basePF/PF when PF < basePF. The PF is the
 * billing period's average, kWh / √(kWh² + lagging kvarh²), or the PF of the interval with the peak kW; utilities
 * word the clause either way (from memory).
 */
export interface PfAdjustedKwTariff {
  form: "kw_demand_pf_adjusted";
  chargePerKW: number;
  basePF: number;
  /** Default "average". */
  pfBasis?: PfBasis;
}

/** A charge per kvarh above an allowance of ratio·kWh. */
export interface KvarhExcessTariff {
  form: "kvarh_excess";
  chargePerKvarh: number;
  allowanceRatio: number;
}

export interface NoReactiveTariff {
  form: "none";
}

export type Tariff = KvaDemandTariff | PfAdjustedKwTariff | KvarhExcessTariff | NoReactiveTariff;

/** One billing period's demand and energy, for the state before or after correction. */
export interface BillingState {
  /** Billing demand: the period's peak kW. */
  peakKW: number;
  /** Billing demand: the period's peak kVA. */
  peakKVA: number;
  /** Power factor of the interval with the peak kW (the PF-adjusted form's "at_peak" basis). */
  peakPF: number;
  kWh: number;
  /** Lagging kvarh only (leading kvarh is not billed under the usual excess form). */
  kvarh: number;
  /** Leading kvarh, shown apart (billed by none of these forms). */
  kvarhLeading?: number;
}

export interface PeriodCharge {
  /** The quantity the tariff bills (kVA, billed kW or excess kvarh). */
  billedQuantity: number;
  billedUnit: "kVA" | "kW" | "kvarh" | "none";
  /** The reactive-related part of the bill; for demand forms the whole demand charge. */
  charge: number;
  /** The PF the PF-adjusted form compared with its base. */
  pf?: number;
}

/** The tariff as the result echoes it: defaults filled in. */
export function tariffWithDefaults(t: Tariff): Tariff {
  return t.form === "kw_demand_pf_adjusted" ? { ...t, pfBasis: t.pfBasis ?? DEFAULT_PF_BASIS } : { ...t };
}

/** The charge of one billing period under a tariff. */
export function periodCharge(tariff: Tariff, s: BillingState): PeriodCharge {
  switch (tariff.form) {
    case "kva_demand":
      return { billedQuantity: s.peakKVA, billedUnit: "kVA", charge: s.peakKVA * tariff.chargePerKVA };
    case "kw_demand_pf_adjusted": {
      // billed kW = kW·basePF/PF below the base PF (PF-adjusted demand clause)
      const pf = (tariff.pfBasis ?? DEFAULT_PF_BASIS) === "at_peak" ? s.peakPF : billingPF(s.kWh, s.kvarh);
      const billedKW = pf < tariff.basePF && pf > 0 ? (s.peakKW * tariff.basePF) / pf : s.peakKW;
      return { billedQuantity: billedKW, billedUnit: "kW", charge: billedKW * tariff.chargePerKW, pf };
    }
    case "kvarh_excess": {
      const excess = Math.max(0, s.kvarh - tariff.allowanceRatio * s.kWh);
      return { billedQuantity: excess, billedUnit: "kvarh", charge: excess * tariff.chargePerKvarh };
    }
    case "none":
      return { billedQuantity: 0, billedUnit: "none", charge: 0 };
  }
}
