/** What a survey's readings cover, and whether they agree with the building's interval data. */
import type { SizingInput, SurveyScope } from "../inputs.js";
import { percentileOf } from "../interval/percentiles.js";
import type { SiteResult } from "../readings/site-totals.js";
import { warning, type Warning } from "../warnings.js";
import type { ScopeResult } from "./size.js";

/** A survey figure more than 10 % outside the interval data's 1st–100th percentile range is suspect (own rule, no source). */
export const INTERVAL_RANGE_MARGIN = 0.1;

export function scopeOf(input: SizingInput, site: SiteResult, kvarRequired: number): { result: ScopeResult; warnings: Warning[] } {
  const scope: SurveyScope = input.scope ?? (input.serviceEntrance ? "whole_site" : "partial");
  const defaulted = input.scope === undefined;
  const warnings: Warning[] = [];
  if (scope === "partial") {
    const n = input.loads.length;
    const note =
      `partial survey: ${n} load${n === 1 ? "" : "s"} read (${site.kW.toFixed(1)} kW, ${site.kvar.toFixed(1)} kvar); ` +
      `the recommendation covers only these loads and the ${kvarRequired.toFixed(1)} kvar they need to reach the target; ` +
      `the rest of the site was not read` +
      (input.intervalDemand ? "; the building's interval data (the whole site) was not used to size this bank" : "") +
      (defaulted ? " (no service-entrance reading was given: set scope to whole_site if these loads are the whole site)" : "");
    warnings.push(warning("partial_survey", note, "scope"));
    return { result: { scope, defaulted, note }, warnings };
  }
  const note = input.intervalDemand
    ? "whole-site survey: the central bank is designed from the building's interval data"
    : "whole-site survey: the bank is designed from these readings";
  if (input.intervalDemand) {
    const outside = [outsideRange("kW", site.kW, input.intervalDemand.kW), outsideRange("kvar", site.kvar, input.intervalDemand.kvar)].filter(
      (s): s is string => s !== null,
    );
    if (outside.length > 0) {
      warnings.push(
        warning(
          "survey_outside_interval_range",
          `the survey's ${outside.join(" and its ")}: check the readings, the CT ratio, or whether the interval data belongs to this service`,
          input.serviceEntrance ? "serviceEntrance" : "loads",
        ),
      );
    }
  }
  return { result: { scope, defaulted, note }, warnings };
}

/** The sentence naming both figures when `value` lies more than 10 % below the 1st or above the 100th percentile. */
function outsideRange(unit: string, value: number, samples: ArrayLike<number>): string | null {
  const values = Float64Array.from(samples);
  if (values.length === 0) return null;
  const low = percentileOf(values, 1);
  const high = percentileOf(values, 100);
  const m = INTERVAL_RANGE_MARGIN;
  if (value < low - m * Math.abs(low))
    return `${value.toFixed(1)} ${unit} is more than 10 % below the interval data's 1st percentile of ${low.toFixed(1)} ${unit}`;
  if (value > high + m * Math.abs(high))
    return `${value.toFixed(1)} ${unit} is more than 10 % above the interval data's maximum of ${high.toFixed(1)} ${unit}`;
  return null;
}
