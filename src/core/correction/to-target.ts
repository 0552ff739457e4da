import { apparentKVA, lineCurrentA, senseOfKvar, tanPhi, type Phases, type Sense } from "../conventions.js";
import type { PowerTriangle } from "../readings/triangle.js";
import { warning, type Warning } from "../warnings.js";

/** What the site needs: capacitors added (lagging beyond the target), capacitors taken out (leading beyond it), or nothing. */
export type CorrectionAction = "add" | "remove" | "none";

export interface CorrectionResult {
  targetPF: number;
  action: CorrectionAction;
  /** kvar of capacitors to add: max(0, Q − P·tan(acos(target))). */
  kvarRequired: number;
  /** Multiplier kvar/kW from the present to the target PF (handbook table form). */
  kvarPerKW: number;
  /** Capacitive kvar to remove when the site is leading beyond the target (0 otherwise). */
  leadingExcessKvar: number;
  /** PF after the action: capacitors added, or the leading excess taken out of service. */
  pfAfter: number;
  pfAfterSense: Sense;
  kvarAfter: number;
  kVABefore: number;
  kVAAfter: number;
  /** Transformer/feeder capacity freed: kVA before − after. */
  kVAReleased: number;
  lineCurrentBeforeA: number;
  lineCurrentAfterA: number;
  /** I²R loss reduction in percent of the present losses: 1 − (PF₁/PF₂)² (common practice). */
  lossReductionPct: number;
}

/** Correction to a target displacement PF at constant kW. */
export function correctionFor(
  site: PowerTriangle,
  targetPF: number,
  voltageV: number,
  phases: Phases,
): { correction: CorrectionResult; warnings: Warning[] } {
  const warnings: Warning[] = [];
  const allowedKvar = site.kW * tanPhi(targetPF);
  // kvar needed at constant P: Q − P·tan(acos(PF₂)) (standard power-triangle method)
  const kvarRequired = Math.max(0, site.kvar - allowedKvar);
  let leadingExcessKvar = 0;
  if (site.kvar < 0) {
    leadingExcessKvar = Math.max(0, -site.kvar - allowedKvar);
    warnings.push(
      warning(
        "site_leading",
        leadingExcessKvar > 0
          ? `the site is leading (PF ${site.displacementPF.toFixed(3)}): take about ${leadingExcessKvar.toFixed(1)} kvar of capacitors out of service to bring it to ${targetPF} leading; add none`
          : `the site is leading (PF ${site.displacementPF.toFixed(3)}) but within the target; add no capacitors`,
      ),
    );
  }
  // Lagging: capacitors added; leading beyond the target: the excess capacitive kvar taken out of service.
  const kvarAfter = site.kvar - kvarRequired + leadingExcessKvar;
  const kVAAfter = apparentKVA(site.kW, kvarAfter);
  const pfAfter = kVAAfter > 0 ? site.kW / kVAAfter : 1;
  const correction: CorrectionResult = {
    targetPF,
    action: kvarRequired > 0 ? "add" : leadingExcessKvar > 0 ? "remove" : "none",
    kvarRequired,
    kvarPerKW: site.kvar > 0 ? Math.max(0, tanPhi(site.displacementPF) - tanPhi(targetPF)) : 0,
    leadingExcessKvar,
    pfAfter,
    pfAfterSense: senseOfKvar(kvarAfter, kVAAfter),
    kvarAfter,
    kVABefore: site.kVA,
    kVAAfter,
    kVAReleased: site.kVA - kVAAfter,
    lineCurrentBeforeA: lineCurrentA(site.kVA, voltageV, phases),
    lineCurrentAfterA: lineCurrentA(kVAAfter, voltageV, phases),
    // losses ∝ I² ∝ 1/PF² at constant kW: reduction 1 − (PF₁/PF₂)² (common practice)
    lossReductionPct: pfAfter > 0 ? Math.max(0, 1 - (site.displacementPF / pfAfter) ** 2) * 100 : 0,
  };
  return { correction, warnings };
}
