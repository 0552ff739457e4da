import type { InstalledBankInput, SizingInput } from "../inputs.js";
import type { BankAnalysis } from "../bank/stages.js";
import type { LoadResult } from "../readings/site-totals.js";
import {
  resolveScanGrid,
  runHarmonicStudy,
  runHarmonicStudyInContext,
  studyContextOf,
  type CapacitorBankInput,
  type HarmonicStudyInput,
  type StudyContext,
  type HarmonicStudyOptions,
  type HarmonicStudyResult,
  type HarmonicSourceInput,
} from "./harmonics-api.js";
import { IEEE18_LIMITS_PCT } from "./duty.js";
import { compactList, ieee18Severity, warning, worstSeverity, type InputIssue, type Severity, type Warning } from "../warnings.js";

/**
 * The site's harmonic sources: drives (typical six-pulse spectrum unless measured, scaled to the reading's current
 * THD when it has one) and loads with a measured spectrum. A reading's kVA is rms when the meter gave V·I or kVA, or
 * when a true PF stood in for the displacement PF; otherwise it is the fundamental triangle's.
 */
export function harmonicSourcesOf(input: SizingInput, loads: LoadResult[]): { sources: HarmonicSourceInput[]; loadIndex: number[] } {
  const sources: HarmonicSourceInput[] = [];
  const loadIndex: number[] = [];
  input.loads.forEach((load, i) => {
    const r = loads[i];
    if (!r || (load.kind !== "drive" && !load.harmonics)) return;
    sources.push({
      label: load.label,
      kVA: r.measuredKVA ?? r.kVA,
      phases: r.phases,
      ...(load.harmonics ? { spectrum: load.harmonics.map((c) => ({ order: c.order, pct: c.pct })) } : {}),
      isDrive: load.kind === "drive",
      ...(load.measurement.currentTHDPct !== undefined ? { currentTHDPct: load.measurement.currentTHDPct } : {}),
      kVABasis:
        r.measuredKVA !== undefined || (load.measurement.pfType === "true" && load.measurement.currentTHDPct === undefined) ? "rms" : "fundamental",
    });
    loadIndex.push(i);
  });
  return { sources, loadIndex };
}

/** Linear load for the damping resistance R = V²/P: the kW of loads that are not harmonic sources (stated model). */
export function linearLoadKW(input: SizingInput, loads: LoadResult[]): number {
  return input.loads.reduce((s, load, i) => (load.kind === "drive" || load.harmonics ? s : s + (loads[i]?.kW ?? 0)), 0);
}

function asStudyBank(name: string, bank: BankAnalysis & { physicalSteps?: { nameplateKvar: number }[] }): CapacitorBankInput {
  return {
    name,
    ratedVoltageV: bank.ratedVoltageV,
    ratedFrequencyHz: bank.ratedFrequencyHz,
    reactorPct: bank.reactorPct,
    steps: bank.steps.map((s) => ({ kvar: s.kvar })),
    ...(bank.physicalSteps ? { purchaseSteps: bank.physicalSteps.map((s) => ({ kvar: s.nameplateKvar })) } : {}),
  };
}

/**
 * Grid of the figures-only study in sizing results: 0.1 order steps, each peak and dip then refined on the
 * exact |Z(h)|, so the reported orders do not depend on the grid. /v1/harmonics/scan keeps the 0.01 default.
 */
export const FIGURES_SCAN_STEP_ORDER = 0.1;

export interface SiteHarmonicsOutcome {
  /** The full study (with series when asked); sizing results keep compactStudy(study). */
  study?: HarmonicStudyResult;
  /** The bus and its injection as studied: the combined stages of installed and new banks are worked on it. */
  context?: StudyContext;
  issues: InputIssue[];
  warnings: Warning[];
}

/**
 * Run the harmonic study for a sized site: the bus without capacitors and every stage of the recommended and
 * proposed banks. Needs the source strength; without harmonic sources there is nothing to study.
 */
export function studySiteHarmonics(
  input: SizingInput,
  loads: LoadResult[],
  shortCircuitKVA: number | null,
  banks: { recommended: BankAnalysis | null; proposed?: BankAnalysis | undefined; installed?: readonly InstalledBankInput[] },
  options: HarmonicStudyOptions = {},
  force = false,
): SiteHarmonicsOutcome {
  const { sources, loadIndex } = harmonicSourcesOf(input, loads);
  const background = input.backgroundVoltageDistortion ?? [];
  if (!force && sources.length === 0 && background.length === 0) return { issues: [], warnings: [] };
  if (shortCircuitKVA === null) {
    return {
      issues: [],
      warnings: [
        warning(
          "harmonic_study_needs_source",
          "the site has harmonic sources but no transformer or utility data, so the harmonic study could not run: add the transformer's kVA and impedance",
          "transformer",
        ),
      ],
    };
  }
  const studyBanks: CapacitorBankInput[] = [];
  if (banks.recommended) studyBanks.push(asStudyBank("recommended", banks.recommended));
  if (banks.proposed) studyBanks.push(asStudyBank("proposed", banks.proposed));
  // Installed banks are studied stage by stage on their own; with new capacitors see the combined screen and study.
  for (const b of banks.installed ?? []) {
    studyBanks.push({
      name: `installed ${b.label}`,
      ratedVoltageV: b.ratedVoltageV,
      ...(b.ratedFrequencyHz ? { ratedFrequencyHz: b.ratedFrequencyHz } : {}),
      reactorPct: b.reactorPct ?? 0,
      steps: b.steps.map((s) => ({ kvar: s.kvar })),
    });
  }
  const studyInput: HarmonicStudyInput = {
    network: {
      voltageV: input.system.voltageV,
      frequencyHz: input.system.frequencyHz,
      phases: input.system.phases,
      shortCircuitKVA,
      ...(input.transformer?.xOverR !== undefined ? { xOverR: input.transformer.xOverR } : {}),
      ...(input.transformer ? { transformerKVA: input.transformer.kVA } : {}),
      linearLoadKW: linearLoadKW(input, loads),
    },
    sources,
    backgroundDistortion: background.map((c) => ({ order: c.order, pct: c.pct })),
    banks: studyBanks,
    options: options.includeScanSeries ? options : { ...options, scan: { stepOrder: FIGURES_SCAN_STEP_ORDER, ...options.scan } },
  };
  const outcome = runWithinSeriesBudget(studyInput);
  if ("budgetIssue" in outcome) return { issues: [outcome.budgetIssue], warnings: [] };
  if (!outcome.ok) {
    // The study's own paths ("sources[2].spectrum[0].order") mapped back onto the request's loads.
    const issues = outcome.issues.map((i) => {
      const m = /^sources\[(\d+)\]\.spectrum(?:\[(\d+)\](?:\.(\w+))?)?/.exec(i.path);
      if (!m) return { path: [i.path], message: i.message };
      const path: (string | number)[] = ["loads", loadIndex[Number(m[1])] ?? 0, "harmonics"];
      if (m[2] !== undefined) path.push(Number(m[2]));
      if (m[3] !== undefined) path.push(m[3]);
      return { path, message: i.message };
    });
    return { issues, warnings: [] };
  }
  const study = outcome.result;
  const warnings = [...findingsAsWarnings(study.findings), ...study.banks.flatMap(dutyWarning)];
  if (study.proposals.length > 0) {
    for (const [i, p] of study.proposals.entries()) {
      warnings.push(
        warning(
          "detuned_bank_proposed",
          `the ${p.forBank} bank fails the harmonic study (${p.triggeredBy.join(", ")}): a ${p.design.reactorPct} % detuned design (tuning order ${p.design.tuningOrder}, capacitors rated ${p.design.ratedVoltageV} V) is proposed`,
          `harmonics.proposals.${i}`,
        ),
      );
    }
  }
  return { study, context: "context" in outcome ? outcome.context : studyContextOf(studyInput), issues: [], warnings };
}

/**
 * Most |Z(h)| points one answer may carry over all its series (the bus, every stage, every proposal's stages):
 * two numbers a point, about 40 bytes of JSON, so at most ~8 MB. Own bound, keeps an answer under 10 MB.
 */
export const MAX_SERIES_POINTS = 200_000;

/** Series in a study: the bus without capacitors, each stage of each bank, each stage of each proposal. */
function seriesCount(study: HarmonicStudyResult): number {
  return 1 + study.banks.reduce((s, b) => s + b.stages.length, 0) + study.proposals.reduce((s, p) => s + p.study.stages.length, 0);
}

/**
 * With series asked for, the figures first (no grid: cheap), then the series only if they fit MAX_SERIES_POINTS;
 * otherwise an issue on scan.stepOrder naming the limit and the step that would fit.
 */
function runWithinSeriesBudget(
  input: HarmonicStudyInput,
): ReturnType<typeof runHarmonicStudy> | ReturnType<typeof runHarmonicStudyInContext> | { budgetIssue: InputIssue } {
  if (!input.options?.includeScanSeries) return runHarmonicStudyInContext(input);
  const figures = runHarmonicStudy({ ...input, options: { ...input.options, includeScanSeries: false } });
  if (!figures.ok) return figures;
  const grid = resolveScanGrid(input.options.scan);
  const series = seriesCount(figures.result);
  if (series * grid.points <= MAX_SERIES_POINTS) return runHarmonicStudy(input);
  const span = grid.toOrder - grid.fromOrder;
  const fits = Math.floor(MAX_SERIES_POINTS / series);
  const step = fits > 1 ? Math.ceil((span / (fits - 1)) * 1000) / 1000 : null;
  return {
    budgetIssue: {
      path: ["scan", "stepOrder"],
      message: `the scan would return ${series} series of ${grid.points} points, more than ${MAX_SERIES_POINTS} points in all: ${step !== null && step <= 1 ? `use a stepOrder of at least ${step}` : "study fewer steps at a time"}`,
    },
  };
}

type Finding = HarmonicStudyResult["findings"][number];
const DUTY_CODES: ReadonlySet<string> = new Set(["capacitor_above_rating", "capacitor_duty_exceeds_limit"]);

/**
 * One warning per concern: a limit (IEEE 519 THD_v, individual orders, resonance of the bus without capacitors) for
 * one bank, listing every stage (and order) that fails it. Stage resonances are the bank screen's warning (one per
 * bank, analyseBank); capacitor duty is dutyWarning's.
 */
function findingsAsWarnings(findings: readonly Finding[]): Warning[] {
  const groups = new Map<string, Finding[]>();
  for (const f of findings) {
    if (DUTY_CODES.has(f.code) || (f.code === "resonance_near_harmonic" && f.bankName !== undefined)) continue;
    const key = `${f.code}|${f.bankName ?? ""}`;
    const g = groups.get(key);
    if (g) g.push(f);
    else groups.set(key, [f]);
  }
  return [...groups.values()].map((g) => {
    const first = g[0]!;
    const stages = [...new Set(g.map((f) => f.stageNumber).filter((n): n is number => n !== undefined))];
    const subjects = [...new Set(g.map((f) => f.subject))];
    const extra: string[] = [];
    if (subjects.length > 1) extra.push(`${subjects.join(", ")} in all`);
    if (stages.length > 1) extra.push(`at stages ${compactList(stages)}`);
    const message = extra.length > 0 ? `${first.message}; ${extra.join(", ")}` : first.message;
    // A limit broken with the bank in is the design's error; the bus without capacitors is the site as it is.
    const severity: Severity = first.bankName === undefined || first.code === "resonance_near_harmonic" ? "warning" : "error";
    const covered = stages.length > 0 ? stages.map((n) => `stage ${n}`) : subjects;
    const path = !first.bankName ? "harmonics" : first.bankName.startsWith("installed ") ? "installedBanks" : `${first.bankName}Bank`;
    return warning(first.code, message, path, { severity, subjects: covered });
  });
}

const DUTY_LABELS: readonly [keyof typeof IEEE18_LIMITS_PCT, string][] = [
  ["rmsVoltage", "rms voltage"],
  ["peakVoltage", "peak voltage"],
  ["rmsCurrent", "rms current"],
  ["reactivePower", "kvar"],
];

/**
 * One warning per bank for its capacitor duty (IEEE Std 18): every quantity above 100 % of rating, its worst stage
 * and the stages above rating. Severity per ieee18Severity: above 100 % info, past half the allowance a warning,
 * above the limit an error (then the code is capacitor_duty_exceeds_limit).
 */
function dutyWarning(bank: HarmonicStudyResult["banks"][number]): Warning[] {
  const parts: string[] = [];
  const severities: Severity[] = [];
  const stagesAbove = new Set<number>();
  for (const [key, label] of DUTY_LABELS) {
    const over = bank.stages.filter((st) => st.duty[key].valuePct > 100);
    if (over.length === 0) continue;
    const worst = over.reduce((a, b) => (b.duty[key].valuePct > a.duty[key].valuePct ? b : a));
    const q = worst.duty[key];
    severities.push(ieee18Severity(q.valuePct, q.limitPct) ?? "info");
    over.forEach((st) => stagesAbove.add(st.stageNumber));
    const at =
      over.length === 1
        ? `stage ${over[0]!.stageNumber}`
        : `stages ${compactList(over.map((st) => st.stageNumber))}, worst stage ${worst.stageNumber}`;
    parts.push(`${label} ${q.valuePct.toFixed(1)} % of rating (IEEE 18 limit ${q.limitPct} %; ${at})`);
  }
  if (parts.length === 0) return [];
  const severity = worstSeverity(severities);
  const code = severity === "error" ? "capacitor_duty_exceeds_limit" : "capacitor_above_rating";
  const tail =
    severity === "error"
      ? "above the IEEE 18 limit: the capacitors as chosen are not fit for this bus"
      : "within the IEEE 18 limits, which are for contingencies, not a design basis";
  return [
    warning(code, `bank "${bank.name}": capacitor ${parts.join("; ")}: ${tail}`, `${bank.name}Bank`, {
      severity,
      subjects: [...stagesAbove].sort((a, b) => a - b).map((n) => `stage ${n}`),
    }),
  ];
}

/**
 * The bank screen's fundamental-voltage warning (capacitor_above_rated_voltage / capacitor_overvoltage) and the
 * study's duty warning are one concern when the study covered the bank: its rms voltage includes the fundamental.
 * Keeps the study's, which also weighs the harmonics.
 */
export function withoutScreenVoltageRepeats(screen: readonly Warning[], study: readonly Warning[]): Warning[] {
  // The study's rms voltage is √(V₁² + ΣV_h²) with V₁ = U/(1 − p), the screen's figure: whenever the screen warns,
  // the study's warning for that bank exists and names the rms voltage.
  const studied = new Set(study.filter((w) => DUTY_CODES.has(w.code)).map((w) => w.path));
  return screen.filter(
    (w) =>
      !((w.code === "capacitor_above_rated_voltage" || w.code === "capacitor_overvoltage") && studied.has(w.path?.replace(/\.ratedVoltageV$/, ""))),
  );
}

type Stage = HarmonicStudyResult["banks"][number]["stages"][number];

/** A stage as the sizing result keeps it: the per-order bus voltages as {order, voltagePct}, no per-order duty rows. */
export type CompactStage = Omit<Stage, "distortion" | "duty"> & {
  distortion: Omit<Stage["distortion"], "lines"> & { lines: { order: number; voltagePct: number }[] };
  duty: Omit<Stage["duty"], "orders">;
};
type CompactBank = Omit<HarmonicStudyResult["banks"][number], "stages"> & { stages: CompactStage[] };
type Proposal = HarmonicStudyResult["proposals"][number];

/** The harmonic section of a sizing result: the study's figures without series or per-order detail of each stage. */
export type SizingHarmonics = Omit<HarmonicStudyResult, "banks" | "proposals"> & {
  banks: CompactBank[];
  proposals: (Omit<Proposal, "study"> & { study: CompactBank })[];
};

/**
 * Written out field by field, in the stage's own key order (studyBank's), rather than by rest and spread: every stage
 * of every bank passes here, and object rest is a slow generic copy.
 */
function compactStage(st: Stage): CompactStage {
  const d = st.distortion;
  const lines: { order: number; voltagePct: number }[] = [];
  for (let i = 0; i < d.lines.length; i++) lines.push({ order: d.lines[i]!.order, voltagePct: d.lines[i]!.voltagePct });
  const u = st.duty;
  const out = {
    peaks: st.peaks,
    dips: st.dips,
    distortion: { lines, thdVPct: d.thdVPct, worstIndividual: d.worstIndividual },
    ieee519: st.ieee519,
    resonanceWithin10PctOf: st.resonanceWithin10PctOf,
  } as CompactStage;
  if (st.series !== undefined) out.series = st.series;
  out.stageNumber = st.stageNumber;
  out.nameplateKvar = st.nameplateKvar;
  out.capacitorKvarAtSystem = st.capacitorKvarAtSystem;
  out.effectiveKvar = st.effectiveKvar;
  out.tuningOrder = st.tuningOrder;
  out.estimatedResonanceOrder = st.estimatedResonanceOrder;
  out.duty = {
    ratedPhaseV: u.ratedPhaseV,
    ratedCurrentA: u.ratedCurrentA,
    rmsVoltage: u.rmsVoltage,
    peakVoltage: u.peakVoltage,
    rmsCurrent: u.rmsCurrent,
    reactivePower: u.reactivePower,
    pass: u.pass,
    aboveRating: u.aboveRating,
  };
  return out;
}

function compactBank(b: HarmonicStudyResult["banks"][number]): CompactBank {
  return { ...b, stages: b.stages.map(compactStage) };
}

/** The figures-only form stored with surveys. */
export function compactStudy(study: HarmonicStudyResult): SizingHarmonics {
  return {
    ...study,
    banks: study.banks.map(compactBank),
    proposals: study.proposals.map((p) => ({ ...p, study: compactBank(p.study) })),
  };
}
