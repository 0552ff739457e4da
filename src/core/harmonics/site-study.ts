import type { InstalledBankInput, SizingInput } from "../inputs.js";
import type { BankAnalysis } from "../bank/stages.js";
import type { LoadResult } from "../readings/site-totals.js";
import {
  runHarmonicStudy,
  type CapacitorBankInput,
  type HarmonicStudyOptions,
  type HarmonicStudyResult,
  type HarmonicSourceInput,
} from "./index.js";
import { warning, type InputIssue, type Warning } from "../warnings.js";

/** The site's harmonic sources: drives (typical six-pulse spectrum unless measured) and loads with a measured spectrum. */
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
    });
    loadIndex.push(i);
  });
  return { sources, loadIndex };
}

/** Linear load for the damping resistance R = V²/P: the kW of loads that are not harmonic sources (stated model). */
export function linearLoadKW(input: SizingInput, loads: LoadResult[]): number {
  return input.loads.reduce((s, load, i) => (load.kind === "drive" || load.harmonics ? s : s + (loads[i]?.kW ?? 0)), 0);
}

function asStudyBank(name: string, bank: BankAnalysis): CapacitorBankInput {
  return {
    name,
    ratedVoltageV: bank.ratedVoltageV,
    ratedFrequencyHz: bank.ratedFrequencyHz,
    reactorPct: bank.reactorPct,
    steps: bank.steps.map((s) => ({ kvar: s.kvar })),
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
  // Installed banks are studied stage by stage on their own; with new capacitors see the combined screen.
  for (const b of banks.installed ?? []) {
    studyBanks.push({ name: `installed ${b.label}`, ratedVoltageV: b.ratedVoltageV, ...(b.ratedFrequencyHz ? { ratedFrequencyHz: b.ratedFrequencyHz } : {}), reactorPct: b.reactorPct ?? 0, steps: b.steps.map((s) => ({ kvar: s.kvar })) });
  }
  const outcome = runHarmonicStudy({
    network: {
      voltageV: input.system.voltageV,
      frequencyHz: input.system.frequencyHz,
      shortCircuitKVA,
      ...(input.transformer?.xOverR !== undefined ? { xOverR: input.transformer.xOverR } : {}),
      ...(input.transformer ? { transformerKVA: input.transformer.kVA } : {}),
      linearLoadKW: linearLoadKW(input, loads),
    },
    sources,
    backgroundDistortion: background.map((c) => ({ order: c.order, pct: c.pct })),
    banks: studyBanks,
    options: options.includeScanSeries ? options : { ...options, scan: { stepOrder: FIGURES_SCAN_STEP_ORDER, ...options.scan } },
  });
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
  const warnings = findingsAsWarnings(study.findings.filter((f) => f.code !== "resonance_near_harmonic" || f.bankName === undefined));
  if (study.proposals.length > 0) {
    for (const p of study.proposals) {
      warnings.push(
        warning(
          "detuned_bank_proposed",
          `the ${p.forBank} bank fails the harmonic study (${p.triggeredBy.join(", ")}): a ${p.design.reactorPct} % detuned design (tuning order ${p.design.tuningOrder}, capacitors rated ${p.design.ratedVoltageV} V) is proposed`,
          `harmonics.proposals`,
        ),
      );
    }
  }
  return { study, issues: [], warnings };
}

/** One warning per failed limit, quantity and bank: the first stage's message, and which other stages fail it too. */
function findingsAsWarnings(findings: HarmonicStudyResult["findings"]): Warning[] {
  const groups = new Map<string, HarmonicStudyResult["findings"]>();
  for (const f of findings) {
    const key = `${f.code}|${f.bankName ?? ""}|${f.subject}`;
    const g = groups.get(key);
    if (g) g.push(f);
    else groups.set(key, [f]);
  }
  return [...groups.values()].map((g) => {
    const first = g[0]!;
    const others = [...new Set(g.slice(1).map((f) => f.stageNumber).filter((n) => n !== undefined && n !== first.stageNumber))];
    const message = others.length > 0 ? `${first.message}; also at stage${others.length > 1 ? "s" : ""} ${others.join(", ")}` : first.message;
    const path = !first.bankName ? "harmonics" : first.bankName.startsWith("installed ") ? "installedBanks" : `${first.bankName}Bank`;
    return warning(first.code, message, path);
  });
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

function compactStage(st: Stage): CompactStage {
  const { orders: _orders, ...duty } = st.duty;
  return {
    ...st,
    distortion: { ...st.distortion, lines: st.distortion.lines.map((l) => ({ order: l.order, voltagePct: l.voltagePct })) },
    duty,
  };
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
