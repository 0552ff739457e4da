/**
 * The installed banks inside a sizing: their step-by-step health, the credit they earn, the warnings that go with
 * them, and the caution on reading a plain bank's current with a true-RMS clamp on a distorted bus.
 */
import { evaluateInstalledBanks, type InstalledBankResult } from "../bank/installed.js";
import type { Caution } from "../cautions/safety-cautions.js";
import { installedCredit, type InstalledCredit } from "../correction/installed-credit.js";
import type { InstalledBankInput, SizingInput } from "../inputs.js";
import type { LoadResult, SiteResult } from "../readings/site-totals.js";
import { ieee18Severity, warning, worstSeverity, type InputIssue, type Severity, type Warning } from "../warnings.js";
import type { BankAnalysis } from "../bank/stages.js";
import { kvarAtVoltage } from "../bank/capacitor.js";
import type { DetunedDesign } from "../harmonics/detuned.js";
import { MAX_COMBINATIONS, screenCombinedStages, type CombinedScreen, type SwitchUnit } from "../harmonics/combined-stages.js";
import {
  combinationLabel,
  MAX_FLAGGED,
  studyCombinedStages,
  type CombinedBankDuty,
  type CombinedHarmonics,
  type CombinedStageStudy,
  type RatedSwitchUnit,
} from "../harmonics/combined-study.js";
import { IEEE18_LIMITS_PCT } from "../harmonics/duty.js";
import type { StudyContext } from "../harmonics/stage.js";

export interface InstalledAssessment {
  banks: InstalledBankResult[];
  credit: InstalledCredit | null;
  /** What the new bank's design must know: kvar to add back to the survey's site reading, and the installed rated kvar. */
  design: { addBackKvar: number; installedKvar: number; automaticStepsKvar: number[] } | null;
  issues: InputIssue[];
  warnings: Warning[];
}

export function assessInstalledBanks(input: SizingInput, site: SiteResult, loads: readonly LoadResult[], targetPF: number): InstalledAssessment {
  const banks = input.installedBanks ?? [];
  const readings = input.bankReadings ?? [];
  if (banks.length === 0 && readings.length === 0) return { banks: [], credit: null, design: null, issues: [], warnings: [] };
  const evaluated = evaluateInstalledBanks(banks, readings, input.system);
  if (evaluated.issues.length > 0) return { banks: [], credit: null, design: null, issues: evaluated.issues, warnings: [] };
  const warnings = [...evaluated.warnings];
  const labels = loads.map((l) => l.label);
  for (const [i, b] of evaluated.banks.entries()) {
    if (b.location === "motor" && b.loadLabel && !labels.includes(b.loadLabel)) {
      warnings.push(
        warning(
          "installed_bank_load_not_read",
          `bank "${b.label}" sits at motor "${b.loadLabel}", which this survey did not read: its kvar is taken as outside the readings`,
          `installedBanks.${i}.loadLabel`,
        ),
      );
    }
  }
  const credit = installedCredit(site, targetPF, evaluated.banks, labels);
  if (credit.repairFirst.length > 0) {
    const list = credit.repairFirst.map((r) => `${r.bank} step ${r.step} (${r.status}, ${r.restoresKvar.toFixed(1)} kvar)`).join(", ");
    warnings.push(
      warning(
        "installed_steps_need_repair",
        `repair before buying new capacitors: ${list}; ${credit.kvarRestoredByRepair.toFixed(1)} kvar restored in all; after repair the installed banks give ${credit.kvarInstalledRated.toFixed(1)} kvar against ${credit.kvarRequiredTotal.toFixed(1)} kvar required, leaving ${credit.kvarAdditional.toFixed(1)} kvar to add`,
        "installedBanks",
      ),
    );
  }
  if (credit.leadingRelief) {
    const r = credit.leadingRelief;
    const steps = r.takeOutOfService.map((s) => (s.control === "fixed" ? `remove fixed bank ${s.bank}` : `${s.bank} step ${s.step}`)).join(", ");
    warnings.push(
      warning(
        "installed_steps_lead",
        `the site leads beyond the target with installed steps energised: take out ${steps} (${r.kvarRemoved.toFixed(1)} kvar); PF after ${r.pfAfter.toFixed(3)} ${r.senseAfter}${r.reachesTarget ? "" : ", still short of the target"}`,
        "bankReadings",
      ),
    );
  }
  return {
    banks: evaluated.banks,
    credit,
    design: {
      addBackKvar: credit.kvarIncludedInReadings,
      installedKvar: credit.kvarInstalledRated,
      // each automatic step's share of its bank's rated kvar at the system voltage and frequency
      automaticStepsKvar: evaluated.banks
        .filter((b) => b.control === "automatic" && b.location === "service")
        .flatMap((b) => b.steps.map((s) => (b.nameplateKvar > 0 ? (b.ratedKvarAtSystem * s.nameplateKvar) / b.nameplateKvar : 0))),
    },
    issues: [],
    warnings,
  };
}

/**
 * Over-reading of a true-RMS clamp on a plain capacitor: its current at order h is h·V_h·ωC, so
 * I_rms/I_1 = √(1 + Σ (h·V_h/V_1)²) (circuit theory; the capacitor's admittance rises with h).
 */
export function clampOverReadPct(lines: readonly { order: number; voltagePct: number }[]): number {
  const sum = lines.reduce((s, l) => s + ((l.order * l.voltagePct) / 100) ** 2, 0);
  return (Math.sqrt(1 + sum) - 1) * 100;
}

/** The clamp caution, when a plain installed step was measured; with the bus's distortion lines when known. */
export function clampCaution(
  banks: readonly InstalledBankResult[],
  lines: readonly { order: number; voltagePct: number }[] | null,
  thdVPct: number | null,
): Caution | null {
  const plainMeasured = banks.filter((b) => b.reactorPct === 0 && b.steps.some((s) => s.measuredCurrentA !== undefined));
  if (plainMeasured.length === 0) return null;
  const by =
    lines && lines.length > 0 && thdVPct !== null
      ? `At this bus's THD_v of ${thdVPct.toFixed(1)} % the reading is about ${clampOverReadPct(lines).toFixed(1)} % above the fundamental, so a step that reads healthy may have lost that much capacitance.`
      : "For example, 5 % of 5th-harmonic voltage makes it read sqrt(1 + (5 × 0.05)²) - 1 = 3.1 % high; give the bus distortion (or drives and the transformer) to have it worked for this site.";
  return {
    code: "clamp_reading_plain_bank",
    title: "True-RMS current readings of a plain bank",
    text: `A plain (not detuned) capacitor draws more current at each harmonic than at the fundamental (its reactance falls as 1/h), so a true-RMS clamp on a distorted bus reads more than the fundamental current the capacitance check assumes (banks: ${plainMeasured.map((b) => b.label).join(", ")}). ${by} Use a meter that shows the fundamental, or read with the drives stopped.`,
    reference: "I_rms/I_1 = sqrt(1 + sum over h of (h·V_h/V_1)²), circuit theory",
  };
}

/** The new bank as the combined screen sees it: cumulative stages with one reactor. */
export interface NewBankStages {
  name: string;
  reactorPct: number;
  ratedVoltageV: number;
  ratedFrequencyHz: number;
  stages: { capacitorKvar: number; effectiveKvar: number; nameplateKvar: number }[];
}

/**
 * Installed steps join the resonance screen: every combination the controllers can switch, installed and new
 * together (src/core/harmonics/combined-stages.ts). When the new bank is (or is proposed) detuned and a plain
 * installed bank shares the bus, say what to do with the plain one.
 */
export function screenWithInstalled(
  banks: readonly InstalledBankResult[],
  newBanks: readonly NewBankStages[],
  shortCircuitKVA: number | null,
  harmonicOrders: readonly number[],
  busVoltageV: number,
): { screens: InstalledScreen[]; warnings: Warning[] } {
  if (banks.length === 0 || shortCircuitKVA === null) return { screens: [], warnings: [] };
  const units: SwitchUnit[] = installedUnitsOf(banks, [], { voltageV: busVoltageV, frequencyHz: 0 });
  const options = newBanks.length > 0 ? newBanks : [{ name: "none", reactorPct: 0, stages: [] }];
  const screens = options.map((nb) => ({
    withNewBank: nb.name,
    ...screenCombinedStages(
      units,
      nb.stages.map((s) => ({ ...s, reactorFraction: nb.reactorPct / 100 })),
      shortCircuitKVA,
      harmonicOrders,
    ),
  }));
  const warnings: Warning[] = [];
  for (const sc of screens) {
    if (sc.hazards.length === 0) continue;
    const first = sc.hazards[0]!;
    warnings.push(
      warning(
        "combined_stage_resonance",
        `${sc.hazards.length}${sc.hazards.length === 50 ? "+" : ""} of ${sc.stagesScreened} switchable combinations of the installed steps${sc.withNewBank === "none" ? "" : ` and the ${sc.withNewBank} bank`} resonate within 10 % of a harmonic the site produces; the smallest: ${first.installed.join(" + ")}${first.newStage > 0 ? ` + new stage ${first.newStage}` : ""} (${first.totalKvar.toFixed(1)} kvar) at order${first.resonanceOrders.length > 1 ? "s" : ""} ${first.resonanceOrders.map((h) => h.toFixed(2)).join(", ")}`,
        "installedBanks",
      ),
    );
  }
  if (screens.some((sc) => sc.truncated)) {
    warnings.push(
      warning(
        "combined_screen_truncated",
        `more switchable combinations exist than the ${MAX_COMBINATIONS} screened: the combined resonance screen is incomplete`,
        "installedBanks",
      ),
    );
  }
  const plain = banks.filter((b) => b.reactorPct === 0);
  const detuned = newBanks.find((nb) => nb.reactorPct > 0);
  if (plain.length > 0 && detuned) {
    const p = detuned.reactorPct / 100;
    const screen = screens.find((s) => s.withNewBank === detuned.name);
    const mixed = screen?.hazards.find((hz) => hz.newStage > 0);
    warnings.push(
      warning(
        "plain_bank_beside_detuned",
        `the ${detuned.name} bank is detuned (${detuned.reactorPct} %) but installed bank${plain.length > 1 ? "s" : ""} ${plain.map((b) => b.label).join(", ")} ${plain.length > 1 ? "are" : "is"} plain on the same bus: a plain capacitor in parallel with a detuned one resonates above the tuning order${mixed ? ` (here at order ${mixed.resonanceOrders.map((h) => h.toFixed(2)).join(", ")})` : ""}. Rebuild it detuned (${detuned.reactorPct} % reactors, capacitors rated at least ${(busVoltageV / (1 - p)).toFixed(0)} V plus margin) or take it out of service when the new bank is energised`,
        "installedBanks",
      ),
    );
  }
  return { screens, warnings };
}

export type InstalledScreen = CombinedScreen & { withNewBank: string; harmonics?: CombinedHarmonics };

/**
 * Every installed step as a switchable unit: a fixed bank at the service is always in; a motor's or a group's
 * bank switches with its load. Nameplate ratings come from the bank's input (matched by label).
 */
export function installedUnitsOf(
  banks: readonly InstalledBankResult[],
  inputs: readonly InstalledBankInput[],
  system: { voltageV: number; frequencyHz: number },
): RatedSwitchUnit[] {
  return banks.flatMap((b) => {
    const rating = inputs.find((i) => i.label === b.label);
    return b.steps.map((s) => ({
      label: b.steps.length > 1 ? `${b.label} step ${s.step}` : b.label,
      bank: b.label,
      capacitorKvar: s.ratedKvarAtSystem * (1 - b.reactorPct / 100),
      reactorFraction: b.reactorPct / 100,
      effectiveKvar: s.ratedKvarAtSystem,
      fixed: b.control === "fixed" && b.location === "service",
      nameplateKvar: s.nameplateKvar,
      ratedVoltageV: rating?.ratedVoltageV ?? system.voltageV,
      ratedFrequencyHz: rating?.ratedFrequencyHz ?? system.frequencyHz,
    }));
  });
}

const SUBJECTS_LISTED = 20;
const pct1 = (x: number): string => x.toFixed(1);

/**
 * The harmonic study of the combined stages, one per new-bank option of the screens (studyCombinedStages), and
 * its findings one warning per concern: THD_v over the IEEE 519 limit, an individual order over it, and each
 * bank's capacitor duty (IEEE 18) in the combinations. Each warning names the worst combination and how many break it.
 */
export function studyWithInstalled(
  ctx: StudyContext,
  banks: readonly InstalledBankResult[],
  inputs: readonly InstalledBankInput[],
  newBanks: readonly NewBankStages[],
  screens: readonly InstalledScreen[],
): { screens: InstalledScreen[]; warnings: Warning[] } {
  const units = installedUnitsOf(banks, inputs, ctx.network);
  const warnings: Warning[] = [];
  const out = screens.map((sc) => {
    const nb = newBanks.find((b) => b.name === sc.withNewBank) ?? null;
    const study = studyCombinedStages(ctx, units, nb);
    const withWhat = nb ? `the installed steps and the ${nb.name} bank together` : "the installed steps together";
    const subjects = (list: readonly CombinedStageStudy[]) => list.slice(0, SUBJECTS_LISTED).map(combinationLabel);
    const thd = study.flagged.filter((st) => st.thdVPct > st.ieee519.thdLimitPct);
    if (thd.length > 0) {
      const w = thd[0]!;
      warnings.push(
        warning(
          "combined_stage_thd_v_exceeds_limit",
          `with ${withWhat}, ${thd.length} of ${study.stagesStudied} switchable combinations exceed the IEEE 519 THD_v limit of ${pct1(w.ieee519.thdLimitPct)} %; the worst: ${combinationLabel(w)} at ${pct1(w.thdVPct)} %`,
          "installedBanks",
          { severity: "error", subjects: subjects(thd) },
        ),
      );
    }
    const indiv = study.flagged.filter((st) => st.worstIndividual !== null && st.worstIndividual.pct > st.ieee519.individualLimitPct);
    if (indiv.length > 0) {
      const w = indiv.reduce((a, b) => (b.worstIndividual!.pct > a.worstIndividual!.pct ? b : a));
      const orders = [...new Set(indiv.map((st) => st.worstIndividual!.order))].sort((a, b) => a - b);
      warnings.push(
        warning(
          "combined_stage_harmonic_exceeds_limit",
          `with ${withWhat}, ${indiv.length} of ${study.stagesStudied} switchable combinations exceed the IEEE 519 individual limit of ${pct1(w.ieee519.individualLimitPct)} % (order${orders.length > 1 ? "s" : ""} ${orders.join(", ")}); the worst: order ${w.worstIndividual!.order} at ${pct1(w.worstIndividual!.pct)} % with ${combinationLabel(w)}`,
          "installedBanks",
          { severity: "error", subjects: subjects(indiv) },
        ),
      );
    }
    warnings.push(...dutyWarnings(study.flagged, withWhat, nb?.name ?? null, study.stagesStudied));
    if (study.truncated) {
      warnings.push(
        warning(
          "combined_study_truncated",
          `with ${withWhat}, only the first ${study.stagesStudied} switchable combinations were studied for THD_v and capacitor duty (the study's work bound): the combined study is incomplete`,
          "installedBanks",
        ),
      );
    }
    const harmonics: CombinedHarmonics = { ...study, flagged: study.flagged.slice(0, MAX_FLAGGED) };
    return { ...sc, harmonics };
  });
  return { screens: out, warnings };
}

const DUTY_PARTS: readonly [keyof Omit<CombinedBankDuty, "bank" | "nameplateKvar" | "pass">, keyof typeof IEEE18_LIMITS_PCT, string][] = [
  ["rmsVoltagePct", "rmsVoltage", "rms voltage"],
  ["peakVoltagePct", "peakVoltage", "peak voltage"],
  ["rmsCurrentPct", "rmsCurrent", "rms current"],
  ["reactivePowerPct", "reactivePower", "kvar"],
];

/** One warning per bank: each quantity above 100 % of rating in any combination, at its worst combination. */
function dutyWarnings(flagged: readonly CombinedStageStudy[], withWhat: string, newBankName: string | null, studied: number): Warning[] {
  const bankNames = [...new Set(flagged.flatMap((st) => st.duty.map((d) => d.bank)))];
  const out: Warning[] = [];
  for (const bank of bankNames) {
    const parts: string[] = [];
    const severities: Severity[] = [];
    const over = new Set<CombinedStageStudy>();
    for (const [key, limitKey, label] of DUTY_PARTS) {
      const rows = flagged.flatMap((st) => st.duty.filter((d) => d.bank === bank && d[key] > 100).map((d) => ({ st, value: d[key] })));
      if (rows.length === 0) continue;
      const worst = rows.reduce((a, b) => (b.value > a.value ? b : a));
      const limit = IEEE18_LIMITS_PCT[limitKey];
      severities.push(ieee18Severity(worst.value, limit) ?? "info");
      rows.forEach((r) => over.add(r.st));
      parts.push(`${label} ${pct1(worst.value)} % of rating (IEEE 18 limit ${limit} %) with ${combinationLabel(worst.st)}`);
    }
    if (parts.length === 0) continue;
    const severity = worstSeverity(severities);
    const who = bank === "new" ? `the ${newBankName ?? "new"} bank` : `installed bank "${bank}"`;
    out.push(
      warning(
        "combined_stage_capacitor_duty",
        `${who}, with ${withWhat}: capacitor ${parts.join("; ")}; ${over.size} of ${studied} combinations above 100 %${severity === "error" ? ": above the IEEE 18 limit, not fit for this bus as switched" : " (IEEE 18 limits are for contingencies, not a design basis)"}`,
        bank === "new" ? (newBankName === "recommended" ? "recommendedBank" : "harmonics.proposals") : "installedBanks",
        { severity, subjects: [...over].slice(0, SUBJECTS_LISTED).map(combinationLabel) },
      ),
    );
  }
  return out;
}

/** The recommended bank's stages, and the study's detuned proposal for it when there is one. */
export function newBanksOf(
  recommended: Pick<BankAnalysis, "reactorPct" | "stages" | "ratedVoltageV" | "ratedFrequencyHz"> | null,
  proposals: readonly { forBank: string; design: DetunedDesign }[],
  voltageV: number,
): NewBankStages[] {
  const out: NewBankStages[] = [];
  if (recommended) {
    out.push({
      name: "recommended",
      reactorPct: recommended.reactorPct,
      ratedVoltageV: recommended.ratedVoltageV,
      ratedFrequencyHz: recommended.ratedFrequencyHz,
      stages: recommended.stages.map((s) => ({
        capacitorKvar: s.cumulativeCapacitorKvar,
        effectiveKvar: s.cumulativeKvar,
        nameplateKvar: s.cumulativeNameplateKvar,
      })),
    });
  }
  const proposal = proposals.find((p) => p.forBank === "recommended");
  if (proposal) {
    const d = proposal.design;
    let capacitorKvar = 0;
    let effectiveKvar = 0;
    let nameplateKvar = 0;
    const stages = d.steps.map((s) => {
      // Q_C at the bus from the nameplate: Q_r·(V/V_r)² (IEEE Std 18 rating basis; same frequency)
      capacitorKvar += kvarAtVoltage(s.nameplateKvar, voltageV, d.ratedVoltageV);
      effectiveKvar += s.effectiveKvar;
      nameplateKvar += s.nameplateKvar;
      return { capacitorKvar, effectiveKvar, nameplateKvar };
    });
    out.push({ name: "proposed detuned", reactorPct: d.reactorPct, ratedVoltageV: d.ratedVoltageV, ratedFrequencyHz: d.ratedFrequencyHz, stages });
  }
  return out;
}
