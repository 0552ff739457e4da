/**
 * Varied sizing bodies whose full size() output is kept as a fixture (fixtures/size-outputs.json), so a change to the
 * engine's speed can show it left every figure, key and order in place. Invented sites; each covers a path of the
 * harmonic study: drives, measured spectra, detuned proposals, installed banks (plain and detuned), background
 * distortion with a significant 3rd, 50 and 60 Hz, a single-phase bus, and the dense series of the scan endpoint.
 */
import { twentyLoadBodyWithDrives } from "../../../bench/engine.js";
import { twentyLoadBody } from "../../../bench/bodies.js";
import type { SizingOptions } from "../../../src/core/pipeline/size.js";

export interface SnapshotCase {
  name: string;
  body: Record<string, unknown>;
  options?: SizingOptions;
}

const drive = (label: string, kW: number, extra: Record<string, unknown> = {}) => ({
  label,
  kind: "drive",
  measurement: { method: "kw_pf", kW, pf: 0.95, sense: "lagging", ...extra },
});
const motor = (label: string, kW: number, pf: number) => ({ label, kind: "motor", measurement: { method: "kw_pf", kW, pf, sense: "lagging" } });

export function snapshotCases(): SnapshotCase[] {
  return [
    { name: "bench body with drives, 60 Hz, 7 % proposal", body: twentyLoadBodyWithDrives() },
    { name: "bench body without drives", body: twentyLoadBody() },
    {
      name: "50 Hz 400 V, background with a 3rd, plain proposal",
      body: {
        system: { voltageV: 400, frequencyHz: 50, phases: 3 },
        targetPF: 0.97,
        loads: [
          motor("Kiln fan", 180, 0.78),
          motor("Mill", 240, 0.74),
          drive("Conveyor drive", 160),
          drive("Press drive", 90, { currentTHDPct: 42, pfType: "true" }),
        ],
        transformer: { kVA: 1000, impedancePct: 6 },
        utility: { faultMVA: 150 },
        backgroundVoltageDistortion: [
          { order: 3, pct: 1.2 },
          { order: 5, pct: 2.1 },
          { order: 7, pct: 1.3 },
        ],
        proposedBank: { ratedVoltageV: 400, ratedFrequencyHz: 50, steps: [{ kvar: 50 }, { kvar: 50 }, { kvar: 100 }, { kvar: 100 }] },
      },
    },
    {
      name: "60 Hz with installed plain and detuned banks",
      body: {
        system: { voltageV: 480, frequencyHz: 60, phases: 3 },
        targetPF: 0.95,
        loads: [motor("Chiller", 400, 0.8), motor("Compressors", 300, 0.76), drive("Pump drives", 220), drive("Fan drives", 140)],
        transformer: { kVA: 2500, impedancePct: 5.75, xOverR: 7 },
        installedBanks: [
          { label: "North bank", location: "service", control: "automatic", ratedVoltageV: 480, steps: [{ kvar: 50 }, { kvar: 50 }, { kvar: 50 }] },
          { label: "South bank", location: "service", control: "automatic", ratedVoltageV: 525, reactorPct: 7, steps: [{ kvar: 75 }, { kvar: 75 }] },
        ],
        bankReadings: [
          { bank: "North bank", inServiceSteps: [1, 2, 3] },
          { bank: "South bank", inServiceSteps: [1] },
        ],
      },
    },
    {
      name: "50 Hz measured spectra, twelve-pulse source, 14 % proposed bank",
      body: {
        system: { voltageV: 690, frequencyHz: 50, phases: 3 },
        loads: [
          motor("Crusher", 500, 0.82),
          {
            label: "Rectifier",
            kind: "other",
            measurement: { method: "kw_kva", kW: 300, kVA: 340 },
            harmonics: [
              { order: 11, pct: 7.5 },
              { order: 13, pct: 5.8 },
              { order: 23, pct: 2.1 },
              { order: 25, pct: 1.6 },
            ],
          },
          drive("Hoist drive", 250, { currentTHDPct: 35 }),
        ],
        harmonicSources: ["twelve_pulse"],
        transformer: { kVA: 1600, impedancePct: 6 },
        utility: { faultMVA: 400 },
        proposedBank: { ratedVoltageV: 800, reactorPct: 14, steps: [{ kvar: 100 }, { kvar: 100 }, { kvar: 100 }] },
      },
    },
    {
      name: "60 Hz 208 V weak source, plain proposal on a big drive share",
      body: {
        system: { voltageV: 208, frequencyHz: 60, phases: 3 },
        targetPF: 0.98,
        loads: [motor("Rooftop units", 60, 0.8), drive("Elevator drive", 45), drive("Pump drive", 30, { currentTHDPct: 80, pfType: "true" })],
        transformer: { kVA: 225, impedancePct: 3.5 },
        proposedBank: { ratedVoltageV: 240, steps: [{ kvar: 10 }, { kvar: 10 }, { kvar: 20 }, { kvar: 20 }] },
      },
    },
    {
      name: "background distortion only, installed detuned bank, 50 Hz",
      body: {
        system: { voltageV: 400, frequencyHz: 50, phases: 3 },
        loads: [motor("Saws", 220, 0.72), motor("Planers", 160, 0.7)],
        transformer: { kVA: 800, impedancePct: 5 },
        backgroundVoltageDistortion: [
          { order: 5, pct: 3.5 },
          { order: 7, pct: 2.4 },
          { order: 11, pct: 1.1 },
        ],
        installedBanks: [{ label: "Shop bank", location: "service", control: "fixed", ratedVoltageV: 440, reactorPct: 5.67, steps: [{ kvar: 60 }] }],
      },
    },
    {
      name: "single-phase 240 V with a drive",
      body: {
        system: { voltageV: 240, frequencyHz: 60, phases: 1 },
        loads: [
          { label: "Well pump", kind: "motor", phases: 1, measurement: { method: "kw_pf", kW: 11, pf: 0.75, sense: "lagging" } },
          { label: "Mixer drive", kind: "drive", phases: 1, measurement: { method: "kw_pf", kW: 7.5, pf: 0.95, sense: "lagging" } },
        ],
        transformer: { kVA: 50, impedancePct: 2.5 },
        proposedBank: { ratedVoltageV: 240, steps: [{ kvar: 2.5 }, { kvar: 2.5 }] },
      },
    },
    {
      name: "scan series asked for (the scan endpoint's path), 60 Hz",
      body: {
        ...twentyLoadBodyWithDrives(),
        backgroundVoltageDistortion: [{ order: 5, pct: 1.5 }],
      },
      options: { harmonics: { includeScanSeries: true, scan: { fromOrder: 1, toOrder: 30, stepOrder: 0.25 } } },
    },
  ];
}
