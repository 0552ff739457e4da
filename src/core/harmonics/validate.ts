/** Non-throwing validation of a harmonic-study input: every problem as an issue with its path. */
import type { HarmonicStudyInput } from "./study.js";
import { validateScanOptions } from "./scan.js";
import { MAX_SPECTRUM_SUM_PCT, validateSpectrum } from "./spectrum.js";
import type { Issue } from "./study-types.js";

/** A reactor at or beyond half of X_C is no longer a detuning reactor; the model stops making sense. */
const MAX_REACTOR_PCT = 50;

function positive(issues: Issue[], path: string, v: unknown, optional = false): void {
  if (optional && v === undefined) return;
  if (typeof v !== "number" || !Number.isFinite(v) || v <= 0) issues.push({ path, message: "must be a finite number > 0" });
}

function nonNegative(issues: Issue[], path: string, v: unknown, optional = false): void {
  if (optional && v === undefined) return;
  if (typeof v !== "number" || !Number.isFinite(v) || v < 0) issues.push({ path, message: "must be a finite number >= 0" });
}

export function validateHarmonicStudyInput(input: HarmonicStudyInput): Issue[] {
  const issues: Issue[] = [];
  const n = input.network;
  positive(issues, "network.voltageV", n.voltageV);
  positive(issues, "network.frequencyHz", n.frequencyHz);
  positive(issues, "network.shortCircuitKVA", n.shortCircuitKVA);
  positive(issues, "network.xOverR", n.xOverR, true);
  positive(issues, "network.transformerKVA", n.transformerKVA, true);
  nonNegative(issues, "network.linearLoadKW", n.linearLoadKW, true);
  if (n.phases !== undefined && n.phases !== 1 && n.phases !== 3) issues.push({ path: "network.phases", message: "must be 1 or 3" });

  input.sources.forEach((s, i) => {
    const at = `sources[${i}]`;
    nonNegative(issues, `${at}.kVA`, s.kVA);
    if (s.phases !== 1 && s.phases !== 3) issues.push({ path: `${at}.phases`, message: "must be 1 or 3" });
    if (s.currentTHDPct !== undefined && !(Number.isFinite(s.currentTHDPct) && s.currentTHDPct >= 0 && s.currentTHDPct <= MAX_SPECTRUM_SUM_PCT))
      issues.push({ path: `${at}.currentTHDPct`, message: `must be a number from 0 to ${MAX_SPECTRUM_SUM_PCT}` });
    if (s.spectrum) issues.push(...validateSpectrum(s.spectrum, `${at}.spectrum`));
    else if (!s.isDrive) issues.push({ path: `${at}.spectrum`, message: "a source that is not a drive needs a measured spectrum" });
  });
  if (input.backgroundDistortion) issues.push(...validateSpectrum(input.backgroundDistortion, "backgroundDistortion"));

  const names = new Set<string>();
  input.banks.forEach((b, i) => {
    const at = `banks[${i}]`;
    if (typeof b.name !== "string" || b.name.trim() === "") issues.push({ path: `${at}.name`, message: "must be a non-empty name" });
    else if (names.has(b.name)) issues.push({ path: `${at}.name`, message: `bank name "${b.name}" is used twice` });
    else names.add(b.name);
    positive(issues, `${at}.ratedVoltageV`, b.ratedVoltageV);
    positive(issues, `${at}.ratedFrequencyHz`, b.ratedFrequencyHz, true);
    if (typeof b.reactorPct !== "number" || !Number.isFinite(b.reactorPct) || b.reactorPct < 0 || b.reactorPct >= MAX_REACTOR_PCT)
      issues.push({ path: `${at}.reactorPct`, message: `must be a number from 0 up to (not including) ${MAX_REACTOR_PCT}` });
    if (b.steps.length === 0) issues.push({ path: `${at}.steps`, message: "a bank needs at least one step" });
    b.steps.forEach((s, j) => positive(issues, `${at}.steps[${j}].kvar`, s.kvar));
  });

  const o = input.options ?? {};
  issues.push(...validateScanOptions(o.scan, "options.scan"));
  positive(issues, "options.reactorQualityFactor", o.reactorQualityFactor, true);
  if (o.voltageMarginFactor !== undefined && !(Number.isFinite(o.voltageMarginFactor) && o.voltageMarginFactor >= 1))
    issues.push({ path: "options.voltageMarginFactor", message: "must be a finite number >= 1" });
  if (o.combination !== undefined && o.combination !== "arithmetic" && o.combination !== "rss")
    issues.push({ path: "options.combination", message: 'must be "arithmetic" or "rss"' });
  if (o.kvarRounding !== undefined && o.kvarRounding !== "nearest_standard" && o.kvarRounding !== "none")
    issues.push({ path: "options.kvarRounding", message: 'must be "nearest_standard" or "none"' });
  return issues;
}
