import { describe, expect, it } from "vitest";
import { correctionFor } from "../../../src/core/correction/to-target.js";
import type { PowerTriangle } from "../../../src/core/readings/triangle.js";
import { size } from "../../../src/core/pipeline/size.js";
import { expectClose, TOL } from "../../helpers/tolerance.js";

/** A lagging site of `kW` at displacement PF `pf`, built with plain trigonometry (sin φ = √(1 − pf²)). */
function laggingSite(kW: number, pf: number): PowerTriangle {
  const kvar = (kW * Math.sqrt(1 - pf * pf)) / pf;
  return { kW, kvar, kVA: kW / pf, displacementPF: pf, sense: pf === 1 ? "unity" : "lagging" };
}

/** kvar per kW to raise the PF from `from` to `to`: tan(acos from) − tan(acos to). */
const MULTIPLIERS: { from: number; to: number; kvarPerKW: number; source: string }[] = [
  { from: 0.7, to: 0.95, kvarPerKW: 0.692, source: "USDA RUS Bulletin 1724D-112 Table 1" },
  { from: 0.8, to: 0.95, kvarPerKW: 0.421, source: "USDA RUS Bulletin 1724D-112 Table 1" },
  { from: 0.85, to: 1.0, kvarPerKW: 0.62, source: "USDA RUS Bulletin 1724D-112 Table 1" },
  { from: 0.6, to: 0.9, kvarPerKW: 0.849, source: "hand calculation: 0.8/0.6 − √0.19/0.9 = 1.33333 − 0.48432 = 0.84901" },
  { from: 0.75, to: 0.95, kvarPerKW: 0.553, source: "hand calculation: √0.4375/0.75 − √0.0975/0.95 = 0.88192 − 0.32868 = 0.55323" },
  { from: 0.8, to: 1.0, kvarPerKW: 0.75, source: "hand calculation: 0.6/0.8 − 0 = 0.75" },
  { from: 0.9, to: 0.95, kvarPerKW: 0.156, source: "hand calculation: √0.19/0.9 − √0.0975/0.95 = 0.48432 − 0.32868 = 0.15564" },
  { from: 0.78, to: 0.95, kvarPerKW: 0.474, source: "hand calculation: √0.3916/0.78 − 0.32868 = 0.80228 − 0.32868 = 0.47360" },
  { from: 0.95, to: 0.95, kvarPerKW: 0, source: "hand calculation: already at the target, nothing to add" },
  { from: 0.98, to: 0.95, kvarPerKW: 0, source: "hand calculation: above the target, nothing to add (no negative multiplier)" },
];

describe("kvar-per-kW multipliers", () => {
  it.each(MULTIPLIERS)("$from → $to = $kvarPerKW via correctionFor ($source)", ({ from, to, kvarPerKW }) => {
    const { correction } = correctionFor(laggingSite(100, from), to, 480, 3);
    expectClose(correction.kvarPerKW, kvarPerKW, TOL.kvarPerKW, `kvarPerKW ${from}→${to}`);
    // 100 kW: the kvar to add is 100 × the multiplier, within the same table precision per kW
    expectClose(correction.kvarRequired / 100, kvarPerKW, TOL.kvarPerKW, `kvarRequired/kW ${from}→${to}`);
  });

  it.each(MULTIPLIERS)("$from → $to = $kvarPerKW via size() ($source)", ({ from, to, kvarPerKW }) => {
    const out = size({
      system: { voltageV: 480, frequencyHz: 60, phases: 3 },
      targetPF: to,
      loads: [{ label: "load", measurement: { method: "kw_pf", kW: 250, pf: from, sense: from === 1 ? "unity" : "lagging" } }],
    });
    expect(out.ok).toBe(true);
    if (!out.ok) return;
    expectClose(out.result.correction.kvarPerKW, kvarPerKW, TOL.kvarPerKW, `sizing kvarPerKW ${from}→${to}`);
  });
});

describe("correction figures of one worked case", () => {
  // Site: 100 kW at 0.80 lagging on 480 V three-phase → Q = 75 kvar, S = 125 kVA (hand: 100/0.8, 100·0.6/0.8).
  const site = laggingSite(100, 0.8);
  const { correction, warnings } = correctionFor(site, 0.95, 480, 3);
  const tan95 = Math.sqrt(1 - 0.95 ** 2) / 0.95; // hand: √0.0975/0.95 = 0.328684

  it("kvar required, kvar after and PF after", () => {
    expectClose(correction.kvarRequired, 75 - 100 * tan95, TOL.power, "kvarRequired (hand: 75 − 32.868 = 42.132 kvar)");
    expectClose(correction.kvarAfter, 100 * tan95, TOL.power, "kvarAfter (hand: 32.868 kvar)");
    expectClose(correction.pfAfter, 0.95, TOL.pf, "pfAfter = target");
    expect(warnings).toEqual([]);
  });

  it("kVA released and line currents", () => {
    expectClose(correction.kVABefore, 125, TOL.power, "kVA before (hand: 100/0.8)");
    expectClose(correction.kVAAfter, 100 / 0.95, TOL.power, "kVA after (hand: 100/0.95 = 105.263)");
    expectClose(correction.kVAReleased, 125 - 100 / 0.95, TOL.power, "kVA released (hand: 125 − 105.263 = 19.737)");
    // I = S/(√3·V): hand 125 000/(1.73205·480) = 150.35 A; 105 263/(1.73205·480) = 126.61 A
    expectClose(correction.lineCurrentBeforeA, 125_000 / (Math.sqrt(3) * 480), TOL.currentA, "line current before");
    expectClose(correction.lineCurrentAfterA, 105_263.157894737 / (Math.sqrt(3) * 480), TOL.currentA, "line current after");
  });

  it("loss reduction 1 − (PF₁/PF₂)² (common practice: I²R at constant kW)", () => {
    // hand calculation: 1 − (0.80/0.95)² = 1 − 0.709141 = 0.290859 → 29.09 %
    expectClose(correction.lossReductionPct, 29.0859, TOL.pct, "loss reduction %");
  });

  it("single-phase line current is S/V", () => {
    const { correction: c1 } = correctionFor(laggingSite(10, 0.8), 0.95, 240, 1);
    // hand calculation: 12.5 kVA / 240 V = 52.083 A
    expectClose(c1.lineCurrentBeforeA, 12_500 / 240, TOL.currentA, "1φ line current before");
  });
});

describe("a leading site", () => {
  it("needs no capacitors; the excess to remove is hand-computed", () => {
    const site: PowerTriangle = { kW: 100, kvar: -60, kVA: Math.hypot(100, 60), displacementPF: 100 / Math.hypot(100, 60), sense: "leading" };
    const { correction, warnings } = correctionFor(site, 0.95, 480, 3);
    expect(correction.kvarRequired).toBe(0);
    expect(correction.kvarPerKW).toBe(0);
    // hand calculation: allowed at 0.95 = 100·0.328684 = 32.868 kvar; excess = 60 − 32.868 = 27.132 kvar
    expectClose(correction.leadingExcessKvar, 60 - 32.86841, TOL.powerQuoted, "leading excess kvar");
    expect(warnings.map((w) => w.code)).toEqual(["site_leading"]);
    // the excess taken out of service: 100 kW with 32.868 kvar leading → PF 0.95 leading, 105.263 kVA (hand)
    expect(correction.action).toBe("remove");
    expectClose(correction.pfAfter, 0.95, TOL.pf, "pf after the excess is removed");
    expect(correction.pfAfterSense).toBe("leading");
    expectClose(correction.kvarAfter, -32.86841, TOL.powerQuoted, "kvar after");
    expectClose(correction.kVAAfter, Math.hypot(100, 32.86841), TOL.powerQuoted, "kVA after: √(100² + 32.868²) = 105.263");
    // kVA released 116.619 − 105.263 = 11.356 kVA (hand)
    expectClose(correction.kVAReleased, 116.619 - 105.263, TOL.powerQuoted2, "kVA released");
  });

  it("a site leading within the target has no excess but is still flagged", () => {
    const site: PowerTriangle = { kW: 100, kvar: -20, kVA: Math.hypot(100, 20), displacementPF: 100 / Math.hypot(100, 20), sense: "leading" };
    const { correction, warnings } = correctionFor(site, 0.95, 480, 3);
    // hand calculation: 20 kvar < 32.868 allowed → excess 0
    expect(correction.leadingExcessKvar).toBe(0);
    expect(correction.kvarRequired).toBe(0);
    expect(warnings.map((w) => w.code)).toEqual(["site_leading"]);
  });

  it("through size(): a leading kw_kvar site gives kvarRequired 0, site_leading, no recommended bank", () => {
    const out = size({
      system: { voltageV: 400, frequencyHz: 50, phases: 3 },
      loads: [{ label: "overcorrected", measurement: { method: "kw_kvar", kW: 200, kvar: -120 } }],
    });
    expect(out.ok).toBe(true);
    if (!out.ok) return;
    expect(out.result.site.sense).toBe("leading");
    expect(out.result.correction.kvarRequired).toBe(0);
    // hand calculation: 120 − 200·0.328684 = 120 − 65.737 = 54.263 kvar to remove
    expectClose(out.result.correction.leadingExcessKvar, 54.2632, TOL.powerQuoted, "leading excess kvar");
    expect(out.result.warnings.map((w) => w.code)).toContain("site_leading");
    expect(out.result.recommendedBank).toBeNull();
  });
});
