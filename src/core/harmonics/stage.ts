/** Study of one bank, stage by stage (steps switched in cumulatively, in order), and its findings. */
import { capacitorBranch, capacitorKvarAtSystem, effectiveKvar } from "./branch.js";
import { busDistortion, type BusDistortion } from "./distortion.js";
import { capacitorDutyOnBus, type CapacitorDutyCheck, type DutyQuantity } from "./duty.js";
import type { InjectedCurrents } from "./injection.js";
import { checkIeee519, type Ieee519Check } from "./limits.js";
import { withBranches, type BusModel, type NetworkInput } from "./network.js";
import { ordersNearResonance, parallelResonanceOrder } from "./resonance.js";
import { tuningOrder } from "../bank/capacitor.js";
import { impedanceExtrema } from "./extrema.js";
import { resolveScanGrid, scanImpedance, type ImpedanceDip, type ResonancePeak, type ScanOptions } from "./scan.js";
import type { SpectrumLine } from "./study-types.js";

export interface CapacitorStepInput {
  /** Nameplate 3-phase kvar at the bank's rated voltage and frequency. */
  kvar: number;
}

export interface CapacitorBankInput {
  name: string;
  /** Nameplate voltage, line-to-line. */
  ratedVoltageV: number;
  /** Defaults to the system frequency. */
  ratedFrequencyHz?: number;
  /** Series reactor as percent of X_C; 0 for a plain bank. */
  reactorPct: number;
  steps: CapacitorStepInput[];
  /**
   * The steps to buy, nameplate kvar, when `steps` are the increments of every switchable total rather than the
   * physical steps (a designed bank's screen): a detuned proposal then also says what to buy in its place.
   */
  purchaseSteps?: CapacitorStepInput[];
}

export interface StudyContext {
  network: NetworkInput;
  model: BusModel;
  currents: InjectedCurrents;
  background: readonly SpectrumLine[];
  presentOrders: readonly number[];
  scan: ScanOptions;
  includeScanSeries: boolean;
  reactorQualityFactor: number;
}

export interface ScanSeries {
  orders: number[];
  impedanceOhm: number[];
}

export interface BusStudy {
  peaks: ResonancePeak[];
  dips: ImpedanceDip[];
  series?: ScanSeries;
  distortion: BusDistortion;
  ieee519: Ieee519Check;
  resonanceWithin10PctOf: number[];
}

export interface StageStudy extends BusStudy {
  stageNumber: number;
  nameplateKvar: number;
  capacitorKvarAtSystem: number;
  effectiveKvar: number;
  tuningOrder: number | null;
  estimatedResonanceOrder: number;
  duty: CapacitorDutyCheck;
}

export interface BankStudy {
  name: string;
  ratedVoltageV: number;
  ratedFrequencyHz: number;
  reactorPct: number;
  stages: StageStudy[];
}

export type FindingCode =
  "thd_v_exceeds_limit" | "individual_harmonic_exceeds_limit" | "capacitor_duty_exceeds_limit" | "capacitor_above_rating" | "resonance_near_harmonic";

export interface Finding {
  code: FindingCode;
  message: string;
  /** What failed, stable across stages (e.g. "thd", "order 13", "rmsCurrent"), for grouping. */
  subject: string;
  bankName?: string;
  stageNumber?: number;
}

/** The scan range of each options object, resolved once: every stage of a study shares it. */
/**
 * The scan range last resolved, by the options' values: every stage of every study shares one (sizing asks for the
 * same figures grid each time), and resolving validates and copies the options.
 */
let lastRange = { from: NaN as number | undefined, to: NaN as number | undefined, step: NaN as number | undefined, fromOrder: 0, toOrder: 0 };

/** The peaks and dips scanImpedance would report for these options (extremaInScanRange), the range resolved once. */
function extremaInRange(model: BusModel, options: ScanOptions): { peaks: ResonancePeak[]; dips: ImpedanceDip[] } {
  const r = lastRange;
  if (!(r.from === options.fromOrder && r.to === options.toOrder && r.step === options.stepOrder)) {
    const grid = resolveScanGrid(options);
    // the last grid point, as scanImpedance's own range ends there
    lastRange = {
      from: options.fromOrder,
      to: options.toOrder,
      step: options.stepOrder,
      fromOrder: grid.fromOrder,
      toOrder: grid.fromOrder + (grid.points - 1) * grid.stepOrder,
    };
  }
  return impedanceExtrema(model, lastRange.fromOrder, lastRange.toOrder);
}

export function studyBus(ctx: StudyContext, model: BusModel): BusStudy {
  // The dense series only when it is returned (the scan endpoint, the report's chart); the figures need no grid.
  const scan = ctx.includeScanSeries ? scanImpedance(model, ctx.scan) : null;
  const { peaks, dips } = scan ?? extremaInRange(model, ctx.scan);
  const distortion = busDistortion(model, ctx.currents, ctx.background);
  const study: BusStudy = {
    peaks,
    dips,
    distortion,
    ieee519: checkIeee519(distortion, model.voltageV),
    resonanceWithin10PctOf: ordersNearResonance(
      peaks.map((p) => p.order),
      ctx.presentOrders,
    ),
  };
  if (scan) study.series = { orders: Array.from(scan.ordersH), impedanceOhm: Array.from(scan.impedanceOhm) };
  return study;
}

export function studyBank(ctx: StudyContext, bank: CapacitorBankInput): BankStudy {
  const { voltageV, frequencyHz, shortCircuitKVA } = ctx.network;
  const ratedFrequencyHz = bank.ratedFrequencyHz ?? frequencyHz;
  const stages: StageStudy[] = [];
  let nameplateKvar = 0;
  for (let i = 0; i < bank.steps.length; i++) {
    nameplateKvar += bank.steps[i]!.kvar;
    const qc = capacitorKvarAtSystem(nameplateKvar, bank.ratedVoltageV, ratedFrequencyHz, voltageV, frequencyHz);
    // Steps of one bank share p and voltage, so their parallel combination is one branch of ΣQ.
    const branch = capacitorBranch(voltageV, qc, bank.reactorPct, ctx.reactorQualityFactor);
    const bus = studyBus(ctx, withBranches(ctx.model, [branch]));
    const duty = capacitorDutyOnBus(
      {
        voltageV,
        frequencyHz,
        phases: ctx.model.phases,
        rating: { ratedVoltageV: bank.ratedVoltageV, ratedKvar: nameplateKvar, ratedFrequencyHz },
        reactorPct: bank.reactorPct,
        reactorQualityFactor: ctx.reactorQualityFactor,
      },
      bus.distortion.lines,
    );
    // the bus study's fields, then the stage's own, written out rather than spread (every stage passes here)
    const stage = {
      peaks: bus.peaks,
      dips: bus.dips,
      distortion: bus.distortion,
      ieee519: bus.ieee519,
      resonanceWithin10PctOf: bus.resonanceWithin10PctOf,
    } as StageStudy;
    if (bus.series !== undefined) stage.series = bus.series;
    stage.stageNumber = i + 1;
    stage.nameplateKvar = nameplateKvar;
    stage.capacitorKvarAtSystem = qc;
    stage.effectiveKvar = effectiveKvar(qc, bank.reactorPct);
    stage.tuningOrder = bank.reactorPct > 0 ? tuningOrder(bank.reactorPct / 100) : null;
    stage.estimatedResonanceOrder = parallelResonanceOrder(qc, shortCircuitKVA, bank.reactorPct / 100);
    stage.duty = duty;
    stages.push(stage);
  }
  return { name: bank.name, ratedVoltageV: bank.ratedVoltageV, ratedFrequencyHz, reactorPct: bank.reactorPct, stages };
}

const f1 = (x: number): string => x.toFixed(1);

export function busFindings(bus: BusStudy, where: string, at: Pick<Finding, "bankName" | "stageNumber">): Finding[] {
  const out: Finding[] = [];
  const { thd, limits } = bus.ieee519;
  if (!thd.pass)
    out.push({
      code: "thd_v_exceeds_limit",
      subject: "thd",
      message: `${where}: THD_v ${f1(thd.valuePct)} % exceeds the IEEE 519 limit of ${f1(thd.limitPct)} %`,
      ...at,
    });
  for (const line of bus.distortion.lines)
    if (line.voltagePct > limits.individualPct)
      out.push({
        code: "individual_harmonic_exceeds_limit",
        subject: `order ${line.order}`,
        message: `${where}: order ${line.order} at ${f1(line.voltagePct)} % exceeds the IEEE 519 individual limit of ${f1(limits.individualPct)} %`,
        ...at,
      });
  for (const n of bus.resonanceWithin10PctOf) {
    const peak = bus.peaks.find((p) => Math.abs(p.order - n) <= 0.1 * n);
    out.push({
      code: "resonance_near_harmonic",
      subject: `order ${n}`,
      message: `${where}: parallel resonance at h = ${peak ? peak.order.toFixed(2) : "?"} is within ±10 % of present order ${n}`,
      ...at,
    });
  }
  return out;
}

const DUTY_NAMES: readonly [keyof Pick<CapacitorDutyCheck, "rmsVoltage" | "peakVoltage" | "rmsCurrent" | "reactivePower">, string][] = [
  ["rmsVoltage", "rms voltage"],
  ["peakVoltage", "peak voltage"],
  ["rmsCurrent", "rms current"],
  ["reactivePower", "kvar"],
];

/** A quantity over its IEEE 18 limit is one finding; one over 100 % but within the limit is flagged separately. */
export function bankFindings(bank: BankStudy): Finding[] {
  const out: Finding[] = [];
  for (const stage of bank.stages) {
    const at = { bankName: bank.name, stageNumber: stage.stageNumber };
    const where = `bank "${bank.name}" stage ${stage.stageNumber} (${f1(stage.nameplateKvar)} kvar nameplate)`;
    out.push(...busFindings(stage, where, at));
    for (const [key, label] of DUTY_NAMES) {
      const q: DutyQuantity = stage.duty[key];
      if (!q.pass)
        out.push({
          code: "capacitor_duty_exceeds_limit",
          subject: key,
          message: `${where}: capacitor ${label} ${f1(q.valuePct)} % of rating exceeds the IEEE 18 limit of ${q.limitPct} %`,
          ...at,
        });
      else if (q.aboveRating)
        out.push({
          code: "capacitor_above_rating",
          subject: key,
          message: `${where}: capacitor ${label} ${f1(q.valuePct)} % of rating is above 100 % (IEEE 18 limits are for contingencies, not a design basis)`,
          ...at,
        });
    }
  }
  return out;
}
