import { describe, expect, it } from "vitest";
import { runHarmonicStudy, type HarmonicStudyInput } from "../../../src/core/harmonics/harmonics-api.js";
import { FIGURES_SCAN_STEP_ORDER } from "../../../src/core/harmonics/site-study.js";

// The sizing section scans on a coarse grid and refines extrema on the exact |Z(h)|; it must find the same
// peaks and dips as the fine 0.01 grid, including a detuned stage whose peak sits just below its dip.
const input = (stepOrder: number, reactorPct: number, kvar: number): HarmonicStudyInput => ({
  network: { voltageV: 480, frequencyHz: 60, shortCircuitKVA: 26_087, transformerKVA: 1500, linearLoadKW: 400 },
  sources: [{ label: "drive", kVA: 200, phases: 3, isDrive: true }],
  banks: [{ name: "b", ratedVoltageV: 525, reactorPct, steps: [{ kvar }, { kvar }, { kvar: 4 * kvar }] }],
  options: { scan: { stepOrder }, proposeDetuned: false },
});

describe("figures-only scan grid", () => {
  it.each([
    [7, 10],
    [7, 100],
    [14, 10],
    [5.67, 25],
    [0, 50],
  ])("p = %s %%, %s kvar steps: same extrema as the 0.01 grid", (p, kvar) => {
    const fine = runHarmonicStudy(input(0.01, p, kvar));
    const coarse = runHarmonicStudy(input(FIGURES_SCAN_STEP_ORDER, p, kvar));
    if (!fine.ok || !coarse.ok) throw new Error("study failed");
    fine.result.banks[0]!.stages.forEach((st, i) => {
      const c = coarse.result.banks[0]!.stages[i]!;
      expect(c.peaks.map((x) => x.order)).toHaveLength(st.peaks.length);
      expect(c.dips.map((x) => x.order)).toHaveLength(st.dips.length);
      // both refined on the exact |Z(h)|: they agree far below any order that matters (1e-6)
      c.peaks.forEach((pk, k) => expect(Math.abs(pk.order - st.peaks[k]!.order)).toBeLessThan(1e-6));
      c.dips.forEach((d, k) => expect(Math.abs(d.order - st.dips[k]!.order)).toBeLessThan(1e-6));
    });
  });
});
