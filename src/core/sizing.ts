import { analyseBank, type BankAnalysis } from "./bank.js";
import { cautionsFor, type Caution } from "./cautions.js";
import { correctionFor, type CorrectionResult } from "./correction.js";
import { DEFAULT_TARGET_PF, type SizingInput } from "./inputs.js";
import { recommendBank, type BankArrangement } from "./recommend.js";
import {
  harmonicOrdersPresent,
  NONLINEAR_STUDY_SHARE,
  voltageRisePct,
} from "./resonance.js";
import { shortCircuitAtBus } from "./short-circuit.js";
import { studySiteHarmonics } from "./site-harmonics.js";
import type { HarmonicStudyOptions, HarmonicStudyResult } from "./harmonics/index.js";
import { evaluateSite, type LoadResult, type SiteResult } from "./site.js";
import { ENGINE_VERSION } from "./version.js";
import { warning, type InputIssue, type Warning } from "./warnings.js";

export interface RecommendedBank extends BankAnalysis {
  arrangement: BankArrangement;
  reason: string;
  belowTarget: boolean;
}

export interface ResonanceSummary {
  shortCircuitKVA: number;
  transformerShortCircuitKVA: number | null;
  utilityShortCircuitKVA: number | null;
  harmonicOrdersPresent: number[];
  /** kVA of drive loads (the nonlinear load the screen counts). */
  nonlinearKVA: number;
  nonlinearSharePct: number | null;
  harmonicStudyAdvised: boolean;
  /** Voltage rise when the whole recommended bank switches in, percent. */
  recommendedBankVoltageRisePct: number | null;
  proposedBankVoltageRisePct: number | null;
}

export interface SizingResult {
  engineVersion: string;
  system: SizingInput["system"];
  loads: LoadResult[];
  site: SiteResult;
  correction: CorrectionResult;
  recommendedBank: RecommendedBank | null;
  proposedBank?: BankAnalysis;
  resonance?: ResonanceSummary;
  /** The harmonic study's figures, whenever the site has harmonic sources and the source strength is known. */
  harmonics?: HarmonicStudyResult;
  warnings: Warning[];
  cautions: Caution[];
}

export type SizingOutcome = { ok: true; result: SizingResult } | { ok: false; issues: InputIssue[] };

/** The whole stateless sizing: readings → triangles → site → correction → banks → resonance screen → cautions. */
export interface SizingOptions {
  harmonics?: HarmonicStudyOptions;
  /** Run the harmonic study even without harmonic sources (the scan endpoint wants the impedance scan). */
  forceHarmonicStudy?: boolean;
}

export function size(input: SizingInput, options: SizingOptions = {}): SizingOutcome {
  const { system } = input;
  const siteOutcome = evaluateSite(system, input.loads, input.serviceEntrance);
  if (siteOutcome.issues.length > 0 || !siteOutcome.site) return { ok: false, issues: siteOutcome.issues };
  const { site, loads } = siteOutcome;
  const warnings: Warning[] = [...siteOutcome.warnings];

  const targetPF = input.targetPF ?? DEFAULT_TARGET_PF;
  const { correction, warnings: corrWarnings } = correctionFor(site, targetPF, system.voltageV, system.phases);
  warnings.push(...corrWarnings);

  const sc = shortCircuitAtBus(input.transformer, input.utility);
  const orders = harmonicOrdersPresent(input.loads, input.harmonicSources);
  const sourceCtx = { shortCircuitKVA: sc?.shortCircuitKVA ?? null, harmonicOrders: orders };

  let recommendedBank: RecommendedBank | null = null;
  const choice = recommendBank(correction.kvarRequired, site, system, input.transformer);
  if (choice) {
    const { analysis, warnings: w } = analyseBank(choice.bank, system, sourceCtx, "recommendedBank");
    warnings.push(...w);
    recommendedBank = { arrangement: choice.arrangement, reason: choice.reason, belowTarget: choice.belowTarget, ...analysis };
    if (choice.belowTarget) {
      warnings.push(warning("recommended_bank_below_target", choice.reason, "recommendedBank"));
    }
    for (const note of choice.notes) warnings.push(warning("recommended_bank_too_many_steps", note, "recommendedBank"));
  } else if (correction.kvarRequired > 0) {
    warnings.push(
      warning(
        "no_standard_unit_fits",
        `${correction.kvarRequired.toFixed(2)} kvar is needed, but even the smallest standard unit would make the site lead at this load: no bank is recommended`,
        "recommendedBank",
      ),
    );
  }

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

  const h = studySiteHarmonics(input, loads, sc?.shortCircuitKVA ?? null, { recommended: recommendedBank, proposed: proposedBank }, options.harmonics, options.forceHarmonicStudy);
  if (h.issues.length > 0) return { ok: false, issues: h.issues };
  warnings.push(...h.warnings);

  return {
    ok: true,
    result: {
      engineVersion: ENGINE_VERSION,
      system: { ...system },
      loads,
      site,
      correction,
      recommendedBank,
      ...(proposedBank ? { proposedBank } : {}),
      ...(resonance ? { resonance } : {}),
      ...(h.study ? { harmonics: h.study } : {}),
      warnings,
      cautions: cautionsFor(),
    },
  };
}
