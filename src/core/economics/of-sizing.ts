import { tanPhi } from "../conventions.js";
import type { CorrectionResult } from "../correction/to-target.js";
import { economics, type BillingPeriod, type BillingState, type EconomicsResult, type Tariff } from "./index.js";
import type { SiteResult } from "../readings/site-totals.js";

/** What the electrician tells about the bill and the costs; amounts in `currency` (ISO 4217, no conversion). */
export interface EconomicsSettings {
  currency: string;
  tariff: Tariff;
  /** Hours a month the surveyed demand lasts, for energy-based tariffs without interval data. */
  operatingHoursPerMonth?: number;
  losses?: { lossesPct: number; energyPricePerKWh: number };
  cost?: { perKvar?: number; perStep?: number; fixed?: number };
}

/** A month of interval data, as an interval summary keeps it. */
export interface MonthlyDemand {
  month: string;
  peakKW: number;
  peakKVA: number;
  kWh: number;
  kvarhLagging: number;
}

/** Default operating hours a month when none are stated: two shifts, 22 days (common practice, no source). */
export const DEFAULT_OPERATING_HOURS_PER_MONTH = 352;

/**
 * The bank's effect on one demand point: the controller switches in what it needs to reach the target,
 * as far as the installed kvar reaches; a point already at or above the target is left alone.
 */
export function correctedKvar(kW: number, kvar: number, targetPF: number, bankKvar: number): number {
  const allowed = kW * tanPhi(targetPF);
  if (kvar <= allowed) return kvar;
  return Math.max(allowed, kvar - bankKvar);
}

function state(kW: number, kvar: number, hours: number): BillingState {
  const kVA = Math.hypot(kW, kvar);
  return { peakKW: kW, peakKVA: kVA, peakPF: kVA > 0 ? kW / kVA : 1, kWh: kW * hours, kvarh: Math.max(0, kvar) * hours };
}

/** Savings and payback of the recommended bank, from interval months when there are any, else from the survey's demand. */
export function siteEconomics(
  settings: EconomicsSettings,
  site: SiteResult,
  correction: CorrectionResult,
  bank: { installedKvar: number; steps: number } | null,
  months: MonthlyDemand[] = [],
): EconomicsResult {
  const bankKvar = bank?.installedKvar ?? 0;
  const target = correction.targetPF;
  const assumptions: string[] = [];
  let periods: BillingPeriod[];
  let basis: "interval_data" | "survey_demand";
  if (months.length > 0) {
    basis = "interval_data";
    assumptions.push(
      "each month's peak is corrected to the target as far as the bank reaches (the peak's kvar from its kW and kVA); kvarh after correction scale with the peak's kvar reduction",
    );
    periods = months.map((m) => {
      const peakKvar = Math.sqrt(Math.max(0, m.peakKVA ** 2 - m.peakKW ** 2));
      const afterKvar = correctedKvar(m.peakKW, peakKvar, target, bankKvar);
      const before: BillingState = { peakKW: m.peakKW, peakKVA: m.peakKVA, peakPF: m.peakKVA > 0 ? m.peakKW / m.peakKVA : 1, kWh: m.kWh, kvarh: m.kvarhLagging };
      const afterKVA = Math.hypot(m.peakKW, afterKvar);
      const share = peakKvar > 0 ? afterKvar / peakKvar : 1;
      return {
        label: m.month,
        before,
        after: { peakKW: m.peakKW, peakKVA: afterKVA, peakPF: afterKVA > 0 ? m.peakKW / afterKVA : 1, kWh: m.kWh, kvarh: m.kvarhLagging * share },
      };
    });
  } else {
    basis = "survey_demand";
    const hours = settings.operatingHoursPerMonth ?? DEFAULT_OPERATING_HOURS_PER_MONTH;
    assumptions.push(
      `the surveyed demand (${site.kW.toFixed(1)} kW, PF ${site.displacementPF.toFixed(3)}) stands for the month's billing peak and lasts ${hours} h a month${settings.operatingHoursPerMonth === undefined ? " (default: two shifts, 22 days; state operatingHoursPerMonth)" : ""}`,
    );
    const after = correctedKvar(site.kW, site.kvar, target, bankKvar);
    periods = [{ label: "typical month", before: state(site.kW, site.kvar, hours), after: state(site.kW, after, hours) }];
  }
  return economics({
    currency: settings.currency,
    tariff: settings.tariff,
    periods,
    periodsPerYear: 12,
    ...(settings.losses ? { losses: settings.losses } : {}),
    ...(settings.cost ? { cost: settings.cost } : {}),
    ...(bank ? { bank } : {}),
    lossReductionFraction: correction.lossReductionPct / 100,
    basis,
    assumptions,
  });
}
