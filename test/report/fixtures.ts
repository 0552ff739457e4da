/** Inputs and results for the report tests: real engine runs on invented sites, nothing hand-built. */
import { designBank, type BankDesign } from "../../src/core/bank/bank-design.js";
import { planPlacement } from "../../src/core/placement/placement.js";
import type { PlacementPlan } from "../../src/core/placement/placement-types.js";
import { economics, type EconomicsResult } from "../../src/core/economics/economics-api.js";
import type { SizingInput } from "../../src/core/inputs.js";
import { analyseIntervals, summarise, type IntervalSummary } from "../../src/core/interval/interval-api.js";
import { size, type SizingResult } from "../../src/core/pipeline/size.js";
import type { ReportInput } from "../../src/report/index.js";

export function sized(input: SizingInput): SizingResult {
  const o = size(input);
  if (!o.ok) throw new Error(`fixture does not size: ${JSON.stringify(o.issues)}`);
  return o.result;
}

/** A 480 V hall with drives, a 1500 kVA transformer, and a proposed plain 4 × 50 kvar bank: resonance findings and detuned proposals. */
export function hallInput(): SizingInput {
  return {
    system: { voltageV: 480, frequencyHz: 60, phases: 3 },
    targetPF: 0.95,
    transformer: { kVA: 1500, impedancePct: 5.75, xOverR: 6 },
    utility: { faultMVA: 250 },
    loads: [
      { label: "Filler carousel drive", kind: "drive", measurement: { method: "kw_pf", kW: 55, pf: 0.96, sense: "lagging" } },
      { label: "Air compressor C1", kind: "motor", measurement: { method: "v_i_pf", volts: 480, amps: 118, pf: 0.82, sense: "lagging" } },
      {
        label: 'Conveyor motors <hall 2> & "east"',
        kind: "motor",
        quantity: 12,
        measurement: { method: "kw_pf", kW: 4.1, pf: 0.72, sense: "lagging" },
      },
      { label: "Glycol chiller", kind: "hvac", measurement: { method: "kw_kva", kW: 148, kVA: 188 } },
      { label: "Labeller and capper", kind: "motor", measurement: { method: "v_i_kw", volts: 480, amps: 41, kW: 22 } },
      { label: "Hall lighting", kind: "lighting", measurement: { method: "kw_kvar", kW: 38, kvar: 15 } },
    ],
    proposedBank: { ratedVoltageV: 480, steps: [{ kvar: 50 }, { kvar: 50 }, { kvar: 50 }, { kvar: 50 }] },
  };
}

/** One motor, no transformer or utility: no resonance screen, no harmonic study. */
export function plainInput(): SizingInput {
  return {
    system: { voltageV: 400, frequencyHz: 50, phases: 3 },
    targetPF: 0.95,
    loads: [{ label: "Pump P-1", kind: "motor", measurement: { method: "kw_pf", kW: 90, pf: 0.8, sense: "lagging" } }],
  };
}

/** Four weeks of 15-minute demand: a day shift with a lagging kvar that follows kW. */
export function intervalSummaryFor(targetPF: number): IntervalSummary {
  const n = 28 * 96;
  const t0 = Date.UTC(2024, 2, 1);
  const ts = new Float64Array(n);
  const kW = new Float64Array(n);
  const kvar = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const hour = (i % 96) / 4;
    const shift = hour >= 6 && hour < 22 ? 1 : 0.25;
    ts[i] = t0 + i * 15 * 60_000;
    kW[i] = 120 + 380 * shift + 20 * Math.sin(i / 7);
    kvar[i] = 60 + 290 * shift + 15 * Math.cos(i / 5);
  }
  return summarise(analyseIntervals({ timestampsMs: ts, kW, kvar, length: n, intervalMinutes: 15 }, targetPF));
}

export function designFor(input: SizingInput, interval: IntervalSummary): BankDesign {
  const curve = interval.durationCurve;
  // The duration curve's kvar against the mean kW scaled by the same rank: enough demand samples for the step search.
  const samples = curve.kvar.map((q) => ({ kW: q / 0.7, kvar: q }));
  const o = designBank({
    system: input.system,
    targetPF: 0.95,
    demand: { kind: "intervals", samples, intervalMinutes: 15 },
    ctRatio: 200,
    ...(input.transformer ? { transformerKVA: input.transformer.kVA } : {}),
  });
  if (!o.ok) throw new Error(`design fixture failed: ${JSON.stringify(o.issues)}`);
  return o.design;
}

export function placementFor(result: SizingResult): PlacementPlan {
  return planPlacement({
    targetPF: result.correction.targetPF,
    siteRequiredKvar: result.correction.kvarRequired,
    loads: result.loads.map((l) => ({
      label: l.label,
      kind: l.kind === "other" || l.kind === undefined ? "other" : l.kind,
      kW: l.kW,
      kvar: l.kvar,
      quantity: l.quantity,
      voltageV: result.system.voltageV,
      phases: l.phases,
    })),
  });
}

export function economicsFor(result: SizingResult): EconomicsResult {
  const peakKW = result.site.kW;
  return economics({
    currency: "EUR",
    tariff: { form: "kva_demand", chargePerKVA: 7.25 },
    periods: [
      {
        label: "typical month",
        before: { peakKW, peakKVA: result.correction.kVABefore, peakPF: result.site.displacementPF, kWh: 180_000, kvarh: 120_000 },
        after: { peakKW, peakKVA: result.correction.kVAAfter, peakPF: result.correction.pfAfter, kWh: 180_000, kvarh: 40_000 },
      },
    ],
    periodsPerYear: 12,
    cost: { perKvar: 32, perStep: 150, fixed: 2500 },
    bank: { installedKvar: result.recommendedBank?.effectiveKvar ?? 0, steps: result.recommendedBank?.steps.length ?? 0 },
    lossReductionFraction: result.correction.lossReductionPct / 100,
    losses: { lossesPct: 2, energyPricePerKWh: 0.18 },
    basis: "survey_demand",
  });
}

/** Everything: building, survey, economics, design, placement, interval data. */
export function fullReportInput(): ReportInput {
  const inputs = hallInput();
  const result = sized(inputs);
  const interval = intervalSummaryFor(0.95);
  return {
    building: {
      name: "Fernhollow works — Hall 2 <test>",
      address: "Unit 4, Example Estate",
      system: inputs.system,
      transformer: inputs.transformer ?? null,
      utility: inputs.utility ?? null,
      buildingVersion: 3,
    },
    survey: {
      id: "srv_TEST123",
      revision: 2,
      surveyedAt: "2024-03-19T10:15:00-05:00",
      surveyor: "T. Example & Co",
      notes: "Readings at each MCC feeder.",
      engineVersion: result.engineVersion,
      createdAt: "2024-03-20T08:00:00.000Z",
      reason: "C3 added",
    },
    inputs,
    result,
    economics: economicsFor(result),
    design: designFor(inputs, interval),
    placement: placementFor(result),
    interval,
  };
}
