/**
 * |Z(h)| series for the report's scan charts. A stored sizing result keeps the study's figures but not its series,
 * so they are recomputed here with the pure harmonic engine from the result's own network figures (or taken as
 * supplied, e.g. from POST /v1/harmonics/scan).
 */
import {
  buildBusModel,
  capacitorBranch,
  DEFAULT_REACTOR_QUALITY_FACTOR,
  scanImpedance,
  withBranches,
  type BusModel,
  type NetworkInput,
} from "../core/harmonics/harmonics-api.js";
import { linearLoadKW } from "../core/harmonics/site-study.js";
import type { ScanLine } from "./charts/index.js";
import type { ReportInput } from "./types.js";

export interface BankScan {
  /** "recommended", "proposed", or "recommended (detuned proposal)". */
  bank: string;
  lines: ScanLine[];
}

export interface ScanSet {
  banks: BankScan[];
  markerOrders: number[];
  basis: "supplied" | "computed";
}

interface StageSpec {
  stageNumber: number;
  capacitorKvar: number;
}

interface BankSpec {
  bank: string;
  reactorPct: number;
  stages: StageSpec[];
}

function bankSpecs(input: ReportInput): BankSpec[] {
  const { result } = input;
  const h = result.harmonics;
  if (h) {
    const own = h.banks.map((b) => ({
      bank: b.name,
      reactorPct: b.reactorPct,
      stages: b.stages.map((s) => ({ stageNumber: s.stageNumber, capacitorKvar: s.capacitorKvarAtSystem })),
    }));
    const detuned = h.proposals.map((p) => ({
      bank: p.study.name,
      reactorPct: p.study.reactorPct,
      stages: p.study.stages.map((s) => ({ stageNumber: s.stageNumber, capacitorKvar: s.capacitorKvarAtSystem })),
    }));
    return [...own, ...detuned];
  }
  const out: BankSpec[] = [];
  const add = (bank: string, b: NonNullable<typeof result.recommendedBank> | NonNullable<typeof result.proposedBank>) =>
    out.push({ bank, reactorPct: b.reactorPct, stages: b.stages.map((s) => ({ stageNumber: s.stage, capacitorKvar: s.cumulativeCapacitorKvar })) });
  if (result.recommendedBank) add("recommended", result.recommendedBank);
  if (result.proposedBank) add("proposed", result.proposedBank);
  return out;
}

/** The bus the study modelled: the stored source figures, the linear load of the request's non-source loads. */
function busModel(input: ReportInput): BusModel | null {
  const { result, inputs } = input;
  const sc = result.resonance?.shortCircuitKVA;
  if (!sc) return null;
  const xOverR = result.harmonics?.source.xOverR ?? inputs.transformer?.xOverR;
  const network: NetworkInput = {
    voltageV: result.system.voltageV,
    frequencyHz: result.system.frequencyHz,
    phases: result.system.phases,
    shortCircuitKVA: sc,
    ...(xOverR !== undefined ? { xOverR } : {}),
    ...(inputs.transformer ? { transformerKVA: inputs.transformer.kVA } : {}),
    linearLoadKW: linearLoadKW(inputs, result.loads),
  };
  return buildBusModel(network);
}

function toLine(label: string, kind: ScanLine["kind"], orders: ArrayLike<number>, z: ArrayLike<number>, stageNumber?: number): ScanLine {
  return { label, kind, orders: Array.from(orders), impedanceOhm: Array.from(z), ...(stageNumber !== undefined ? { stageNumber } : {}) };
}

function markerOrders(input: ReportInput): number[] {
  return input.result.harmonics?.presentOrders ?? input.result.resonance?.harmonicOrdersPresent ?? [];
}

function supplied(input: ReportInput): ScanSet | null {
  if (input.scanSeries && input.scanSeries.length > 0) {
    return {
      basis: "supplied",
      markerOrders: markerOrders(input),
      banks: input.scanSeries.map((b) => ({
        bank: b.bank,
        lines: b.stages.map((s) => toLine(`stage ${s.stageNumber}`, "stage", s.orders, s.impedanceOhm, s.stageNumber)),
      })),
    };
  }
  const h = input.result.harmonics;
  if (h && h.banks.length > 0 && h.banks.every((b) => b.stages.every((s) => s.series))) {
    const bus = h.withoutCapacitors.series;
    const busLine = bus ? [toLine("bus without capacitors", "bus", bus.orders, bus.impedanceOhm)] : [];
    const banks = [...h.banks, ...h.proposals.map((p) => p.study)].filter((b) => b.stages.every((s) => s.series));
    return {
      basis: "supplied",
      markerOrders: h.presentOrders,
      banks: banks.map((b) => ({
        bank: b.name,
        lines: [
          ...busLine,
          ...b.stages.map((s) => toLine(`stage ${s.stageNumber}`, "stage", s.series?.orders ?? [], s.series?.impedanceOhm ?? [], s.stageNumber)),
        ],
      })),
    };
  }
  return null;
}

/** Series per bank and stage, or null when the source strength is unknown (no transformer or utility data). */
export function scanSeriesFor(input: ReportInput): ScanSet | null {
  const given = supplied(input);
  if (given) return given;
  const model = busModel(input);
  if (!model) return null;
  const specs = bankSpecs(input);
  if (specs.length === 0) return null;
  const v = input.result.system.voltageV;
  const alone = scanImpedance(model);
  const busLine = toLine("bus without capacitors", "bus", alone.ordersH, alone.impedanceOhm);
  return {
    basis: "computed",
    markerOrders: markerOrders(input),
    banks: specs.map((spec) => ({
      bank: spec.bank,
      lines: [
        busLine,
        ...spec.stages.map((s) => {
          const scan = scanImpedance(withBranches(model, [capacitorBranch(v, s.capacitorKvar, spec.reactorPct, DEFAULT_REACTOR_QUALITY_FACTOR)]));
          return toLine(`stage ${s.stageNumber}`, "stage", scan.ordersH, scan.impedanceOhm, s.stageNumber);
        }),
      ],
    })),
  };
}
