import type { PowerTriangle } from "./measurement.js";
import type { ProposedBankInput, SystemInput, TransformerInput } from "./inputs.js";

/** Standard low-voltage capacitor unit sizes, kvar (common practice list, no single source). */
export const STANDARD_UNIT_KVAR = [2.5, 5, 7.5, 10, 12.5, 15, 20, 25, 30, 40, 50, 60, 75, 100] as const;

/** A fixed bank above this share of the transformer (or site) kVA risks overvoltage and leading PF at light load (rule of thumb). */
export const FIXED_SHARE_LIMIT = 0.15;
export const AUTOMATIC_MIN_STEPS = 4;
export const AUTOMATIC_MAX_STEPS = 12;

export type BankArrangement = "fixed" | "automatic";

export interface BankChoice {
  arrangement: BankArrangement;
  reason: string;
  bank: ProposedBankInput;
  /** True when the bank cannot reach the target without going leading at the reading's load. */
  belowTarget: boolean;
  /** Anything about the choice the electrician must know (e.g. more steps than one controller has). */
  notes: string[];
}

const LARGEST_UNIT = STANDARD_UNIT_KVAR[STANDARD_UNIT_KVAR.length - 1] as number;

/**
 * First bank rule (rule of thumb, see README): a fixed unit when the required kvar is at most one standard unit
 * and at most 15 % of the transformer kVA (site kVA without a transformer); otherwise an automatic bank of
 * 4–12 equal standard steps with the least installed excess, then the fewest steps.
 */
export function recommendBank(
  kvarRequired: number,
  site: PowerTriangle,
  system: SystemInput,
  transformer?: TransformerInput,
): BankChoice | null {
  if (kvarRequired <= 0) return null;
  const referenceKVA = transformer?.kVA ?? site.kVA;
  const referenceName = transformer ? "transformer" : "site";
  const share = kvarRequired / referenceKVA;
  const base = { ratedVoltageV: system.voltageV, ratedFrequencyHz: system.frequencyHz, reactorPct: 0 } as const;

  if (kvarRequired <= LARGEST_UNIT && share <= FIXED_SHARE_LIMIT) {
    const up = STANDARD_UNIT_KVAR.find((s) => s >= kvarRequired - 1e-9) as number;
    // A fixed unit larger than the site's kvar would make the site lead; take the next size down then.
    if (up <= site.kvar + 1e-9) {
      return {
        arrangement: "fixed",
        reason: `${kvarRequired.toFixed(1)} kvar is at most one standard unit and ${(share * 100).toFixed(1)} % of the ${referenceName} kVA (≤ 15 %): one fixed unit, rounded up to ${up} kvar`,
        bank: { ...base, steps: [{ kvar: up }] },
        belowTarget: false,
        notes: [],
      };
    }
    const down = [...STANDARD_UNIT_KVAR].reverse().find((s) => s <= site.kvar) ?? null;
    if (down !== null) {
      return {
        arrangement: "fixed",
        reason: `the next standard unit up (${up} kvar) would make the site lead; ${down} kvar is the largest that does not, and falls short of the target`,
        bank: { ...base, steps: [{ kvar: down }] },
        belowTarget: true,
        notes: [],
      };
    }
    return null;
  }

  let best: { n: number; size: number; excess: number } | null = null;
  for (let n = AUTOMATIC_MIN_STEPS; n <= AUTOMATIC_MAX_STEPS; n++) {
    const size = STANDARD_UNIT_KVAR.find((s) => s * n >= kvarRequired - 1e-9);
    if (size === undefined) continue;
    const excess = size * n - kvarRequired;
    if (best === null || excess < best.excess - 1e-9) best = { n, size, excess };
  }
  if (best === null) {
    // Beyond 12 × 100 kvar: steps of the largest unit; more steps than a single controller usually has, say so.
    const n = Math.ceil(kvarRequired / LARGEST_UNIT);
    best = { n, size: LARGEST_UNIT, excess: n * LARGEST_UNIT - kvarRequired };
  }
  const notes =
    best.n > AUTOMATIC_MAX_STEPS
      ? [`${best.n} steps of ${best.size} kvar are more than one ${AUTOMATIC_MAX_STEPS}-step controller switches: split the bank, or combine units into larger steps`]
      : [];
  const why =
    kvarRequired > LARGEST_UNIT
      ? `${kvarRequired.toFixed(1)} kvar is more than one standard unit`
      : `${kvarRequired.toFixed(1)} kvar is ${(share * 100).toFixed(1)} % of the ${referenceName} kVA (> 15 %)`;
  return {
    arrangement: "automatic",
    reason: `${why}: an automatic bank of ${best.n} × ${best.size} kvar steps, switched by a PF controller so it follows the load`,
    bank: { ...base, steps: Array.from({ length: best.n }, () => ({ kvar: best.size })) },
    belowTarget: false,
    notes,
  };
}
