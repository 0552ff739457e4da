/**
 * What the answer proposes to buy, one line each, and its price from the electrician's unit costs: the central bank
 * (the detuned one when the harmonic study proposes it, reactors included), with the plain bank priced apart as the
 * option it replaces, and the motor-terminal and group units.
 */
import type { InstalledCostInput } from "./savings.js";

export interface CostItemInput {
  item: "central_bank" | "central_bank_plain" | "motor_terminal" | "group_bank";
  label: string;
  /** Delivered kvar at the system voltage. */
  kvar: number;
  /** Units with their own switching device: bank steps, one per motor-terminal capacitor, one per group bank. */
  units: number;
  /** Reactor share of a detuned bank, percent (0: plain capacitors). */
  reactorPct: number;
  /** false: shown for comparison, not counted in the installed cost (the plain bank when a detuned one is proposed). */
  counted: boolean;
}

export interface CostItem extends CostItemInput {
  capacitorCost: number;
  /** Reactor cost; null when the bank is detuned and no reactor price was given (not priced). */
  reactorCost: number | null;
  cost: number;
}

/** Price each line: capacitors perKvar·kvar + perStep·units; reactors reactorPerKvar·kvar + reactorPerStep·units. */
export function priceItems(items: CostItemInput[], cost: InstalledCostInput): { items: CostItem[]; reactorsUnpriced: boolean } {
  const reactorPriced = cost.reactorPerKvar !== undefined || cost.reactorPerStep !== undefined;
  let reactorsUnpriced = false;
  const priced = items.map((i): CostItem => {
    const capacitorCost = (cost.perKvar ?? 0) * i.kvar + (cost.perStep ?? 0) * i.units;
    let reactorCost: number | null = 0;
    if (i.reactorPct > 0) {
      if (reactorPriced) reactorCost = (cost.reactorPerKvar ?? 0) * i.kvar + (cost.reactorPerStep ?? 0) * i.units;
      else ((reactorCost = null), (reactorsUnpriced ||= i.counted));
    }
    return { ...i, capacitorCost, reactorCost, cost: capacitorCost + (reactorCost ?? 0) };
  });
  return { items: priced, reactorsUnpriced };
}
