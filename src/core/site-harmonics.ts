import type { SizingInput } from "./inputs.js";
import type { BankAnalysis } from "./bank.js";
import type { LoadResult } from "./site.js";
import {
  runHarmonicStudy,
  type CapacitorBankInput,
  type HarmonicStudyOptions,
  type HarmonicStudyResult,
  type HarmonicSourceInput,
} from "./harmonics/index.js";
import { warning, type InputIssue, type Warning } from "./warnings.js";

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

export interface SiteHarmonicsOutcome {
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
  banks: { recommended: BankAnalysis | null; proposed?: BankAnalysis | undefined },
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
    options,
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
  const warnings = study.findings
    .filter((f) => f.code !== "resonance_near_harmonic" || f.bankName === undefined)
    .map((f) => warning(f.code, f.message, f.bankName ? `${f.bankName}Bank` : undefined));
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
