import { priceItems, type CostItem, type CostItemInput } from "./cost-items.js";
import { periodCharge, tariffWithDefaults, type BillingState, type PeriodCharge, type Tariff } from "./tariff.js";

export interface BillingPeriod {
  /** e.g. "2026-03" or "typical month". */
  label: string;
  before: BillingState;
  after: BillingState;
}

export interface LossSavingsInput {
  /** Share of the site's energy lost as I²R in its own cables and transformer, percent (user's estimate). */
  lossesPct: number;
  /** Energy price per kWh, in the tariff's currency. */
  energyPricePerKWh: number;
}

export interface InstalledCostInput {
  perKvar?: number;
  perStep?: number;
  fixed?: number;
  /** Detuning reactors, per kvar of the bank and per step; neither given: reactors are not priced (and said so). */
  reactorPerKvar?: number;
  reactorPerStep?: number;
}

export interface EconomicsInput {
  currency: string;
  tariff: Tariff;
  periods: BillingPeriod[];
  /** How many of the given periods make a year (12 for monthly data covering a year; 12 for one typical month). */
  periodsPerYear: number;
  losses?: LossSavingsInput;
  cost?: InstalledCostInput;
  bank?: { installedKvar: number; steps: number };
  /** What is proposed, one line each; without it the bank alone is priced. */
  items?: CostItemInput[];
  /** Loss reduction fraction 1 − (PF₁/PF₂)² from the correction (0–1). */
  lossReductionFraction?: number;
  basis: "interval_data" | "survey_demand";
  /** With interval data: how the after-correction months were reached, and whether they are an estimate. */
  intervalMethod?: IntervalMethod;
  assumptions?: string[];
}

export interface IntervalMethod {
  method: "monthly_load_points" | "site_load_points_scaled";
  estimate: boolean;
  note: string;
}

/** The period's demand and energy before and after correction (the kvarh left, lagging and leading apart). */
export interface PeriodFigures {
  kWh: number;
  peakKW: number;
  peakKVABefore: number;
  peakKVAAfter: number;
  kvarhLaggingBefore: number;
  kvarhLaggingAfter: number;
  kvarhLeadingBefore: number;
  kvarhLeadingAfter: number;
}

export interface PeriodSavings {
  label: string;
  figures: PeriodFigures;
  before: PeriodCharge;
  after: PeriodCharge;
  tariffSaving: number;
  lossSavingKWh: number;
  lossSaving: number;
  saving: number;
}

export interface EconomicsResult {
  currency: string;
  tariff: Tariff;
  basis: EconomicsInput["basis"];
  intervalMethod?: IntervalMethod;
  periods: PeriodSavings[];
  /** Mean saving per period (a month). */
  savingPerMonth: number;
  savingPerYear: number;
  installedCost: number | null;
  costBreakdown: { perKvar: number; perStep: number; fixed: number } | null;
  /** The priced lines; those with counted = false are options shown for comparison. */
  costItems: CostItem[];
  /** Simple payback = installed cost / yearly saving; null without cost or without a positive saving. */
  simplePaybackYears: number | null;
  assumptions: string[];
}

/**
 * Savings per period and per year, installed cost and simple payback (cost / annual saving).
 * Loss savings: kWh·losses%·(1 - (PF1/PF2)²) (losses scale with I², common practice).
 */
export function economics(input: EconomicsInput): EconomicsResult {
  const assumptions = [...(input.assumptions ?? [])];
  const lossFraction = input.lossReductionFraction ?? 0;
  const periods = input.periods.map((p): PeriodSavings => {
    const before = periodCharge(input.tariff, p.before);
    const after = periodCharge(input.tariff, p.after);
    const lossSavingKWh = input.losses ? p.before.kWh * (input.losses.lossesPct / 100) * lossFraction : 0;
    const lossSaving = input.losses ? lossSavingKWh * input.losses.energyPricePerKWh : 0;
    const tariffSaving = before.charge - after.charge;
    const figures: PeriodFigures = {
      kWh: p.before.kWh,
      peakKW: p.before.peakKW,
      peakKVABefore: p.before.peakKVA,
      peakKVAAfter: p.after.peakKVA,
      kvarhLaggingBefore: p.before.kvarh,
      kvarhLaggingAfter: p.after.kvarh,
      kvarhLeadingBefore: p.before.kvarhLeading ?? 0,
      kvarhLeadingAfter: p.after.kvarhLeading ?? 0,
    };
    return { label: p.label, figures, before, after, tariffSaving, lossSavingKWh, lossSaving, saving: tariffSaving + lossSaving };
  });
  const total = periods.reduce((s, p) => s + p.saving, 0);
  const savingPerMonth = periods.length > 0 ? total / periods.length : 0;
  const savingPerYear = periods.length > 0 ? (total / periods.length) * input.periodsPerYear : 0;
  if (input.losses) {
    assumptions.push(
      `I²R losses taken as ${input.losses.lossesPct} % of energy, reduced by ${(lossFraction * 100).toFixed(1)} % (1 - (PF1/PF2)²), at ${input.losses.energyPricePerKWh} ${input.currency}/kWh`,
    );
  }

  let costBreakdown: EconomicsResult["costBreakdown"] = null;
  let installedCost: number | null = null;
  let costItems: CostItem[] = [];
  if (input.cost && input.items && input.items.some((i) => i.counted)) {
    const priced = priceItems(input.items, input.cost);
    costItems = priced.items;
    const counted = costItems.filter((i) => i.counted);
    costBreakdown = {
      perKvar: counted.reduce((s, i) => s + (input.cost?.perKvar ?? 0) * i.kvar, 0),
      perStep: counted.reduce((s, i) => s + (input.cost?.perStep ?? 0) * i.units, 0),
      fixed: input.cost.fixed ?? 0,
    };
    installedCost = counted.reduce((s, i) => s + i.cost, 0) + costBreakdown.fixed;
    if (priced.reactorsUnpriced)
      assumptions.push(
        "the detuned bank's reactors are not priced (no reactorPerKvar or reactorPerStep given): the installed cost and payback leave them out",
      );
    if (costItems.some((i) => !i.counted))
      assumptions.push("the plain bank is priced for comparison only; the installed cost is that of the detuned bank the harmonic study proposes");
  } else if (input.cost && input.bank) {
    costBreakdown = {
      perKvar: (input.cost.perKvar ?? 0) * input.bank.installedKvar,
      perStep: (input.cost.perStep ?? 0) * input.bank.steps,
      fixed: input.cost.fixed ?? 0,
    };
    installedCost = costBreakdown.perKvar + costBreakdown.perStep + costBreakdown.fixed;
  } else if (input.cost && !input.bank) {
    assumptions.push("no bank is needed, so no installed cost is counted");
  }
  const simplePaybackYears = installedCost !== null && savingPerYear > 0 ? installedCost / savingPerYear : null;
  if (installedCost !== null && savingPerYear <= 0) assumptions.push("the bank saves nothing under this tariff: no payback");
  return {
    currency: input.currency,
    tariff: tariffWithDefaults(input.tariff),
    basis: input.basis,
    ...(input.intervalMethod ? { intervalMethod: { ...input.intervalMethod } } : {}),
    periods,
    savingPerMonth,
    savingPerYear,
    installedCost,
    costBreakdown,
    costItems,
    simplePaybackYears,
    assumptions,
  };
}
