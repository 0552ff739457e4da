import { analyseBank, type BankAnalysis } from "../bank/stages.js";
import { cautionsFor, type Caution } from "../cautions/safety-cautions.js";
import { correctionFor, type CorrectionResult } from "../correction/to-target.js";
import { DEFAULT_TARGET_PF, type SizingInput, type SurveyScope } from "../inputs.js";
import { scopeOf } from "./scope.js";
import { designSiteCorrection, type RecommendedBank } from "../placement/site-plan.js";
import type { PlacementPlan } from "../placement/placement-types.js";
import { harmonicOrdersPresent, NONLINEAR_STUDY_SHARE, voltageRisePct } from "../harmonics/resonance.js";
import { shortCircuitAtBus } from "../harmonics/short-circuit.js";
import { costItemsOf, economicsBankOf, economicsIntervalsOf, siteEconomics } from "../economics/of-sizing.js";
import type { EconomicsResult } from "../economics/economics-api.js";
import { compactStudy, studySiteHarmonics, withoutScreenVoltageRepeats, type SizingHarmonics } from "../harmonics/site-study.js";
import type { HarmonicStudyOptions, HarmonicStudyResult } from "../harmonics/harmonics-api.js";
import { evaluateSite, type LoadResult, type SiteResult } from "../readings/site-totals.js";
import { ENGINE_VERSION } from "./engine-version.js";
import { assessInstalledBanks, clampCaution, newBanksOf, screenWithInstalled, studyWithInstalled, type InstalledScreen } from "./installed-banks.js";
import type { InstalledBankResult } from "../bank/installed.js";
import type { InstalledCredit } from "../correction/installed-credit.js";
import { warning, type InputIssue, type Warning } from "../warnings.js";

export type { RecommendedBank };

export interface ResonanceSummary {
  shortCircuitKVA: number;
  transformerShortCircuitKVA: number | null;
  utilityShortCircuitKVA: number | null;
  harmonicOrdersPresent: number[];
  /** kVA of drive loads (the nonlinear load the screen counts). */
  nonlinearKVA: number;
  nonlinearSharePct: number | null;
  /** True when the nonlinear share calls for a study or the study changed the design (a detuned proposal). */
  harmonicStudyAdvised: boolean;
  /** Why the study is advised, in plain words; empty when it is not. */
  harmonicStudyReasons: string[];
  /** Voltage rise when the whole recommended bank switches in, percent. */
  recommendedBankVoltageRisePct: number | null;
  proposedBankVoltageRisePct: number | null;
}

/** What the readings cover, as used: the request's `scope`, or its default. */
export interface ScopeResult {
  scope: SurveyScope;
  /** True when the request gave no scope and the default was applied. */
  defaulted: boolean;
  /** One sentence on what the recommendation covers. */
  note: string;
}

export interface SizingResult {
  engineVersion: string;
  system: SizingInput["system"];
  scope: ScopeResult;
  loads: LoadResult[];
  site: SiteResult;
  /** With installed banks, also their credit: kvarInstalledInService, kvarRequiredTotal, kvarAdditional, repairFirst… */
  correction: CorrectionResult & Partial<InstalledCredit>;
  /** Installed banks step by step: expected and measured current, capacitance, status. */
  installedBanks?: InstalledBankResult[];
  /** Resonance of every combination of installed and new steps (one screen per new-bank option). */
  combinedStages?: InstalledScreen[];
  /** Where the correction goes: motor terminals, group banks, the central bank. */
  placement?: PlacementPlan;
  recommendedBank: RecommendedBank | null;
  proposedBank?: BankAnalysis;
  resonance?: ResonanceSummary;
  /** Savings and payback of the recommended bank, when a tariff was given. */
  economics?: EconomicsResult;
  /** The harmonic study's figures, whenever the site has harmonic sources and the source strength is known. */
  harmonics?: SizingHarmonics;
  warnings: Warning[];
  cautions: Caution[];
}

export type SizingOutcome =
  | { ok: true; result: SizingResult; /** the full harmonic study, for the scan endpoint */ study?: HarmonicStudyResult }
  | { ok: false; issues: InputIssue[] };

/** The whole stateless sizing: readings → triangles → site → correction → banks → resonance screen → cautions. */
export interface SizingOptions {
  harmonics?: HarmonicStudyOptions;
  /** Run the harmonic study even without harmonic sources (the scan endpoint wants the impedance scan). */
  forceHarmonicStudy?: boolean;
}

export function size(input: SizingInput, options: SizingOptions = {}): SizingOutcome {
  const { system } = input;
  const siteOutcome = evaluateSite(system, input.loads, input.serviceEntrance, input.transformer?.kVA);
  if (siteOutcome.issues.length > 0 || !siteOutcome.site) return { ok: false, issues: siteOutcome.issues };
  const { site, loads } = siteOutcome;
  const warnings: Warning[] = [...siteOutcome.warnings];

  const targetPF = input.targetPF ?? DEFAULT_TARGET_PF;
  const { correction, warnings: corrWarnings } = correctionFor(site, targetPF, system.voltageV, system.phases);
  warnings.push(...corrWarnings);
  const installed = assessInstalledBanks(input, site, loads, targetPF);
  if (installed.issues.length > 0) return { ok: false, issues: installed.issues };
  warnings.push(...installed.warnings);

  const sc = shortCircuitAtBus(input.transformer, input.utility);
  const orders = harmonicOrdersPresent(input.loads, input.harmonicSources);
  const sourceCtx = { shortCircuitKVA: sc?.shortCircuitKVA ?? null, harmonicOrders: orders };

  const scope = scopeOf(input, site, correction.kvarRequired);
  warnings.push(...scope.warnings);
  const siteInput = scope.result.scope === "whole_site" ? input : withoutIntervalDemand(input);

  const designed = designSiteCorrection(siteInput, loads, site, correction, sourceCtx, installed.design ?? undefined);
  if (designed.issues.length > 0) return { ok: false, issues: designed.issues };
  warnings.push(...designed.warnings);
  const recommendedBank = designed.recommendedBank;

  let proposedBank: BankAnalysis | undefined;
  if (input.proposedBank) {
    const { analysis, warnings: w } = analyseBank(input.proposedBank, system, sourceCtx, "proposedBank");
    warnings.push(...w);
    proposedBank = analysis;
    if (analysis.effectiveKvar > site.kvar && site.kvar >= 0) {
      warnings.push(
        warning(
          "proposed_bank_leads",
          `the proposed bank delivers ${analysis.effectiveKvar.toFixed(1)} kvar, more than the site's ${site.kvar.toFixed(1)} kvar: fully switched in at this load the site would lead`,
          "proposedBank",
        ),
      );
    }
  }

  const nonlinearKVA = loads.filter((l) => l.kind === "drive").reduce((s, l) => s + (l.measuredKVA ?? l.kVA), 0);
  let resonance: ResonanceSummary | undefined;
  if (sc) {
    const share = input.transformer ? nonlinearKVA / input.transformer.kVA : null;
    const advised = share !== null && share > NONLINEAR_STUDY_SHARE;
    if (advised) {
      warnings.push(
        warning(
          "harmonic_study_advised",
          `nonlinear (drive) load is ${((share as number) * 100).toFixed(0)} % of the transformer kVA, above 15 % (makers' rule of thumb): a harmonic study and a detuned bank are advised`,
        ),
      );
    }
    resonance = {
      ...sc,
      harmonicOrdersPresent: orders,
      nonlinearKVA,
      nonlinearSharePct: share === null ? null : share * 100,
      harmonicStudyAdvised: advised,
      harmonicStudyReasons: advised
        ? [
            `nonlinear (drive) load is ${((share as number) * 100).toFixed(0)} % of the transformer kVA, above ${NONLINEAR_STUDY_SHARE * 100} % (makers' rule of thumb)`,
          ]
        : [],
      recommendedBankVoltageRisePct: recommendedBank ? voltageRisePct(recommendedBank.effectiveKvar, sc.shortCircuitKVA) : null,
      proposedBankVoltageRisePct: proposedBank ? voltageRisePct(proposedBank.effectiveKvar, sc.shortCircuitKVA) : null,
    };
  } else if (orders.length > 0 && (recommendedBank || proposedBank)) {
    warnings.push(
      warning(
        "resonance_not_screened",
        "the site has harmonic sources but no transformer or utility data was given, so resonance could not be screened: add the transformer's kVA and impedance",
        "transformer",
      ),
    );
  }

  const h = studySiteHarmonics(
    input,
    loads,
    sc?.shortCircuitKVA ?? null,
    {
      recommended: recommendedBank ? { ...recommendedBank, steps: designed.screenSteps } : null,
      proposed: proposedBank,
      installed: input.installedBanks ?? [],
    },
    options.harmonics,
    options.forceHarmonicStudy,
  );
  if (h.issues.length > 0) return { ok: false, issues: h.issues };
  warnings.splice(0, warnings.length, ...withoutScreenVoltageRepeats(warnings, h.warnings), ...h.warnings);
  // The study changed the design: then it is advised whatever the nonlinear share, and the result says why.
  if (resonance && h.study && h.study.proposals.length > 0) {
    resonance.harmonicStudyAdvised = true;
    for (const p of h.study.proposals)
      resonance.harmonicStudyReasons.push(`the study proposes a ${p.design.reactorPct} % detuned ${p.forBank} bank (${p.triggeredBy.join(", ")})`);
  }

  const econ = input.economics
    ? siteEconomics(
        input.economics,
        site,
        correction,
        recommendedBank ? economicsBankOf(recommendedBank) : null,
        economicsIntervalsOf(siteInput.intervalDemand),
        costItemsOf(recommendedBank, designed.placement, h.study?.proposals),
      )
    : undefined;

  const newBanks = newBanksOf(recommendedBank, h.study?.proposals ?? [], system.voltageV);
  const screened = screenWithInstalled(installed.banks, newBanks, sc?.shortCircuitKVA ?? null, orders, system.voltageV);
  warnings.push(...screened.warnings);
  // Where the bus has a harmonic study, the same combinations are studied for THD_v and capacitor duty.
  const combined =
    h.context && screened.screens.length > 0
      ? studyWithInstalled(h.context, installed.banks, input.installedBanks ?? [], newBanks, screened.screens)
      : { screens: screened.screens, warnings: [] };
  warnings.push(...combined.warnings);
  const clamp = clampCaution(
    installed.banks,
    h.study ? h.study.withoutCapacitors.distortion.lines : null,
    h.study ? h.study.withoutCapacitors.distortion.thdVPct : null,
  );
  return {
    ok: true,
    result: {
      engineVersion: ENGINE_VERSION,
      system: { ...system },
      scope: scope.result,
      loads,
      site,
      correction: installed.credit ? { ...correction, ...installed.credit } : correction,
      ...(installed.credit ? { installedBanks: installed.banks } : {}),
      ...(combined.screens.length > 0 ? { combinedStages: combined.screens } : {}),
      ...(designed.placement ? { placement: designed.placement } : {}),
      recommendedBank,
      ...(proposedBank ? { proposedBank } : {}),
      ...(resonance ? { resonance } : {}),
      ...(h.study ? { harmonics: compactStudy(h.study) } : {}),
      ...(econ ? { economics: econ } : {}),
      warnings,
      cautions: clamp ? [...cautionsFor(), clamp] : cautionsFor(),
    },
    ...(h.study ? { study: h.study } : {}),
  };
}

/** A partial survey's bank rests on its own readings: the building's interval data describes the whole site. */
function withoutIntervalDemand(input: SizingInput): SizingInput {
  const { intervalDemand: _whole, ...rest } = input;
  return rest;
}
