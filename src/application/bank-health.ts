/**
 * The health of installed banks across a building's surveys: one series per bank as defined, one point per
 * survey, oldest first. A bank whose definition changed (replaced) or whose label changed (renamed) starts a
 * new series, and the series says why.
 */
import type { StepStatus } from "../core/bank/installed.js";
import type { InstalledBankInput } from "../core/inputs.js";
import type { SizingResult } from "../core/pipeline/size.js";

export interface SurveyBanks {
  surveyId: string;
  surveyedAt: string;
  /** The installed banks as the survey's building snapshot defined them. */
  definitions: readonly InstalledBankInput[];
  results: NonNullable<SizingResult["installedBanks"]>;
}

export interface HealthPoint {
  surveyId: string;
  surveyedAt: string;
  capacitancePct: number | null;
  status: StepStatus;
  measuredKvar: number | null;
}

export interface HealthSeries {
  bank: string;
  /** Why this series starts: the bank's first survey, a new definition under the same label, or a new label for the same bank. */
  startedBecause: "first_seen" | "replaced" | "renamed";
  note: string | null;
  definition: InstalledBankInput;
  steps: { step: number; nameplateKvar: number; points: HealthPoint[] }[];
}

/** What makes a bank the same bank: everything but its label. */
function signature(b: InstalledBankInput): string {
  return JSON.stringify([
    b.location,
    b.group ?? null,
    b.loadLabel ?? null,
    b.control,
    b.ratedVoltageV,
    b.ratedFrequencyHz ?? null,
    b.connection ?? null,
    b.reactorPct ?? 0,
    b.steps.map((s) => s.kvar),
    b.installedOn ?? null,
  ]);
}

export function bankHealthSeries(surveys: readonly SurveyBanks[]): HealthSeries[] {
  const series: HealthSeries[] = [];
  /** Current series per label, with the signature it was started with. */
  const open = new Map<string, { s: HealthSeries; sig: string }>();
  for (const sv of surveys) {
    const present = new Set(sv.results.map((r) => r.label));
    for (const r of sv.results) {
      const def = sv.definitions.find((d) => d.label === r.label);
      if (!def) continue;
      const sig = signature(def);
      let cur = open.get(r.label);
      if (!cur || cur.sig !== sig) {
        let startedBecause: HealthSeries["startedBecause"] = "first_seen";
        let note: string | null = null;
        if (cur) {
          startedBecause = "replaced";
          note = `bank "${r.label}" was redefined in the building (rating, steps or place changed) before survey ${sv.surveyId}: a new series`;
        } else {
          const renamedFrom = [...open.entries()].find(([label, o]) => o.sig === sig && !present.has(label));
          if (renamedFrom) {
            startedBecause = "renamed";
            note = `bank "${renamedFrom[0]}" is labelled "${r.label}" from survey ${sv.surveyId}: a new series`;
            open.delete(renamedFrom[0]);
          }
        }
        cur = {
          s: {
            bank: r.label,
            startedBecause,
            note,
            definition: def,
            steps: r.steps.map((st) => ({ step: st.step, nameplateKvar: st.nameplateKvar, points: [] })),
          },
          sig,
        };
        series.push(cur.s);
        open.set(r.label, cur);
      }
      for (const st of r.steps) {
        cur.s.steps[st.step - 1]?.points.push({
          surveyId: sv.surveyId,
          surveyedAt: sv.surveyedAt,
          capacitancePct: st.capacitancePct ?? null,
          status: st.status,
          measuredKvar: st.measuredKvar ?? null,
        });
      }
    }
  }
  return series;
}
