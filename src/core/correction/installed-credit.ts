/**
 * Credit for the banks already installed: what they delivered during the readings, what the uncorrected site
 * needs, what is left to buy once they are restored, which repairs come first, and — on a leading site — which
 * energised steps to take out.
 */
import { apparentKVA, senseOfKvar, tanPhi, type Sense } from "../conventions.js";
import type { InstalledBankResult } from "../bank/installed.js";

export interface RepairItem {
  bank: string;
  step: number;
  status: "failed" | "degraded" | "unbalanced";
  /** kvar at the system voltage the repair restores: rated × (1 − measured/expected current). */
  restoresKvar: number;
  finding: string;
}

export interface LeadingRelief {
  /** Energised steps to take out of service (a fixed bank's one step: remove or disconnect the unit). */
  takeOutOfService: { bank: string; step: number; control: "fixed" | "automatic"; kvar: number }[];
  kvarRemoved: number;
  kvarAfter: number;
  pfAfter: number;
  senseAfter: Sense;
  /** False when even every energised step out leaves the site leading beyond the target. */
  reachesTarget: boolean;
}

export interface InstalledCredit {
  /** kvar the energised steps delivered during the readings (measured where given, else rated at the read voltage). */
  kvarInstalledInService: number;
  /** kvar of installed banks the site readings already include (added back to find the uncorrected site). */
  kvarIncludedInReadings: number;
  /** What the uncorrected site needs to reach the target: max(0, Q_site + included − P·tan φ_target). */
  kvarRequiredTotal: number;
  /** Rated kvar of every installed step at the system voltage: the installed banks restored and fully used. */
  kvarInstalledRated: number;
  /** What remains to buy: max(0, required total − installed rated). */
  kvarAdditional: number;
  /** Failed, unbalanced or degraded steps, largest restored kvar first: repair them before buying new kvar. */
  repairFirst: RepairItem[];
  kvarRestoredByRepair: number;
  leadingRelief?: LeadingRelief;
  /** Which readings were taken to include which banks. */
  basisNote: string;
}

interface SiteLike {
  kW: number;
  kvar: number;
  basis: "sum_of_loads" | "service_entrance";
}

/**
 * A service-entrance reading sees every energised bank downstream of it; readings at the loads see only a motor's
 * own terminal unit (connected on the motor side of the point read: the usual terminal connection, stated).
 */
function includedKvar(site: SiteLike, banks: readonly InstalledBankResult[], loadLabels: readonly string[]): number {
  return banks.reduce((s, b) => {
    if (site.basis === "service_entrance") return s + b.deliveredKvar;
    return b.location === "motor" && b.loadLabel !== undefined && loadLabels.includes(b.loadLabel) ? s + b.deliveredKvar : s;
  }, 0);
}

export function installedCredit(
  site: SiteLike,
  targetPF: number,
  banks: readonly InstalledBankResult[],
  loadLabels: readonly string[],
): InstalledCredit {
  const allowed = site.kW * tanPhi(targetPF);
  const included = includedKvar(site, banks, loadLabels);
  // Power triangle at constant kW: Q_c = Q_uncorrected − P·tan(acos PF_target).
  const kvarRequiredTotal = Math.max(0, site.kvar + included - allowed);
  const kvarInstalledRated = banks.reduce((s, b) => s + b.ratedKvarAtSystem, 0);
  const repairFirst: RepairItem[] = [];
  for (const b of banks) {
    for (const st of b.steps) {
      if (st.status !== "failed" && st.status !== "degraded" && st.status !== "unbalanced") continue;
      // kvar ∝ current at a given voltage, so the shortfall is the current's shortfall.
      const restoresKvar = Math.max(0, st.ratedKvarAtSystem * (1 - (st.currentPct ?? 100) / 100));
      repairFirst.push({ bank: b.label, step: st.step, status: st.status, restoresKvar, finding: st.finding });
    }
  }
  repairFirst.sort((a, b) => b.restoresKvar - a.restoresKvar);
  const credit: InstalledCredit = {
    kvarInstalledInService: banks.reduce((s, b) => s + b.deliveredKvar, 0),
    kvarIncludedInReadings: included,
    kvarRequiredTotal,
    kvarInstalledRated,
    kvarAdditional: Math.max(0, kvarRequiredTotal - kvarInstalledRated),
    repairFirst,
    kvarRestoredByRepair: repairFirst.reduce((s, r) => s + r.restoresKvar, 0),
    basisNote:
      site.basis === "service_entrance"
        ? "the service-entrance reading includes every energised installed step; their delivered kvar is added back to find the uncorrected site"
        : "readings at the loads include only a motor's own terminal unit (connected on the motor side of the point read); service and group banks are outside them",
  };
  const relief = leadingRelief(site, allowed, banks);
  if (relief) credit.leadingRelief = relief;
  return credit;
}

/** Largest number of energised steps searched exhaustively (2^16 subsets); beyond it, largest steps first. */
const EXHAUSTIVE_STEPS = 16;

/**
 * A site leading beyond the target with steps energised: the set of energised steps whose removal brings the
 * site within the target band (|Q| ≤ P·tan φ_target) with the fewest steps, then the least kvar removed.
 */
function leadingRelief(site: SiteLike, allowedKvar: number, banks: readonly InstalledBankResult[]): LeadingRelief | undefined {
  if (site.kvar >= -allowedKvar) return undefined;
  const on = banks.flatMap((b) =>
    b.steps.filter((s) => s.inService).map((s) => ({ bank: b.label, step: s.step, control: b.control, kvar: s.measuredKvar ?? s.expectedKvar })),
  );
  if (on.length === 0) return undefined;
  const within = (removed: number) => Math.abs(site.kvar + removed) <= allowedKvar + 1e-9;
  let best: typeof on | undefined;
  let bestKvar = Infinity;
  if (on.length <= EXHAUSTIVE_STEPS) {
    for (let mask = 1; mask < 1 << on.length; mask++) {
      const pick = on.filter((_, i) => mask & (1 << i));
      const kvar = pick.reduce((s, x) => s + x.kvar, 0);
      if (!within(kvar)) continue;
      if (!best || pick.length < best.length || (pick.length === best.length && kvar < bestKvar)) ((best = pick), (bestKvar = kvar));
    }
  }
  if (!best) {
    // Nothing lands in the band (or too many steps to search): remove largest first until no longer leading beyond it.
    best = [];
    bestKvar = 0;
    for (const s of [...on].sort((a, b) => b.kvar - a.kvar)) {
      if (site.kvar + bestKvar >= -allowedKvar) break;
      best.push(s);
      bestKvar += s.kvar;
    }
  }
  const kvarAfter = site.kvar + bestKvar;
  const kVA = apparentKVA(site.kW, kvarAfter);
  return {
    takeOutOfService: best,
    kvarRemoved: bestKvar,
    kvarAfter,
    pfAfter: kVA > 0 ? site.kW / kVA : 1,
    senseAfter: senseOfKvar(kvarAfter, kVA),
    reachesTarget: within(bestKvar),
  };
}
