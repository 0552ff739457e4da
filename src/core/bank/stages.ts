import {
  bankReactanceOhm,
  capacitancePerPhase,
  capacitanceSinglePhaseUF,
  capacitorCurrentA,
  capacitorVoltageWithReactorV,
  effectiveKvarWithReactor,
  IEEE18_MAX_VOLTAGE_RATIO,
  kvarAtFrequency,
  kvarAtVoltage,
  tuningOrder,
} from "./capacitor.js";
import type { ProposedBankInput, SystemInput } from "../inputs.js";
import { nearHarmonic, parallelResonanceOrder, voltageRisePct } from "../harmonics/resonance.js";
import { compactList, ieee18Severity, warning, type Warning } from "../warnings.js";

export interface BankStage {
  /** 1-based: stage n has steps 1…n switched in. */
  stage: number;
  cumulativeNameplateKvar: number;
  /** Capacitor kvar at system voltage and frequency, before the reactor's voltage rise. */
  cumulativeCapacitorKvar: number;
  /** Effective kvar delivered to the bus. */
  cumulativeKvar: number;
  /** Parallel resonance order with the source; null when the source strength is unknown. */
  resonanceOrder: number | null;
  resonanceHz: number | null;
  /** The present harmonic order within ±10 % of the resonance, or null. */
  nearHarmonic: number | null;
  voltageRisePct: number | null;
}

export interface BankAnalysis {
  ratedVoltageV: number;
  ratedFrequencyHz: number;
  reactorPct: number;
  steps: { kvar: number }[];
  nameplateKvar: number;
  /** Capacitor kvar at system voltage and frequency: Q_r·(V/V_r)²·(f/f_r). */
  capacitorKvar: number;
  /** Delivered kvar: Q_C/(1 − p). */
  effectiveKvar: number;
  /** Fundamental capacitor terminal voltage U/(1 − p). */
  capacitorVoltageV: number;
  capacitorVoltagePctOfRated: number;
  tuningOrder: number | null;
  tuningHz: number | null;
  ratedCurrentA: number;
  capacitancePerPhase: { deltaUF: number; wyeUF: number };
  reactancePerPhaseOhm: number;
  stages: BankStage[];
}

export interface SourceContext {
  shortCircuitKVA: number | null;
  harmonicOrders: number[];
}

/** Analyse a bank stage by stage: steps switch in in order, each stage the cumulative sum. */
export function analyseBank(
  bank: ProposedBankInput,
  system: SystemInput,
  source: SourceContext,
  pathPrefix: string,
): { analysis: BankAnalysis; warnings: Warning[] } {
  const warnings: Warning[] = [];
  const p = (bank.reactorPct ?? 0) / 100;
  const ratedFrequencyHz = bank.ratedFrequencyHz ?? system.frequencyHz;
  const atBus = (kvar: number) => kvarAtFrequency(kvarAtVoltage(kvar, system.voltageV, bank.ratedVoltageV), system.frequencyHz, ratedFrequencyHz);

  const nameplateKvar = bank.steps.reduce((s, x) => s + x.kvar, 0);
  const capacitorKvar = atBus(nameplateKvar);
  const capacitorVoltageV = capacitorVoltageWithReactorV(system.voltageV, p);
  const voltageRatio = capacitorVoltageV / bank.ratedVoltageV;

  // IEEE Std 18 permits 110 % rms voltage: above 100 % information, above 105 % a warning, above 110 % an error.
  const voltageSeverity = ieee18Severity(voltageRatio * 100, IEEE18_MAX_VOLTAGE_RATIO * 100);
  if (voltageSeverity === "error") {
    warnings.push(
      warning(
        "capacitor_overvoltage",
        `capacitor terminal voltage ${capacitorVoltageV.toFixed(0)} V is ${(voltageRatio * 100).toFixed(1)} % of its ${bank.ratedVoltageV} V rating, above the IEEE Std 18 limit of 110 %`,
        `${pathPrefix}.ratedVoltageV`,
        { severity: "error" },
      ),
    );
  } else if (voltageSeverity !== null) {
    warnings.push(
      warning(
        "capacitor_above_rated_voltage",
        `capacitor terminal voltage ${capacitorVoltageV.toFixed(0)} V exceeds its ${bank.ratedVoltageV} V rating (${(voltageRatio * 100).toFixed(1)} %): IEEE Std 18 permits up to 110 % for contingencies, not as a design basis${voltageSeverity === "warning" ? "; above 105 % little margin is left" : ""}`,
        `${pathPrefix}.ratedVoltageV`,
        { severity: voltageSeverity },
      ),
    );
  }
  if (ratedFrequencyHz !== system.frequencyHz) {
    warnings.push(
      warning(
        "capacitor_frequency_mismatch",
        `capacitors rated at ${ratedFrequencyHz} Hz on a ${system.frequencyHz} Hz system deliver ${((system.frequencyHz / ratedFrequencyHz) * 100).toFixed(0)} % of nameplate kvar`,
        `${pathPrefix}.ratedFrequencyHz`,
      ),
    );
  }

  const stages: BankStage[] = [];
  const resonant: { stage: number; kvar: number; order: number; near: number }[] = [];
  let cumulative = 0;
  bank.steps.forEach((step, i) => {
    cumulative += step.kvar;
    const qc = atBus(cumulative);
    const qEff = effectiveKvarWithReactor(qc, p);
    const h = source.shortCircuitKVA ? parallelResonanceOrder(qc, source.shortCircuitKVA, p) : null;
    const near = h === null ? null : nearHarmonic(h, source.harmonicOrders);
    if (near !== null && h !== null) resonant.push({ stage: i + 1, kvar: qEff, order: h, near });
    stages.push({
      stage: i + 1,
      cumulativeNameplateKvar: cumulative,
      cumulativeCapacitorKvar: qc,
      cumulativeKvar: qEff,
      resonanceOrder: h,
      resonanceHz: h === null ? null : h * system.frequencyHz,
      nearHarmonic: near,
      voltageRisePct: source.shortCircuitKVA ? voltageRisePct(qEff, source.shortCircuitKVA) : null,
    });
  });

  if (resonant.length > 0) warnings.push(resonanceWarning(resonant, `${pathPrefix}.steps`));

  const effectiveKvar = effectiveKvarWithReactor(capacitorKvar, p);
  const ht = p > 0 ? tuningOrder(p) : null;
  const analysis: BankAnalysis = {
    ratedVoltageV: bank.ratedVoltageV,
    ratedFrequencyHz,
    reactorPct: bank.reactorPct ?? 0,
    steps: bank.steps.map((s) => ({ kvar: s.kvar })),
    nameplateKvar,
    capacitorKvar,
    effectiveKvar,
    capacitorVoltageV,
    capacitorVoltagePctOfRated: voltageRatio * 100,
    tuningOrder: ht,
    tuningHz: ht === null ? null : ht * system.frequencyHz,
    ratedCurrentA: capacitorCurrentA(effectiveKvar, system.voltageV, system.phases),
    capacitancePerPhase:
      system.phases === 3
        ? capacitancePerPhase(nameplateKvar, bank.ratedVoltageV, ratedFrequencyHz)
        : singlePhase(capacitanceSinglePhaseUF(nameplateKvar, bank.ratedVoltageV, ratedFrequencyHz)),
    reactancePerPhaseOhm: bankReactanceOhm(capacitorKvar, system.voltageV),
    stages,
  };
  return { analysis, warnings };
}

/** One warning for the bank, listing every stage that resonates near a present harmonic (one concern, not one per stage). */
function resonanceWarning(resonant: { stage: number; kvar: number; order: number; near: number }[], path: string): Warning {
  const orders = [...new Set(resonant.map((r) => r.near))].sort((a, b) => a - b);
  const stages = resonant.map((r) => r.stage);
  const detail = resonant.map((r) => `stage ${r.stage} (${r.kvar.toFixed(1)} kvar) at ${r.order.toFixed(2)}`).join("; ");
  return warning(
    "resonance_near_harmonic",
    `${stages.length === 1 ? "stage" : "stages"} ${compactList(stages)} resonate with the source within 10 % of the ${orders.map(ordinal).join(" and ")} harmonic${orders.length > 1 ? "s" : ""} the site produces: ${detail}`,
    path,
    { subjects: stages.map((n) => `stage ${n}`) },
  );
}

/** A single-phase bank is one capacitor: both fields carry its value. */
function singlePhase(uF: number): { deltaUF: number; wyeUF: number } {
  return { deltaUF: uF, wyeUF: uF };
}

function ordinal(n: number): string {
  const s = n % 100 >= 11 && n % 100 <= 13 ? "th" : (({ 1: "st", 2: "nd", 3: "rd" } as Record<number, string>)[n % 10] ?? "th");
  return `${n}${s}`;
}
