/**
 * Billing months before and after correction, worked interval by interval from interval data: each load point gets
 * the kvar the bank delivers under the controller rule (bank/controller-rule.ts), the kvar left is its kvar less the
 * fixed part and the switched steps, and the month's lagging and leading kvarh, billed kVA and PF come from the
 * corrected points — never from a month's peaks taken together (its peak kW and peak kVA fall in different intervals).
 */
import { createController } from "../interval/controller.js";
import { intervalPF } from "../interval/analyse.js";
import type { CapacitorBank, LoadPoints } from "../interval/series-types.js";
import type { BillingState } from "./tariff.js";

/** A month of interval data as a stored summary keeps it; the last two are absent from summaries before version 2. */
export interface MonthlyDemand {
  month: string;
  peakKW: number;
  peakKVA: number;
  kWh: number;
  kvarhLagging: number;
  kvarhLeading?: number;
  /** kvar of the interval with the peak kW. */
  peakKWKvar?: number;
  /** The month's own (kW, kvar) load points with their interval counts. */
  loadPoints?: LoadPoints;
}

/** Site-wide (kW, kvar) samples, each one interval long: what older summaries offer in place of a month's points. */
export interface SiteSamples {
  kW: ArrayLike<number>;
  kvar: ArrayLike<number>;
}

export interface IntervalMonths {
  periods: { label: string; before: BillingState; after: BillingState }[];
  /** How the after-correction figures were reached. */
  method: "monthly_load_points" | "site_load_points_scaled";
  note: string;
}

/**
 * Without time order a load point gets the controller's fresh decision; in the series the controller may instead
 * hold a neighbouring level within its dead band. Tests bound the resulting error against the full series
 * (test/core/economics/interval-billing.test.ts).
 */
export const MONTHLY_POINTS_NOTE =
  "estimate from each month's kW × kvar load points (cell means with their durations; time order and the spread " +
  "within a cell are not stored): each point gets the controller's fresh decision, not the level its dead band " +
  "would have held. In tests against full series the kvarh left was within 15 % of the month's lagging kvarh " +
  "before correction, the billed kVA within 10 % and the PF at the peak kW within 0.08";

export const SITE_POINTS_NOTE =
  "estimate: this interval analysis was stored before per-month load points were kept, so each month's kvarh left " +
  "is its kvarh before scaled by the share the site-wide load points keep, and the kvar at the month's peak is taken " +
  "from its peak kW and peak kVA (which may fall in different intervals). Upload the interval data again for month-by-month figures";

/** Before and after billing states of each month, for the bank under the controller rule. */
export function intervalMonths(
  months: MonthlyDemand[],
  bank: CapacitorBank,
  targetPF: number,
  intervalMinutes: number,
  site: SiteSamples,
): IntervalMonths {
  const c = createController(bank, targetPF);
  const leftOf = (kW: number, kvar: number) => kvar - c.fixedKvar - c.freshKvar(kW, kvar);
  const perMonth = months.every((m) => m.loadPoints !== undefined && m.peakKWKvar !== undefined);
  const scale = perMonth ? null : siteShares(site, leftOf);
  const hours = intervalMinutes / 60;
  const periods = months.map((m) => {
    // the kvar at the peak kW: stored since version 2; before, inferred from the month's peaks (an estimate)
    const peakKvar = m.peakKWKvar ?? Math.sqrt(Math.max(0, m.peakKVA ** 2 - m.peakKW ** 2));
    const before: BillingState = {
      peakKW: m.peakKW,
      peakKVA: m.peakKVA,
      peakPF: intervalPF(m.peakKW, peakKvar),
      kWh: m.kWh,
      kvarh: m.kvarhLagging,
      kvarhLeading: m.kvarhLeading ?? 0,
    };
    const peakLeft = leftOf(m.peakKW, peakKvar);
    let lagging = 0,
      leading = 0,
      peakKVA = Math.hypot(m.peakKW, peakLeft);
    if (scale === null) {
      const lp = m.loadPoints as LoadPoints;
      for (let i = 0; i < lp.count.length; i++) {
        const p = lp.kW[i] as number,
          left = leftOf(p, lp.kvar[i] as number),
          h = (lp.count[i] as number) * hours;
        if (left > 0) lagging += left * h;
        else leading -= left * h;
        peakKVA = Math.max(peakKVA, Math.hypot(p, left));
      }
    } else {
      lagging = m.kvarhLagging * scale.laggingKept;
      leading = m.kWh * scale.leadingPerKWh;
      peakKVA = Math.min(m.peakKVA, peakKVA);
    }
    const after: BillingState = {
      peakKW: m.peakKW,
      peakKVA,
      peakPF: intervalPF(m.peakKW, peakLeft),
      kWh: m.kWh,
      kvarh: lagging,
      kvarhLeading: leading,
    };
    return { label: m.month, before, after };
  });
  return perMonth
    ? { periods, method: "monthly_load_points", note: MONTHLY_POINTS_NOTE }
    : { periods, method: "site_load_points_scaled", note: SITE_POINTS_NOTE };
}

/** Share of the site's lagging kvarh the bank leaves, and its leading kvarh per kWh after correction. */
function siteShares(site: SiteSamples, leftOf: (kW: number, kvar: number) => number): { laggingKept: number; leadingPerKWh: number } {
  let lagBefore = 0,
    lagAfter = 0,
    leadAfter = 0,
    kW = 0;
  for (let i = 0; i < site.kW.length; i++) {
    const p = site.kW[i] as number,
      q = site.kvar[i] as number,
      left = leftOf(p, q);
    if (q > 0) lagBefore += q;
    if (left > 0) lagAfter += left;
    else leadAfter -= left;
    kW += p;
  }
  return { laggingKept: lagBefore > 0 ? lagAfter / lagBefore : 1, leadingPerKWh: kW > 0 ? leadAfter / kW : 0 };
}
