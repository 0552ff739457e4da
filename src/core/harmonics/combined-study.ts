/**
 * The harmonic study of installed and new capacitors together: for every combination the controllers can switch
 * (forEachCombination, the same set and cap as the combined resonance screen), the bus with each energised branch
 * in, its THD_v and worst individual order against IEEE Std 519, and each bank's capacitor duty against IEEE Std 18.
 * Resonance stays the combined screen's (closed form over all branches); this study needs no impedance scan, only
 * |Z(h)| at the present orders, so thousands of combinations stay cheap.
 */
import { capacitorBranch, capacitorKvarAtSystem } from "./branch.js";
import { forEachCombination, MAX_COMBINATIONS, type SwitchUnit } from "./combined-stages.js";
import { busDistortion } from "./distortion.js";
import { capacitorDutyOnBus, type CapacitorDutyCheck } from "./duty.js";
import { checkIeee519, type Ieee519Check } from "./limits.js";
import { withBranches } from "./network.js";
import type { StudyContext } from "./stage.js";

/** An installed step as the study sees it: the screen's unit with its bank's nameplate rating. */
export interface RatedSwitchUnit extends SwitchUnit {
  /** The installed bank it belongs to: steps of one bank share a rating and are one capacitor for the duty check. */
  bank: string;
  /** Nameplate kvar at ratedVoltageV and ratedFrequencyHz. */
  nameplateKvar: number;
  ratedVoltageV: number;
  ratedFrequencyHz: number;
}

/** The new bank's cumulative stages with their nameplate rating. */
export interface RatedNewBank {
  name: string;
  reactorPct: number;
  ratedVoltageV: number;
  ratedFrequencyHz: number;
  stages: { nameplateKvar: number; effectiveKvar: number }[];
}

export interface CombinedBankDuty {
  /** Installed bank label, or "new" for the new bank's stage. */
  bank: string;
  /** Nameplate kvar of the bank's energised steps. */
  nameplateKvar: number;
  rmsVoltagePct: number;
  peakVoltagePct: number;
  rmsCurrentPct: number;
  reactivePowerPct: number;
  /** Every quantity within its IEEE 18 limit. */
  pass: boolean;
}

export interface CombinedStageStudy {
  installed: string[];
  /** The new bank's stage switched in with them; 0: none. */
  newStage: number;
  totalKvar: number;
  thdVPct: number;
  worstIndividual: { order: number; pct: number } | null;
  ieee519: Pick<Ieee519Check, "pass"> & { thdLimitPct: number; individualLimitPct: number };
  duty: CombinedBankDuty[];
}

export interface CombinedHarmonics {
  stagesStudied: number;
  truncated: boolean;
  /** The combination with the highest THD_v. */
  worstThdV: CombinedStageStudy | null;
  /** Combinations breaking an IEEE 519 limit or with a capacitor above 100 % of a rating, worst THD_v first (at most 50). */
  flagged: CombinedStageStudy[];
}

/** Most flagged combinations kept in a result; the count and the warnings cover them all. */
export const MAX_FLAGGED = 50;

/**
 * Work one combined study may do, in bank × harmonic-order evaluations summed over its combinations (each costs a
 * bus distortion and one IEEE 18 duty check per energised bank): some 0.05 s on a 2-core machine. With many banks
 * and a full spectrum it studies fewer than MAX_COMBINATIONS and says so (truncated). Own bound, no source.
 */
export const MAX_COMBINED_STUDY_WORK = 60_000;

/** How many combinations fit in MAX_COMBINED_STUDY_WORK: at least 1, at most MAX_COMBINATIONS. */
export function combinationsWithinBudget(bankCount: number, orderCount: number): number {
  const perCombination = Math.max(1, bankCount) * Math.max(1, orderCount);
  return Math.max(1, Math.min(MAX_COMBINATIONS, Math.floor(MAX_COMBINED_STUDY_WORK / perCombination)));
}

const DUTY_KEYS = ["rmsVoltage", "peakVoltage", "rmsCurrent", "reactivePower"] as const;

function dutyOf(bank: string, nameplateKvar: number, d: CapacitorDutyCheck): CombinedBankDuty {
  return {
    bank,
    nameplateKvar,
    rmsVoltagePct: d.rmsVoltage.valuePct,
    peakVoltagePct: d.peakVoltage.valuePct,
    rmsCurrentPct: d.rmsCurrent.valuePct,
    reactivePowerPct: d.reactivePower.valuePct,
    pass: d.pass,
  };
}

/** A capacitor group energised in one combination: one bank's steps in, one rating. */
interface Energised {
  bank: string;
  nameplateKvar: number;
  ratedVoltageV: number;
  ratedFrequencyHz: number;
  reactorPct: number;
}

export function studyCombinedStages(ctx: StudyContext, installed: readonly RatedSwitchUnit[], newBank: RatedNewBank | null): CombinedHarmonics {
  const { voltageV, frequencyHz } = ctx.network;
  const stages = newBank?.stages ?? [];
  const studied: CombinedStageStudy[] = [];
  let worst: CombinedStageStudy | null = null;
  let count = 0;
  const bankCount = new Set(installed.map((u) => u.bank)).size + (newBank ? 1 : 0);
  const max = combinationsWithinBudget(bankCount, ctx.presentOrders.length);
  const { truncated } = forEachCombination(installed, stages.length + 1, max, (on, n) => {
    // New-bank stages alone are the bank's own study (study.ts): here, only what the installed steps change.
    if (on.length === 0) return;
    count++;
    const groups = new Map<string, Energised>();
    for (const u of on) {
      const g = groups.get(u.bank);
      if (g) g.nameplateKvar += u.nameplateKvar;
      else
        groups.set(u.bank, {
          bank: u.bank,
          nameplateKvar: u.nameplateKvar,
          ratedVoltageV: u.ratedVoltageV,
          ratedFrequencyHz: u.ratedFrequencyHz,
          reactorPct: u.reactorFraction * 100,
        });
    }
    const energised = [...groups.values()];
    if (n > 0 && newBank) {
      energised.push({
        bank: "new",
        nameplateKvar: stages[n - 1]!.nameplateKvar,
        ratedVoltageV: newBank.ratedVoltageV,
        ratedFrequencyHz: newBank.ratedFrequencyHz,
        reactorPct: newBank.reactorPct,
      });
    }
    // Each bank is its own branch with its own reactor (a bank's steps share p and voltage: one branch of ΣQ).
    const branches = energised.map((e) =>
      capacitorBranch(
        voltageV,
        capacitorKvarAtSystem(e.nameplateKvar, e.ratedVoltageV, e.ratedFrequencyHz, voltageV, frequencyHz),
        e.reactorPct,
        ctx.reactorQualityFactor,
      ),
    );
    const distortion = busDistortion(withBranches(ctx.model, branches), ctx.currents, ctx.background);
    const check = checkIeee519(distortion, voltageV);
    const duty = energised.map((e) =>
      dutyOf(
        e.bank,
        e.nameplateKvar,
        capacitorDutyOnBus(
          {
            voltageV,
            frequencyHz,
            phases: ctx.model.phases,
            rating: { ratedVoltageV: e.ratedVoltageV, ratedKvar: e.nameplateKvar, ratedFrequencyHz: e.ratedFrequencyHz },
            reactorPct: e.reactorPct,
            reactorQualityFactor: ctx.reactorQualityFactor,
          },
          distortion.lines,
        ),
      ),
    );
    const stage: CombinedStageStudy = {
      installed: on.map((u) => u.label),
      newStage: n,
      totalKvar: on.reduce((s, u) => s + u.effectiveKvar, 0) + (n > 0 ? stages[n - 1]!.effectiveKvar : 0),
      thdVPct: distortion.thdVPct,
      worstIndividual: distortion.worstIndividual,
      ieee519: { pass: check.pass, thdLimitPct: check.limits.thdPct, individualLimitPct: check.limits.individualPct },
      duty,
    };
    if (!worst || stage.thdVPct > worst.thdVPct) worst = stage;
    if (!check.pass || duty.some((d) => DUTY_KEYS.some((k) => d[`${k}Pct`] > 100))) studied.push(stage);
  });
  studied.sort((a, b) => b.thdVPct - a.thdVPct);
  return { stagesStudied: count, truncated, worstThdV: worst, flagged: studied };
}

/** "Old bank step 1 + Old bank step 2 + new stage 1". */
export function combinationLabel(s: Pick<CombinedStageStudy, "installed" | "newStage">): string {
  return [...s.installed, ...(s.newStage > 0 ? [`new stage ${s.newStage}`] : [])].join(" + ");
}
