/** The harmonic study: the bus without capacitors, every stage of every bank, findings, and a detuned proposal when needed. */
import { DEFAULT_REACTOR_QUALITY_FACTOR, capacitorKvarAtSystem } from "./branch.js";
import {
  DEFAULT_VOLTAGE_MARGIN_FACTOR,
  isThirdHarmonicSignificant,
  nextLowerDetuning,
  proposeDetunedDesign,
  type DetunedDesign,
  type KvarRounding,
} from "./detuned.js";
import { injectedCurrents, type CombinationMethod, type HarmonicSourceInput, type SourceSpectrumUse } from "./injection.js";
import { buildBusModel, type NetworkInput, type SourceImpedance } from "./network.js";
import { RESONANCE_BAND_PCT } from "./resonance.js";
import type { ScanOptions } from "./scan.js";
import {
  bankFindings,
  busFindings,
  studyBank,
  studyBus,
  type BankStudy,
  type BusStudy,
  type CapacitorBankInput,
  type Finding,
  type FindingCode,
  type StudyContext,
} from "./stage.js";
import type { Issue, SpectrumLine } from "./study-types.js";
import { validateHarmonicStudyInput } from "./validate.js";

export interface HarmonicStudyOptions {
  scan?: ScanOptions;
  /** Return the |Z(h)| series for plotting; default false (figures only). */
  includeScanSeries?: boolean;
  /** How same-order currents of several sources add; default "arithmetic" (worst case). */
  combination?: CombinationMethod;
  /** X/R of the detuning reactor; default 50. */
  reactorQualityFactor?: number;
  /** Default true. */
  proposeDetuned?: boolean;
  voltageMarginFactor?: number;
  kvarRounding?: KvarRounding;
}

export interface HarmonicStudyInput {
  network: NetworkInput;
  sources: HarmonicSourceInput[];
  /** Site background voltage distortion, percent of the fundamental, per order. */
  backgroundDistortion?: SpectrumLine[];
  banks: CapacitorBankInput[];
  options?: HarmonicStudyOptions;
}

export interface DetunedProposal {
  forBank: string;
  triggeredBy: FindingCode[];
  /** The stages studied: one step per increment of the bank's switchable totals. */
  design: DetunedDesign;
  /** What to buy: the bank's physical steps at the proposal's reactor, voltage and standard nameplates (when known). */
  purchaseSteps?: DetunedDesign["steps"];
  study: BankStudy;
  findings: Finding[];
}

export interface HarmonicStudyResult {
  source: SourceImpedance;
  loadResistanceOhm: number | null;
  presentOrders: number[];
  /** Which spectrum and fundamental current each harmonic source was given. */
  sources: SourceSpectrumUse[];
  thirdHarmonicSignificant: boolean;
  withoutCapacitors: BusStudy;
  banks: BankStudy[];
  findings: Finding[];
  proposals: DetunedProposal[];
  assumptions: string[];
}

export type HarmonicStudyOutcome = { ok: true; result: HarmonicStudyResult } | { ok: false; issues: Issue[] };

const TRIGGERS: readonly FindingCode[] = ["resonance_near_harmonic", "capacitor_duty_exceeds_limit", "thd_v_exceeds_limit"];

export function runHarmonicStudy(input: HarmonicStudyInput): HarmonicStudyOutcome {
  const issues = validateHarmonicStudyInput(input);
  return issues.length > 0 ? { ok: false, issues } : { ok: true, result: computeStudy(input, studyContextOf(input)) };
}

/** runHarmonicStudy, also giving the context it worked in (the bus and its injection), so a caller need not rebuild it. */
export function runHarmonicStudyInContext(
  input: HarmonicStudyInput,
): (HarmonicStudyOutcome & { ok: false }) | { ok: true; result: HarmonicStudyResult; context: StudyContext } {
  const issues = validateHarmonicStudyInput(input);
  if (issues.length > 0) return { ok: false, issues };
  const context = studyContextOf(input);
  return { ok: true, result: computeStudy(input, context), context };
}

/** The bus, its injected currents and the study's options: what every stage study shares (input already validated). */
export function studyContextOf(input: HarmonicStudyInput): StudyContext {
  const o = input.options ?? {};
  const { network } = input;
  const model = buildBusModel(network);
  const background = input.backgroundDistortion ?? [];
  const currents = injectedCurrents(input.sources, network.voltageV, o.combination ?? "arithmetic", model.phases);
  const present = new Set(currents.orders);
  for (const l of background) if (l.pct > 0) present.add(l.order);
  const presentOrders = [...present].sort((a, b) => a - b);
  return {
    network,
    model,
    currents,
    background,
    presentOrders,
    scan: o.scan ?? {},
    includeScanSeries: o.includeScanSeries ?? false,
    reactorQualityFactor: o.reactorQualityFactor ?? DEFAULT_REACTOR_QUALITY_FACTOR,
  };
}

function computeStudy(input: HarmonicStudyInput, ctx: StudyContext): HarmonicStudyResult {
  const o = input.options ?? {};
  const { model, currents, background, presentOrders } = ctx;
  const bg3 = background.filter((l) => l.order === 3).reduce((s, l) => s + l.pct, 0);
  const thirdHarmonicSignificant = isThirdHarmonicSignificant(currents.byOrderA[3] ?? 0, currents.fundamentalA, bg3);

  const withoutCapacitors = studyBus(ctx, model);
  const findings = busFindings(withoutCapacitors, "bus without capacitors", {});
  const banks = input.banks.map((b) => studyBank(ctx, b));
  const proposals: DetunedProposal[] = [];
  input.banks.forEach((bank, i) => {
    const own = bankFindings(banks[i]!);
    findings.push(...own);
    const triggeredBy = TRIGGERS.filter((c) => own.some((f) => f.code === c));
    if (triggeredBy.length > 0 && (o.proposeDetuned ?? true)) proposals.push(propose(ctx, bank, triggeredBy, thirdHarmonicSignificant, o));
  });
  return {
    source: model.source,
    loadResistanceOhm: model.loadResistanceOhm,
    presentOrders: [...presentOrders],
    sources: currents.sources,
    thirdHarmonicSignificant,
    withoutCapacitors,
    banks,
    findings,
    proposals,
    assumptions: assumptions(model.source, ctx, o),
  };
}

/** Same effective kvar per step as the bank it replaces; one step lower in tuning while the rerun still resonates. */
function propose(
  ctx: StudyContext,
  bank: CapacitorBankInput,
  triggeredBy: FindingCode[],
  thirdHarmonicSignificant: boolean,
  o: HarmonicStudyOptions,
): DetunedProposal {
  const { voltageV, frequencyHz } = ctx.network;
  const fr = bank.ratedFrequencyHz ?? frequencyHz;
  const requiredEffectiveKvarPerStep = bank.steps.map(
    (s) => capacitorKvarAtSystem(s.kvar, bank.ratedVoltageV, fr, voltageV, frequencyHz) / (1 - bank.reactorPct / 100),
  );
  const base = {
    voltageV,
    frequencyHz,
    requiredEffectiveKvarPerStep,
    presentOrders: ctx.presentOrders,
    thirdHarmonicSignificant,
    voltageMarginFactor: o.voltageMarginFactor ?? DEFAULT_VOLTAGE_MARGIN_FACTOR,
    kvarRounding: o.kvarRounding ?? "nearest_standard",
  };
  const name = `${bank.name} (detuned proposal)`;
  let design = proposeDetunedDesign(base);
  const notes: string[] = [];
  for (;;) {
    const asBank: CapacitorBankInput = {
      name,
      ratedVoltageV: design.ratedVoltageV,
      ratedFrequencyHz: design.ratedFrequencyHz,
      reactorPct: design.reactorPct,
      steps: design.steps.map((s) => ({ kvar: s.nameplateKvar })),
    };
    const study = studyBank(ctx, asBank);
    const findings = bankFindings(study);
    const lower = nextLowerDetuning(design.reactorPct);
    if (!findings.some((f) => f.code === "resonance_near_harmonic") || lower === null) {
      const purchase = bank.purchaseSteps
        ? proposeDetunedDesign({
            ...base,
            reactorPct: design.reactorPct,
            requiredEffectiveKvarPerStep: bank.purchaseSteps.map(
              (s) => capacitorKvarAtSystem(s.kvar, bank.ratedVoltageV, fr, voltageV, frequencyHz) / (1 - bank.reactorPct / 100),
            ),
          }).steps
        : undefined;
      return {
        forBank: bank.name,
        triggeredBy,
        design: { ...design, rationale: [...notes, ...design.rationale] },
        ...(purchase ? { purchaseSteps: purchase } : {}),
        study,
        findings,
      };
    }
    notes.push(`${design.reactorPct} % still resonated near a present order; moved to ${lower.reactorPct} %`);
    design = proposeDetunedDesign({ ...base, reactorPct: lower.reactorPct });
  }
}

function assumptions(source: SourceImpedance, ctx: StudyContext, o: HarmonicStudyOptions): string[] {
  const xr =
    source.xOverRBasis === "given"
      ? `source X/R ${source.xOverR} as given`
      : source.xOverRBasis === "transformer_rule_of_thumb"
        ? `source X/R ${source.xOverR} estimated from transformer size (rule of thumb from typical transformer data, no standard)`
        : `source X/R unknown: ${source.xOverR} assumed (high end, little damping: conservative)`;
  const singlePhase = ctx.model.phases === 1;
  return [
    singlePhase
      ? "Single-phase model: source, capacitor and load impedances seen between the two conductors at the line voltage (Z_base = V²/S_sc with S_sc the single-phase short-circuit kVA); currents S/V; capacitor rated current Q/V."
      : "Per-phase wye-equivalent, balanced positive-sequence model; triplen (zero-sequence) paths are not modelled separately.",
    "Source impedance Z_s(h) = R_s + j·h·X_s from the short-circuit kVA; R held constant with h (less damping than reality: conservative).",
    xr,
    ctx.model.loadResistanceOhm === null
      ? "No linear load given: no resistive damping branch."
      : `Linear load modelled as a parallel resistance V²/P = ${ctx.model.loadResistanceOhm.toPrecision(4)} ohm.`,
    `Capacitor stage: Z(h) = R_r + j(h·p·X_C - X_C/h); reactor X/R ${ctx.reactorQualityFactor}, R held constant with h.`,
    "Stages are cumulative: steps switch in in the order given; each bank is studied alone on the bus (installed and new banks together: combinedStages[].harmonics).",
    "Drives without a measured spectrum: the ideal six-pulse shape I_h = I_1/h at 6k ± 1 (textbook), scaled to the measured current THD when one is given; an rms (V·I or kVA) reading's fundamental is I_rms/sqrt(1 + THD_i²).",
    o.combination === "rss"
      ? "Same-order currents of several sources combined as the square root of the sum of squares (random phase)."
      : "Same-order currents of several sources added arithmetically (all in phase: worst case).",
    ...(singlePhase ? [] : ["Single-phase sources are taken as line-to-neutral loads, all on one phase (upper bound)."]),
    "Background voltage distortion is added arithmetically per order and is not itself amplified by the bank.",
    "Bus fundamental voltage taken at nominal; IEEE 519 limits applied at the capacitor bus as if it were the PCC.",
    "Capacitor peak voltage: rms harmonic voltages added arithmetically (all crests coincide: worst case).",
    `Resonance is flagged when a parallel-resonance peak lies within ±${RESONANCE_BAND_PCT} % of a present order; peaks are sought only inside the scan range.`,
  ];
}
