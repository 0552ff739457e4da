/**
 * Installed banks: what a healthy step should draw at the voltage and frequency it was read at, and what the
 * measured currents say about its capacitance, its phase balance and its health.
 */
import type { Phases } from "../conventions.js";
import type { BankReadingInput, InstalledBankInput, SystemInput } from "../inputs.js";
import { warning, type InputIssue, type Warning } from "../warnings.js";
import { capacitorCurrentA, effectiveKvarWithReactor, kvarAtFrequency, kvarAtVoltage } from "./capacitor.js";

export type StepStatus = "healthy" | "degraded" | "failed" | "unbalanced" | "not_measured";

/**
 * Below 95 % of the rated capacitance a step is degraded: the lower capacitance tolerance of IEC 60831-1:2014
 * (−5 % / +10 % for units and banks up to 100 kvar; from memory). IEEE Std 18-2012 allows no shortfall at all
 * (0 / +10 %, from memory), but a clamp meter's few percent of uncertainty would then call every new step degraded.
 */
export const DEGRADED_BELOW_PCT = 95;
/** Below half its rated capacitance a step is failed, whatever the phases say (common practice, no source). */
export const FAILED_BELOW_PCT = 50;
/** A phase under 10 % of the expected current is dead: a blown fuse or an open contactor pole (common practice, no source). */
export const PHASE_DEAD_BELOW_PCT = 10;
/** A phase more than 10 % from the mean of the three is unbalanced (common practice, no source). */
export const UNBALANCED_ABOVE_PCT = 10;
/** A measured current above 3 × the expected is not a capacitor step's current: rejected as a misreading. */
export const MAX_CURRENT_RATIO = 3;

export interface InstalledStepResult {
  /** 1-based. */
  step: number;
  nameplateKvar: number;
  /** What a healthy step delivers at the system voltage and frequency, reactor included. */
  ratedKvarAtSystem: number;
  /** Energised while the site readings were taken. */
  inService: boolean;
  /** A healthy step's line current at the measured voltage (or the system voltage) and frequency. */
  expectedCurrentA: number;
  /** A healthy step's kvar at the measured voltage (what the expected current carries). */
  expectedKvar: number;
  /** Mean of the measured phase currents (or the one figure). */
  measuredCurrentA?: number;
  phaseCurrentsA?: number[];
  /** measured / expected × 100. */
  currentPct?: number;
  /** The measured capacitance as a share of the rated: = currentPct on a plain step; corrected for the reactor on a detuned one. */
  capacitancePct?: number;
  /** Largest phase deviation from the mean, percent of the mean (three phase figures only). */
  unbalancePct?: number;
  /** kvar the step delivered as measured: √3·V·I (V·I on one phase). */
  measuredKvar?: number;
  status: StepStatus;
  /** Why the status, in plain words with the threshold. */
  finding: string;
}

export interface InstalledBankResult {
  label: string;
  location: InstalledBankInput["location"];
  group?: string;
  loadLabel?: string;
  control: InstalledBankInput["control"];
  reactorPct: number;
  nameplateKvar: number;
  ratedKvarAtSystem: number;
  /** Rated kvar at the system voltage of the steps energised during the readings. */
  inServiceKvar: number;
  /** Sum of the measured steps' kvar; absent when no step was measured. */
  measuredKvar?: number;
  /** kvar the energised steps delivered during the readings: measured where given, else expected at the read voltage. */
  deliveredKvar: number;
  /** Voltage the expected currents are worked at, and whether it was measured. */
  voltageV: number;
  voltageMeasured: boolean;
  /** Whether a reading of the bank was given at all. */
  read: boolean;
  steps: InstalledStepResult[];
}

/**
 * Expected step current from the nameplate: Q = Q_r·(V/V_r)²·(f/f_r) (IEEE Std 18 rating basis: Q = V²·2πfC),
 * divided by (1 − p) behind a reactor of p (series LC: the bus sees X_C − X_L = X_C·(1 − p)), then
 * I = Q/(√3·V) on three phases, Q/V on one (circuit theory).
 */
export function expectedStep(
  nameplateKvar: number,
  bank: Pick<InstalledBankInput, "ratedVoltageV" | "ratedFrequencyHz" | "reactorPct">,
  voltageV: number,
  frequencyHz: number,
  phases: Phases,
): { kvar: number; currentA: number } {
  const p = (bank.reactorPct ?? 0) / 100;
  const qc = kvarAtFrequency(kvarAtVoltage(nameplateKvar, voltageV, bank.ratedVoltageV), frequencyHz, bank.ratedFrequencyHz ?? frequencyHz);
  const kvar = effectiveKvarWithReactor(qc, p);
  return { kvar, currentA: capacitorCurrentA(kvar, voltageV, phases) };
}

/**
 * Capacitance share k from the current share r. Plain: I ∝ C, so k = r. Behind a reactor of p the branch current
 * is V·ωC/(1 − ω²LC): with C' = k·C, r = k(1 − p)/(1 − k·p), so k = r/(1 − p + r·p) (algebra on the series LC).
 */
export function capacitanceShare(currentShare: number, reactorFraction: number): number {
  return currentShare / (1 - reactorFraction + currentShare * reactorFraction);
}

/** Largest deviation of a phase from the mean, percent of the mean (0 for one figure or a zero mean). */
export function unbalancePct(amps: readonly number[]): number {
  if (amps.length < 2) return 0;
  const mean = amps.reduce((s, a) => s + a, 0) / amps.length;
  if (mean <= 0) return 0;
  return (Math.max(...amps.map((a) => Math.abs(a - mean))) / mean) * 100;
}

/** Status from the measured currents, in the order a fitter would act on: a dead phase or a collapsed step, then unbalance, then drift. */
export function stepStatus(phaseAmps: readonly number[], expectedA: number, capacitancePct: number): { status: StepStatus; finding: string } {
  const dead = phaseAmps.findIndex((a) => (a / expectedA) * 100 < PHASE_DEAD_BELOW_PCT);
  if (dead >= 0) {
    const which = phaseAmps.length > 1 ? `phase ${"ABC"[dead]} reads ${phaseAmps[dead]!.toFixed(1)} A` : `it reads ${phaseAmps[0]!.toFixed(1)} A`;
    return {
      status: "failed",
      finding: `${which}, under ${PHASE_DEAD_BELOW_PCT} % of the expected ${expectedA.toFixed(1)} A: a blown fuse, an open contactor pole or a failed unit`,
    };
  }
  if (capacitancePct < FAILED_BELOW_PCT) {
    return {
      status: "failed",
      finding: `capacitance ${capacitancePct.toFixed(0)} % of rated, under ${FAILED_BELOW_PCT} % (common practice): replace the step's units`,
    };
  }
  const u = unbalancePct(phaseAmps);
  if (u > UNBALANCED_ABOVE_PCT) {
    return {
      status: "unbalanced",
      finding: `phases differ by up to ${u.toFixed(1)} % from their mean, above ${UNBALANCED_ABOVE_PCT} % (common practice): a failed unit or fuse in one phase`,
    };
  }
  if (capacitancePct < DEGRADED_BELOW_PCT) {
    return {
      status: "degraded",
      finding: `capacitance ${capacitancePct.toFixed(1)} % of rated, below the ${DEGRADED_BELOW_PCT} % lower tolerance (IEC 60831-1): the units are losing capacitance`,
    };
  }
  return { status: "healthy", finding: `capacitance ${capacitancePct.toFixed(1)} % of rated, within tolerance` };
}

export interface InstalledOutcome {
  banks: InstalledBankResult[];
  issues: InputIssue[];
  warnings: Warning[];
}

/** Checks of a list of banks as a whole (unique labels) and of fields that depend on each other; paths from the list. */
export function installedBankIssues(banks: readonly InstalledBankInput[], banksPath: (string | number)[] = ["installedBanks"]): InputIssue[] {
  const issues: InputIssue[] = [];
  const labels = new Set<string>();
  banks.forEach((b, i) => {
    if (labels.has(b.label))
      issues.push({ path: [...banksPath, i, "label"], message: `bank label "${b.label}" is used twice: labels are how readings refer to a bank` });
    labels.add(b.label);
    if (b.location === "group" && !b.group)
      issues.push({ path: [...banksPath, i, "group"], message: "a group bank needs the group (MCC or feeder) it corrects" });
    if (b.location === "motor" && !b.loadLabel)
      issues.push({ path: [...banksPath, i, "loadLabel"], message: "a motor-terminal bank needs the loadLabel of its motor" });
    if (b.control === "fixed" && b.steps.length !== 1)
      issues.push({ path: [...banksPath, i, "steps"], message: "a fixed bank is one step: give its total kvar as one step" });
  });
  return issues;
}

/** Checks that need the banks beside the readings (the schema checks each field alone). */
function readingIssues(
  banks: readonly InstalledBankInput[],
  readings: readonly BankReadingInput[],
  system: SystemInput,
  banksPath: string,
): InputIssue[] {
  const issues: InputIssue[] = installedBankIssues(banks, [banksPath]);
  const labels = new Map<string, number>();
  banks.forEach((b, i) => {
    if (!labels.has(b.label)) labels.set(b.label, i);
  });
  const seen = new Set<string>();
  readings.forEach((r, i) => {
    const at = (...p: (string | number)[]) => ["bankReadings", i, ...p];
    const bi = labels.get(r.bank);
    if (bi === undefined) {
      const known = [...labels.keys()];
      issues.push({
        path: at("bank"),
        message:
          known.length > 0
            ? `no installed bank is labelled "${r.bank}" (known: ${known.join(", ")})`
            : `no installed bank is labelled "${r.bank}": the building has no installed banks`,
      });
      return;
    }
    if (seen.has(r.bank)) issues.push({ path: at("bank"), message: `bank "${r.bank}" is read twice: give one reading per bank` });
    seen.add(r.bank);
    const bank = banks[bi]!;
    const n = bank.steps.length;
    const inService = new Set<number>();
    r.inServiceSteps.forEach((s, j) => {
      if (s > n)
        issues.push({ path: at("inServiceSteps", j), message: `step ${s} is outside bank "${r.bank}", which has ${n} step${n > 1 ? "s" : ""}` });
      else if (inService.has(s)) issues.push({ path: at("inServiceSteps", j), message: `step ${s} is listed twice` });
      inService.add(s);
    });
    const measured = new Set<number>();
    const v = r.voltageV ?? system.voltageV;
    (r.stepCurrents ?? []).forEach((c, j) => {
      if (c.step > n) {
        issues.push({
          path: at("stepCurrents", j, "step"),
          message: `step ${c.step} is outside bank "${r.bank}", which has ${n} step${n > 1 ? "s" : ""}`,
        });
        return;
      }
      if (measured.has(c.step)) issues.push({ path: at("stepCurrents", j, "step"), message: `step ${c.step} is measured twice` });
      measured.add(c.step);
      if (Array.isArray(c.amps) && system.phases === 1) {
        issues.push({ path: at("stepCurrents", j, "amps"), message: "the system is single-phase: give one current figure, not one per phase" });
        return;
      }
      const expected = expectedStep(bank.steps[c.step - 1]!.kvar, bank, v, system.frequencyHz, system.phases).currentA;
      const amps = Array.isArray(c.amps) ? c.amps : [c.amps];
      amps.forEach((a, k) => {
        if (a > MAX_CURRENT_RATIO * expected) {
          issues.push({
            path: Array.isArray(c.amps) ? at("stepCurrents", j, "amps", k) : at("stepCurrents", j, "amps"),
            message: `${a} A is more than ${MAX_CURRENT_RATIO} × the ${expected.toFixed(1)} A a healthy ${bank.steps[c.step - 1]!.kvar} kvar step draws at ${v} V: check the clamp's range and the step number`,
          });
        }
      });
    });
  });
  return issues;
}

/**
 * Every installed bank, step by step: expected current at the read voltage, measured capacitance, unbalance,
 * status; rejected (as InputIssues naming the field) when a reading cannot belong to the banks given.
 */
export function evaluateInstalledBanks(
  banks: readonly InstalledBankInput[],
  readings: readonly BankReadingInput[],
  system: SystemInput,
  banksPath = "installedBanks",
): InstalledOutcome {
  const issues = readingIssues(banks, readings, system, banksPath);
  if (issues.length > 0) return { banks: [], issues, warnings: [] };
  const warnings: Warning[] = [];
  const results = banks.map((bank, bi) => {
    const reading = readings.find((r) => r.bank === bank.label);
    const p = (bank.reactorPct ?? 0) / 100;
    const voltageV = reading?.voltageV ?? system.voltageV;
    if (reading?.voltageV !== undefined && Math.abs(reading.voltageV / system.voltageV - 1) > 0.1) {
      warnings.push(
        warning(
          "bank_voltage_far_from_system",
          `bank "${bank.label}" was read at ${reading.voltageV} V, more than 10 % from the ${system.voltageV} V system: check the meter's connection (line-to-line on three phases)`,
          `bankReadings.${readings.indexOf(reading)}.voltageV`,
        ),
      );
    }
    const steps = bank.steps.map((s, i): InstalledStepResult => {
      const step = i + 1;
      const atSystem = expectedStep(s.kvar, bank, system.voltageV, system.frequencyHz, system.phases);
      const atRead = expectedStep(s.kvar, bank, voltageV, system.frequencyHz, system.phases);
      const base = {
        step,
        nameplateKvar: s.kvar,
        ratedKvarAtSystem: atSystem.kvar,
        inService: reading?.inServiceSteps.includes(step) ?? false,
        expectedCurrentA: atRead.currentA,
        expectedKvar: atRead.kvar,
      };
      const c = reading?.stepCurrents?.find((x) => x.step === step);
      if (!c) return { ...base, status: "not_measured", finding: "no current was measured" };
      const amps = Array.isArray(c.amps) ? c.amps : [c.amps];
      const mean = amps.reduce((a, b) => a + b, 0) / amps.length;
      const currentShare = mean / atRead.currentA;
      const capacitancePct = capacitanceShare(currentShare, p) * 100;
      const { status, finding } = stepStatus(amps, atRead.currentA, capacitancePct);
      return {
        ...base,
        measuredCurrentA: mean,
        phaseCurrentsA: [...amps],
        currentPct: currentShare * 100,
        capacitancePct,
        ...(amps.length > 1 ? { unbalancePct: unbalancePct(amps) } : {}),
        measuredKvar: atRead.kvar * currentShare,
        status,
        finding,
      };
    });
    const sum = (f: (s: InstalledStepResult) => number, only: (s: InstalledStepResult) => boolean = () => true) =>
      steps.filter(only).reduce((t, s) => t + f(s), 0);
    const measuredSteps = steps.filter((s) => s.measuredKvar !== undefined);
    if (!reading) {
      warnings.push(
        warning(
          "bank_not_read",
          `no reading says which steps of bank "${bank.label}" were energised: taken as out of service during the readings (give bankReadings)`,
          `${banksPath}.${bi}`,
        ),
      );
    }
    return {
      label: bank.label,
      location: bank.location,
      ...(bank.group ? { group: bank.group } : {}),
      ...(bank.loadLabel ? { loadLabel: bank.loadLabel } : {}),
      control: bank.control,
      reactorPct: bank.reactorPct ?? 0,
      nameplateKvar: sum((s) => s.nameplateKvar),
      ratedKvarAtSystem: sum((s) => s.ratedKvarAtSystem),
      inServiceKvar: sum(
        (s) => s.ratedKvarAtSystem,
        (s) => s.inService,
      ),
      ...(measuredSteps.length > 0
        ? {
            measuredKvar: sum(
              (s) => s.measuredKvar ?? 0,
              (s) => s.measuredKvar !== undefined,
            ),
          }
        : {}),
      deliveredKvar: sum(
        (s) => s.measuredKvar ?? s.expectedKvar,
        (s) => s.inService,
      ),
      voltageV,
      voltageMeasured: reading?.voltageV !== undefined,
      read: reading !== undefined,
      steps,
    };
  });
  return { banks: results, issues: [], warnings };
}
