/** The banks: recommended and proposed, stage by stage, and the design (placement, steps, C/k, protection, discharge). */
import type { BankAnalysis } from "../../core/bank/stages.js";
import { circuitProtection } from "../../core/bank/protection.js";
import { dischargeRequirements } from "../../core/bank/discharge.js";
import type { SizingResult } from "../../core/pipeline/size.js";
import { fmt } from "../format.js";
import type { Block, ReportInput, Section } from "../types.js";
import { designBlocks, designViewOf, placementBlocks } from "./design.js";

type RecommendedBank = NonNullable<SizingResult["recommendedBank"]>;

/** "7 × 30 kvar" for equal steps, else the list. */
export function stepsText(steps: readonly { kvar: number }[]): string {
  if (steps.length === 0) return "none";
  const first = steps[0]?.kvar as number;
  if (steps.every((s) => s.kvar === first)) return `${steps.length} × ${fmt.power(first)} kvar`;
  return `${steps.map((s) => fmt.power(s.kvar)).join(" + ")} kvar`;
}

function analysisBlocks(name: string, b: BankAnalysis, rec?: RecommendedBank): Block[] {
  const items = [
    ...(rec ? [{ key: "Arrangement", value: String(rec.arrangement).replace(/_/g, " ") }] : []),
    { key: "Steps (nameplate)", value: stepsText(b.steps) },
    { key: "Capacitor rating", value: `${fmt.volts(b.ratedVoltageV)} V, ${b.ratedFrequencyHz} Hz` },
    {
      key: "Series reactor",
      value:
        b.reactorPct > 0 ? `${fmt.num(b.reactorPct, 2)} % (tuned to h = ${fmt.order(b.tuningOrder)}, ${fmt.hz(b.tuningHz)} Hz)` : "none (plain bank)",
    },
    {
      key: "Nameplate / at system voltage / delivered",
      value: `${fmt.power(b.nameplateKvar)} / ${fmt.power(b.capacitorKvar)} / ${fmt.power(b.effectiveKvar)} kvar`,
    },
    { key: "Capacitor terminal voltage", value: `${fmt.volts(b.capacitorVoltageV)} V (${fmt.pct(b.capacitorVoltagePctOfRated)} % of rated)` },
    { key: "Rated line current of the whole bank", value: `${fmt.amps(b.ratedCurrentA)} A` },
    { key: "Capacitance per phase (delta / wye)", value: `${fmt.uF(b.capacitancePerPhase.deltaUF)} / ${fmt.uF(b.capacitancePerPhase.wyeUF)} µF` },
    { key: "Reactance per phase (wye equivalent)", value: `${fmt.ohm(b.reactancePerPhaseOhm)} ohm` },
  ];
  if (rec?.belowTarget) items.push({ key: "Coverage", value: coverageText(rec) });
  return [
    { kind: "subheading", text: name },
    { kind: "keyValues", items },
    {
      kind: "table",
      title: `${name}: stages (cumulative kvar as steps switch in)`,
      header: ["Stage", "Nameplate (kvar)", "At system V (kvar)", "Delivered (kvar)", "Voltage rise (%)"],
      align: ["right", "right", "right", "right", "right"],
      rows: b.stages.map((s) => [
        String(s.stage),
        fmt.power(s.cumulativeNameplateKvar),
        fmt.power(s.cumulativeCapacitorKvar),
        fmt.power(s.cumulativeKvar),
        fmt.pct2(s.voltageRisePct),
      ]),
    },
  ];
}

/** Without a design: the least conductor, disconnect and fuse for the whole bank, and the discharge rule. */
function minimumFigures(b: BankAnalysis, label: string): Block[] {
  const { protection: p } = circuitProtection(`${label} (${fmt.power(b.effectiveKvar)} kvar)`, b.effectiveKvar, b.ratedCurrentA);
  const req = dischargeRequirements(b.ratedVoltageV);
  return [
    {
      kind: "table",
      title: `${label}: minimum circuit figures from the rated current`,
      header: [
        "Circuit",
        "Rated current (A)",
        "Conductor ampacity at least (A)",
        "Disconnect at least (A)",
        "Fuse at least (A)",
        "Next standard fuse (A)",
      ],
      align: ["left", "right", "right", "right", "right", "right"],
      rows: [
        [
          p.label,
          fmt.amps(p.ratedCurrentA),
          fmt.amps(p.conductorMinAmpacityA),
          fmt.amps(p.disconnectMinA),
          fmt.amps(p.ocpdMinA),
          p.ocpdRatingA === null ? "above 6000" : String(p.ocpdRatingA),
        ],
      ],
      note: "Conductors and disconnect at 135 % of rated current (NFPA 70 460.8(A), (C)); fuse at 165 % (makers' practice) rounded up to a standard rating (NFPA 70 240.6(A)). Each step's own circuit needs the same check.",
    },
    { kind: "list", items: req.map((r) => `Discharge: ${r.basis} (${r.citation}).`) },
  ];
}

export function bankSection(input: ReportInput): Section {
  const { recommendedBank: rec, proposedBank: prop } = input.result;
  const blocks: Block[] = [];
  const placement = input.placement ?? input.result.placement;
  if (placement) blocks.push(...placementBlocks(placement));
  if (rec) blocks.push(...analysisBlocks("Recommended bank", rec, rec));
  else blocks.push({ kind: "paragraph", text: noBankText(input.result) });
  if (prop) blocks.push(...analysisBlocks("Proposed bank (as entered)", prop));
  else blocks.push({ kind: "paragraph", text: "No bank was proposed with the survey." });
  const design = designViewOf(input.result, input.design);
  if (design) {
    blocks.push(...designBlocks(design));
  } else {
    blocks.push({
      kind: "paragraph",
      tone: "note",
      text: "No bank design (placement, controller setting, per-step protection and discharge resistors) was supplied with this report; the figures below are the minimum for the whole bank, from its rated current.",
    });
    if (rec) blocks.push(...minimumFigures(rec, "Recommended bank"));
    if (prop) blocks.push(...minimumFigures(prop, "Proposed bank"));
  }
  return { id: "bank", heading: "Capacitor bank", blocks };
}

/** Why a bank may not hold the target everywhere, worded from the step plan's own figures. */
export function coverageText(rec: RecommendedBank): string {
  const met = rec.stepPlan.metShare * 100;
  return `the bank holds the target in ${fmt.num(met, 1)} % of the ${rec.stepPlan.source === "intervals" ? "intervals" : "readings"}; in the rest a larger bank would lead at other times, or the need passes the design coverage`;
}

/** The sentence for an answer without a recommended bank, true for each reason the engine has for none. */
export function noBankText(result: SizingResult): string {
  const c = result.correction;
  const relief = c.leadingRelief;
  if (c.leadingExcessKvar > 0 && relief && relief.takeOutOfService.length > 0) {
    const steps = relief.takeOutOfService
      .map((s) => `${s.bank} step ${s.step} (${fmt.power(s.kvar)} kvar${s.control === "fixed" ? ", a fixed unit: disconnect it" : ""})`)
      .join(", ");
    return `No bank is recommended: the site leads; take ${steps} out of service (${fmt.power(relief.kvarRemoved)} kvar), giving PF ${fmt.pf(relief.pfAfter)} ${relief.senseAfter}${relief.reachesTarget ? "" : " — still beyond the target: more capacitors must come out"}.`;
  }
  if (c.leadingExcessKvar > 0)
    return `No bank is recommended: the site leads, and about ${fmt.power(c.leadingExcessKvar)} kvar of capacitors should be taken out of service instead.`;
  if (c.kvarAdditional !== undefined && c.kvarAdditional <= 0 && c.kvarRequired > 0)
    return "No new bank is needed: the installed banks, once repaired and fully used, cover the need.";
  if (c.kvarRequired <= 0) return "No bank is recommended: the site needs no capacitors to reach the target at the surveyed load.";
  const placed = result.placement?.totalKvar ?? 0;
  if (placed > 0)
    return `No central bank is recommended: the ${fmt.power(placed)} kvar the site needs is placed at the motor terminals and group banks above.`;
  return `No central bank is recommended: the ${fmt.power(c.kvarRequired)} kvar needed is below the smallest standard unit or the design could not be made from the readings.`;
}
