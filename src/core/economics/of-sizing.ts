import { CONTROLLER_RULE } from "../bank/controller-rule.js";
import { createController } from "../interval/controller.js";
import type { CapacitorBank } from "../interval/series-types.js";
import type { CorrectionResult } from "../correction/to-target.js";
import {
  economics,
  type InstalledCostInput,
  type BillingPeriod,
  type BillingState,
  type EconomicsResult,
  type IntervalMethod,
  type Tariff,
} from "./economics-api.js";
import { intervalMonths, type MonthlyDemand } from "./interval-billing.js";
import type { SiteResult } from "../readings/site-totals.js";
import type { IntervalDemandInput } from "../inputs.js";
import type { RecommendedBank } from "../placement/site-plan.js";
import type { PlacementPlan } from "../placement/placement-types.js";
import type { CostItemInput } from "./cost-items.js";

/** What the electrician tells about the bill and the costs; amounts in `currency` (ISO 4217, no conversion). */
export interface EconomicsSettings {
  currency: string;
  tariff: Tariff;
  /** Hours a month the surveyed demand lasts, for energy-based tariffs without interval data. */
  operatingHoursPerMonth?: number;
  losses?: { lossesPct: number; energyPricePerKWh: number };
  cost?: InstalledCostInput;
}

export type { MonthlyDemand } from "./interval-billing.js";

/** Default operating hours a month when none are stated: two shifts, 22 days (common practice, no source). */
export const DEFAULT_OPERATING_HOURS_PER_MONTH = 352;

/** The recommended bank as the controller sees it (delivered kvar at the system voltage) and as it is priced. */
export interface EconomicsBank {
  installedKvar: number;
  steps: number;
  /** Fixed kvar and switched steps, delivered at the system voltage. */
  controlled: CapacitorBank;
}

/** Interval data the sizing rests on: the months, the interval length and the site-wide samples. */
export interface EconomicsIntervals {
  months: MonthlyDemand[];
  intervalMinutes: number;
  kW: ArrayLike<number>;
  kvar: ArrayLike<number>;
}

/** The bank the economics prices and simulates: its designed steps, delivered kvar at the system voltage. */
export function economicsBankOf(b: Pick<RecommendedBank, "effectiveKvar" | "physicalSteps">): EconomicsBank {
  const fixedKvar = b.physicalSteps.filter((s) => s.role === "fixed").reduce((a, s) => a + s.effectiveKvar, 0);
  const stepsKvar = b.physicalSteps.filter((s) => s.role === "switched").map((s) => s.effectiveKvar);
  return { installedKvar: b.effectiveKvar, steps: b.physicalSteps.length, controlled: { fixedKvar, stepsKvar } };
}

/**
 * The lines the answer proposes to buy: the central bank (the study's detuned design when it proposes one for the
 * recommended bank, with the plain bank shown uncounted beside it), each motor-terminal capacitor load and each group bank.
 */
export function costItemsOf(
  bank: Pick<RecommendedBank, "effectiveKvar" | "physicalSteps" | "reactorPct"> | null,
  placement: PlacementPlan | undefined,
  detuned: {
    forBank: string;
    design: { reactorPct: number; steps: { effectiveKvar: number }[] };
    purchaseSteps?: { effectiveKvar: number }[];
  }[] = [],
): CostItemInput[] {
  const items: CostItemInput[] = [];
  const proposal = detuned.find((p) => p.forBank === "recommended");
  if (bank) {
    const plain: CostItemInput = {
      item: "central_bank",
      label: "central bank",
      kvar: bank.effectiveKvar,
      units: bank.physicalSteps.length,
      reactorPct: bank.reactorPct,
      counted: true,
    };
    if (proposal) {
      // priced as bought: the physical steps at the detuned rating (the study's stage increments when unknown)
      const buy = proposal.purchaseSteps ?? proposal.design.steps;
      const kvar = buy.reduce((s, x) => s + x.effectiveKvar, 0);
      items.push({
        item: "central_bank",
        label: `central bank, ${proposal.design.reactorPct} % detuned (proposed by the harmonic study)`,
        kvar,
        units: buy.length,
        reactorPct: proposal.design.reactorPct,
        counted: true,
      });
      items.push({ ...plain, item: "central_bank_plain", label: "central bank without reactors (for comparison)", counted: false });
    } else items.push(plain);
  }
  for (const l of placement?.loads ?? []) {
    if (l.location !== "terminal" || !l.terminal) continue;
    const units = l.terminal.perMotorKvar > 0 ? Math.round(l.terminal.totalKvar / l.terminal.perMotorKvar) : 1;
    items.push({
      item: "motor_terminal",
      label: `${l.label}: ${units} × ${l.terminal.perMotorKvar} kvar at the motor terminals`,
      kvar: l.terminal.totalKvar,
      units,
      reactorPct: 0,
      counted: true,
    });
  }
  for (const g of placement?.locations ?? []) {
    if (!g.location.startsWith("group:") || g.kvar <= 0) continue;
    items.push({
      item: "group_bank",
      label: `group bank ${g.location.slice("group:".length)}`,
      kvar: g.kvar,
      units: 1,
      reactorPct: 0,
      counted: true,
    });
  }
  return items;
}

/** The interval data of a sizing, when it carries months and their interval length. */
export function economicsIntervalsOf(d: IntervalDemandInput | undefined): EconomicsIntervals | undefined {
  if (!d?.months || d.months.length === 0 || d.intervalMinutes === undefined) return undefined;
  return { months: d.months, intervalMinutes: d.intervalMinutes, kW: d.kW, kvar: d.kvar };
}

function state(kW: number, kvar: number, hours: number): BillingState {
  const kVA = Math.hypot(kW, kvar);
  return {
    peakKW: kW,
    peakKVA: kVA,
    peakPF: kVA > 0 ? kW / kVA : 1,
    kWh: kW * hours,
    kvarh: Math.max(0, kvar) * hours,
    kvarhLeading: Math.max(0, -kvar) * hours,
  };
}

/**
 * Savings and payback of the recommended bank: month by month from interval data when there is any (see
 * interval-billing.ts), else from the survey's demand as one typical month. Either way the bank delivers what the
 * controller rule (bank/controller-rule.ts) switches in, fixed part included.
 */
export function siteEconomics(
  settings: EconomicsSettings,
  site: SiteResult,
  correction: CorrectionResult,
  bank: EconomicsBank | null,
  intervals?: EconomicsIntervals,
  items?: CostItemInput[],
): EconomicsResult {
  const target = correction.targetPF;
  const controlled = bank?.controlled ?? { fixedKvar: 0, stepsKvar: [] };
  const assumptions: string[] = [];
  let periods: BillingPeriod[];
  let basis: "interval_data" | "survey_demand";
  let intervalMethod: IntervalMethod | undefined;
  if (intervals && intervals.months.length > 0) {
    basis = "interval_data";
    const m = intervalMonths(intervals.months, controlled, target, intervals.intervalMinutes, intervals);
    periods = m.periods;
    intervalMethod = { method: m.method, estimate: true, note: m.note };
    assumptions.push(`the bank's kvar in each interval follows the controller rule: ${CONTROLLER_RULE}`, m.note);
  } else {
    basis = "survey_demand";
    const hours = settings.operatingHoursPerMonth ?? DEFAULT_OPERATING_HOURS_PER_MONTH;
    assumptions.push(
      `the surveyed demand (${site.kW.toFixed(1)} kW, PF ${site.displacementPF.toFixed(3)}) stands for the month's billing peak and lasts ${hours} h a month${settings.operatingHoursPerMonth === undefined ? " (default: two shifts, 22 days; state operatingHoursPerMonth)" : ""}; the bank delivers what the controller rule switches in at that demand`,
    );
    const controller = createController(controlled, target);
    const after = site.kvar - controlled.fixedKvar - controller.freshKvar(site.kW, site.kvar);
    // A leading site adds no bank: its saving is the leading excess taken out of service (correction.kvarAfter).
    const afterKvar = bank ? after : correction.action === "remove" ? correction.kvarAfter : site.kvar;
    if (!bank && correction.action === "remove") {
      assumptions.push(
        `the ${correction.leadingExcessKvar.toFixed(1)} kvar of leading excess is taken out of service: no purchase, the saving is the lower demand`,
      );
    }
    periods = [{ label: "typical month", before: state(site.kW, site.kvar, hours), after: state(site.kW, afterKvar, hours) }];
  }
  return economics({
    currency: settings.currency,
    tariff: settings.tariff,
    periods,
    periodsPerYear: 12,
    ...(settings.losses ? { losses: settings.losses } : {}),
    ...(settings.cost ? { cost: settings.cost } : {}),
    ...(bank ? { bank: { installedKvar: bank.installedKvar, steps: bank.steps } } : {}),
    ...(items ? { items } : {}),
    lossReductionFraction: correction.lossReductionPct / 100,
    basis,
    ...(intervalMethod ? { intervalMethod } : {}),
    assumptions,
  });
}
