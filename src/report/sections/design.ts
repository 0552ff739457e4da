/** Blocks of a bank design and of a placement plan, when the caller supplies them. */
import type { BankDesign, DesignedStep } from "../../core/bank/bank-design.js";
import type { CircuitProtection } from "../../core/bank/protection.js";
import type { DischargeDesign } from "../../core/bank/discharge.js";
import type { PlacementPlan } from "../../core/placement/placement-types.js";
import type { SizingResult } from "../../core/pipeline/size.js";
import { fmt } from "../format.js";
import type { Block } from "../types.js";

/** What the report shows of a bank design, whether it came with the report or inside the recommended bank. */
export interface DesignView {
  reason: string;
  steps: readonly DesignedStep[];
  fixedKvar: number;
  switchedKvar: number;
  ratedVoltageV: number | null;
  reactorPct: number;
  hasSwitchedSteps: boolean;
  controller: BankDesign["controller"];
  protection: { steps: CircuitProtection[]; bank: CircuitProtection } | null;
  discharge: readonly DischargeDesign[];
  notes: readonly string[];
}

export function viewOfDesign(d: BankDesign): DesignView {
  return {
    reason: d.reason,
    steps: d.steps,
    fixedKvar: d.fixedKvar,
    switchedKvar: d.switchedKvar,
    ratedVoltageV: d.bank?.ratedVoltageV ?? null,
    reactorPct: d.bank?.reactorPct ?? 0,
    hasSwitchedSteps: d.stepPlan.switched !== null,
    controller: d.controller,
    protection: d.protection,
    discharge: d.discharge,
    notes: d.notes,
  };
}

/** The design fields a recommended bank carries when the engine designed it (results stored before that lack them). */
interface DesignedBankFields {
  physicalSteps: DesignedStep[];
  fixedKvar: number;
  switchedKvar: number;
  stepPlan: { switched: unknown };
  controller: BankDesign["controller"];
  protection: DesignView["protection"];
  discharge: DischargeDesign[];
  notes: string[];
}

export function designViewOf(result: SizingResult, given?: BankDesign): DesignView | null {
  if (given) return viewOfDesign(given);
  const rec = result.recommendedBank;
  const d = rec as (typeof rec & Partial<DesignedBankFields>) | null;
  if (!rec || !d?.physicalSteps || d.fixedKvar === undefined || d.switchedKvar === undefined) return null;
  return {
    reason: rec.reason,
    steps: d.physicalSteps,
    fixedKvar: d.fixedKvar,
    switchedKvar: d.switchedKvar,
    ratedVoltageV: rec.ratedVoltageV,
    reactorPct: rec.reactorPct,
    hasSwitchedSteps: d.switchedKvar > 0,
    controller: d.controller ?? null,
    protection: d.protection ?? null,
    discharge: d.discharge ?? [],
    notes: d.notes ?? [],
  };
}

const CONNECTION: Record<string, string> = {
  across_each_capacitor: "across each capacitor",
  star_across_delta: "star across the delta",
  two_across_delta: "two across the delta",
  delta_across_wye: "delta across the wye",
};

export function placementBlocks(plan: PlacementPlan): Block[] {
  return [
    { kind: "subheading", text: "Placement of correction" },
    {
      kind: "table",
      header: ["Load", "Corrected at", "Need to target (kvar)", "Terminal capacitor (kvar)", "Reason"],
      align: ["left", "left", "right", "right", "left"],
      rows: plan.loads.map((l) => [
        l.label,
        l.location,
        fmt.power(l.needKvar),
        l.terminal ? `${fmt.power(l.terminal.totalKvar)} (limit ${fmt.power(l.terminal.selfExcitationLimitKvar)} per motor)` : "-",
        l.reason,
      ]),
    },
    {
      kind: "table",
      title: "kvar by location",
      header: ["Location", "kvar", "Loads"],
      align: ["left", "right", "left"],
      rows: plan.locations.map((l) => [l.location, fmt.power(l.kvar), l.loads.join(", ")]),
    },
    { kind: "paragraph", text: plan.balanceNote },
    ...(plan.notes.length > 0 ? [{ kind: "list" as const, items: plan.notes }] : []),
  ];
}

export function designBlocks(d: DesignView): Block[] {
  const blocks: Block[] = [
    { kind: "subheading", text: "Bank design" },
    { kind: "paragraph", text: d.reason },
    {
      kind: "table",
      title: "Steps",
      header: ["Step", "Role", "Delivered (kvar)", "Nameplate (kvar)"],
      align: ["right", "left", "right", "right"],
      rows: d.steps.map((s, i) => [String(i + 1), s.role, fmt.power(s.effectiveKvar), fmt.power(s.nameplateKvar)]),
    },
    {
      kind: "keyValues",
      items: [
        {
          key: "Fixed / switched / total",
          value: `${fmt.power(d.fixedKvar)} / ${fmt.power(d.switchedKvar)} / ${fmt.power(d.fixedKvar + d.switchedKvar)} kvar`,
        },
        ...(d.ratedVoltageV !== null
          ? [{ key: "Capacitor rating", value: `${fmt.volts(d.ratedVoltageV)} V, reactor ${fmt.num(d.reactorPct, 2)} %` }]
          : []),
        {
          key: "Controller response C/k",
          value: d.controller
            ? `${fmt.num(d.controller.responseA, 3)} A (smallest step ${fmt.power(d.controller.smallestStepKvar)} kvar, CT ratio ${fmt.num(d.controller.ctRatio, 0)})`
            : d.hasSwitchedSteps
              ? "not set: the controller CT ratio was not given"
              : "no switched steps",
        },
      ],
    },
  ];
  if (d.protection) {
    blocks.push({
      kind: "table",
      title: "Conductors and protection",
      header: ["Circuit", "Current (A)", "Conductor at least (A)", "Disconnect at least (A)", "Device", "Device at least (A)", "Standard rating (A)"],
      align: ["left", "right", "right", "right", "left", "right", "right"],
      rows: [...d.protection.steps, d.protection.bank].map((p) => [
        p.label,
        fmt.amps(p.ratedCurrentA),
        fmt.amps(p.conductorMinAmpacityA),
        fmt.amps(p.disconnectMinA),
        `${p.device} at ${fmt.num(p.ocpdFactor * 100, 0)} %`,
        fmt.amps(p.ocpdMinA),
        p.ocpdRatingA === null ? "above 6000" : String(p.ocpdRatingA),
      ]),
      note: "Conductors and disconnect at 135 % of rated current (NFPA 70 460.8(A), (C)); standard ratings from NFPA 70 240.6(A).",
    });
  } else {
    blocks.push({ kind: "paragraph", text: "No protection figures: the design has no steps." });
  }
  if (d.discharge.length > 0) {
    blocks.push({
      kind: "table",
      title: "Discharge resistors",
      header: [
        "Step (kvar nameplate)",
        "Rated V",
        "Resistors",
        "C per element (µF)",
        "R at most (ohm)",
        "Governing rule",
        "Dissipation (W)",
        "To 10 % (s)",
      ],
      align: ["right", "right", "left", "right", "right", "left", "right", "right"],
      rows: d.discharge.map((x) => [
        fmt.power(x.kvar),
        fmt.volts(x.ratedVoltageV),
        `${x.resistorCount} ${CONNECTION[x.resistorConnection] ?? x.resistorConnection} (${x.capacitorConnection})`,
        fmt.uF(x.capacitanceF * 1e6),
        fmt.ohmOrNone(x.maxResistanceOhm),
        x.governingCitation,
        fmt.watts(x.dissipationTotalW),
        fmt.seconds(x.timeTo10PctS),
      ]),
    });
  } else {
    blocks.push({ kind: "paragraph", text: "No discharge figures: the design has no steps." });
  }
  if (d.notes.length > 0) blocks.push({ kind: "list", items: [...d.notes] });
  return blocks;
}
