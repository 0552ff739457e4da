/**
 * Resonance of every combination the controllers can switch when installed and new capacitors share a bus:
 * plain and detuned branches together, which the one-reactor closed form cannot describe.
 */
import { nearHarmonic } from "./resonance.js";

export interface Branch {
  /** Capacitor kvar at the system voltage and frequency, before the reactor's rise (Q_C). */
  capacitorKvar: number;
  /** Reactor p = X_L/X_C; 0 for a plain branch. */
  reactorFraction: number;
}

/**
 * Tuning orders closer than this, relative, count as one: under any damping the model can have, two series
 * resonances that near make one dip (its sharpest feature is some 1e-4 wide in h/h_r: extrema.ts), and the lossless
 * parallel resonance squeezed between them is no real one. Equal reactor percentages on capacitors of different
 * kvar give tuning orders a rounding apart, so "equal" needs a tolerance. Own bound, no source.
 */
export const SAME_TUNING_REL = 2.5e-5;

/**
 * Parallel resonance orders of the source with capacitor branches on one bus, lossless: the orders where the
 * branches' capacitive susceptance equals the source's inductive one, Σ Q_i·h/(1 − p_i·h²) = S_sc/h
 * (each branch X(h) = p·X_C·h − X_C/h with X_C = V²/Q_C; source X_s·h with X_s = V²/S_sc). f(h) = LHS − RHS rises
 * between consecutive branch tuning orders 1/√p (its derivative is positive term by term), from −∞ to +∞: one root
 * in each interval, and one above the highest tuning order when a plain branch is present. With one p this is the
 * closed form h = √(1/(Q_C/S_sc + p)).
 */
export function parallelResonanceOrders(branches: readonly Branch[], shortCircuitKVA: number, maxOrder = 50): number[] {
  // One branch (every stage of a bank studied alone): the closed form below, without grouping by reactor value.
  if (branches.length === 1) {
    const b = branches[0]!;
    return b.capacitorKvar > 0 ? singleReactorResonance(b.reactorFraction, b.capacitorKvar, shortCircuitKVA, maxOrder) : [];
  }
  // Branches with the same p add (Q_i·h/(1 − p·h²) is linear in Q_i): one term per reactor value, tuning orders
  // within SAME_TUNING_REL of each other being one value.
  const byP = new Map<number, number>();
  for (const b of branches) if (b.capacitorKvar > 0) byP.set(b.reactorFraction, (byP.get(b.reactorFraction) ?? 0) + b.capacitorKvar);
  const live: Branch[] = [];
  for (const [reactorFraction, capacitorKvar] of byP) {
    const same = reactorFraction > 0 ? live.find((b) => b.reactorFraction > 0 && sameTuning(b.reactorFraction, reactorFraction)) : undefined;
    if (same) same.capacitorKvar += capacitorKvar;
    else live.push({ reactorFraction, capacitorKvar });
  }
  if (live.length === 0) return [];
  if (live.length === 1) return singleReactorResonance(live[0]!.reactorFraction, live[0]!.capacitorKvar, shortCircuitKVA, maxOrder);
  const f = (h: number) => live.reduce((s, b) => s + (b.capacitorKvar * h) / (1 - b.reactorFraction * h * h), 0) - shortCircuitKVA / h;
  const poles = [...new Set(live.filter((b) => b.reactorFraction > 0).map((b) => 1 / Math.sqrt(b.reactorFraction)))].sort((a, b) => a - b);
  const hasPlain = live.some((b) => b.reactorFraction === 0);
  const edges = [0, ...poles, ...(hasPlain ? [maxOrder] : [])];
  const roots: number[] = [];
  for (let i = 0; i + 1 < edges.length; i++) {
    const lo0 = edges[i]!;
    const hi0 = edges[i + 1]!;
    // bisection inside the open interval; f is monotonic there
    let lo = lo0 + (hi0 - lo0) * 1e-12 + 1e-12;
    let hi = hi0 - (hi0 - lo0) * 1e-12;
    // an interval too narrow to hold a bracket would give a "root" outside it
    if (!(lo < hi && f(lo) < 0 && f(hi) > 0)) continue;
    for (let k = 0; k < 64 && hi - lo > 1e-12; k++) {
      const mid = (lo + hi) / 2;
      if (f(mid) < 0) lo = mid;
      else hi = mid;
    }
    const h = (lo + hi) / 2;
    if (h <= maxOrder) roots.push(h);
  }
  return roots;
}

/** Whether reactor fractions p₁, p₂ > 0 tune within SAME_TUNING_REL of each other (h = 1/√p). */
function sameTuning(p1: number, p2: number): boolean {
  return Math.sqrt(Math.max(p1, p2) / Math.min(p1, p2)) - 1 <= SAME_TUNING_REL;
}

/** One reactor value: the closed form h = √(S_sc/(Q + p·S_sc)), the only root (below 1/√p when p > 0). */
function singleReactorResonance(p: number, q: number, shortCircuitKVA: number, maxOrder: number): number[] {
  const h = Math.sqrt(shortCircuitKVA / (q + p * shortCircuitKVA));
  return Number.isFinite(h) && h > 0 && h <= maxOrder ? [h] : [];
}

/** A switchable unit on the bus: a step of an installed bank, or a stage option of the new bank. */
export interface SwitchUnit {
  /** Who it is, e.g. "MSB bank step 2". */
  label: string;
  capacitorKvar: number;
  reactorFraction: number;
  /** Delivered kvar (Q_C/(1 − p)). */
  effectiveKvar: number;
  /** Always energised (a fixed bank). */
  fixed: boolean;
}

export interface CombinedStage {
  /** Installed units energised, and the new bank's stage (0: none of its switched part). */
  installed: string[];
  newStage: number;
  totalKvar: number;
  resonanceOrders: number[];
  /** Present harmonic orders within ±10 % of a resonance. */
  nearHarmonics: number[];
}

export interface CombinedScreen {
  stagesScreened: number;
  /** Only the combinations near a present harmonic, fewest kvar first (at most 50). */
  hazards: CombinedStage[];
  /** The lowest and highest resonance over all combinations. */
  lowestOrder: number | null;
  highestOrder: number | null;
  truncated: boolean;
}

/** Most combinations screened (installed subsets × new stages); beyond it, the answer says so. */
export const MAX_COMBINATIONS = 4000;

/**
 * Every combination the controllers can switch: each installed switchable unit in or out (identical units counted,
 * not permuted), fixed units always in, times each option of the new bank (index 0: none of it). Calls `visit` with
 * the energised installed units and the option's index, skipping the empty bus, at most `max` times; returns
 * whether it stopped short.
 */
export function forEachCombination<U extends Pick<SwitchUnit, "capacitorKvar" | "reactorFraction" | "fixed">>(
  installed: readonly U[],
  newOptionCount: number,
  max: number,
  visit: (on: U[], newIndex: number) => void,
): { visited: number; truncated: boolean } {
  const fixed = installed.filter((u) => u.fixed);
  const groups = new Map<string, U[]>();
  for (const u of installed.filter((x) => !x.fixed)) {
    const key = `${u.capacitorKvar.toFixed(6)}|${u.reactorFraction}`;
    groups.set(key, [...(groups.get(key) ?? []), u]);
  }
  const kinds = [...groups.values()];
  const counts = kinds.map(() => 0);
  let visited = 0;
  // odometer over the counts of each kind of identical unit
  for (;;) {
    const on = [...fixed, ...kinds.flatMap((g, i) => g.slice(0, counts[i]))];
    for (let n = 0; n < newOptionCount; n++) {
      if (on.length === 0 && n === 0) continue;
      if (visited >= max) return { visited, truncated: true };
      visited++;
      visit(on, n);
    }
    let i = 0;
    while (i < kinds.length && counts[i] === kinds[i]!.length) counts[i++] = 0;
    if (i === kinds.length) return { visited, truncated: false };
    counts[i] = (counts[i] ?? 0) + 1;
  }
}

/** Every combination (forEachCombination), screened for parallel resonance near a present harmonic. */
export function screenCombinedStages(
  installed: readonly SwitchUnit[],
  newStages: readonly { capacitorKvar: number; effectiveKvar: number; reactorFraction: number }[],
  shortCircuitKVA: number,
  harmonicOrders: readonly number[],
): CombinedScreen {
  const newOptions = [{ capacitorKvar: 0, effectiveKvar: 0, reactorFraction: 0 }, ...newStages];
  const hazards: CombinedStage[] = [];
  let lowest: number | null = null;
  let highest: number | null = null;
  const { visited, truncated } = forEachCombination(installed, newOptions.length, MAX_COMBINATIONS, (on, n) => {
    const stage = newOptions[n]!;
    const branches: Branch[] = [...on, ...(n > 0 ? [stage] : [])].map((u) => ({
      capacitorKvar: u.capacitorKvar,
      reactorFraction: u.reactorFraction,
    }));
    const orders = parallelResonanceOrders(branches, shortCircuitKVA);
    for (const h of orders) {
      lowest = lowest === null ? h : Math.min(lowest, h);
      highest = highest === null ? h : Math.max(highest, h);
    }
    const near = [...new Set(orders.map((h) => nearHarmonic(h, harmonicOrders)).filter((x): x is number => x !== null))];
    if (near.length > 0 && on.length > 0) {
      hazards.push({
        installed: on.map((u) => u.label),
        newStage: n,
        totalKvar: on.reduce((s, u) => s + u.effectiveKvar, 0) + (n > 0 ? stage.effectiveKvar : 0),
        resonanceOrders: orders,
        nearHarmonics: near,
      });
    }
  });
  hazards.sort((a, b) => a.totalKvar - b.totalKvar);
  return { stagesScreened: visited, hazards: hazards.slice(0, 50), lowestOrder: lowest, highestOrder: highest, truncated };
}
