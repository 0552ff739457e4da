/** Request bodies and records shared by the store and API tests: an invented 400 V / 50 Hz workshop. */
import type { BuildingData } from "../../src/store/types.js";

/** A building as the store keeps it, bare: the system only. */
export const buildingData = (name: string): BuildingData => ({
  name,
  address: null,
  notes: null,
  system: { voltageV: 400, frequencyHz: 50, phases: 3 },
  transformer: null,
  utility: null,
  economics: null,
});

export const buildingBody = (over: Record<string, unknown> = {}) => ({
  name: "Test workshop A",
  address: "1 Example Yard",
  system: { voltageV: 400, frequencyHz: 50, phases: 3 },
  transformer: { kVA: 630, impedancePct: 4.5 },
  utility: { faultMVA: 150 },
  ...over,
});

export const loads = (n: number, labelOf: (i: number) => string = (i) => `Motor ${i + 1}`) =>
  Array.from({ length: n }, (_, i) => ({
    label: labelOf(i),
    kind: "motor",
    measurement: { method: "kw_pf", kW: 10 + (i % 7), pf: 0.7 + (i % 5) * 0.04, sense: "lagging" },
  }));

export const surveyBody = (over: Record<string, unknown> = {}) => ({
  surveyedAt: "2024-05-02T08:00:00Z",
  surveyor: "Test surveyor",
  targetPF: 0.95,
  loads: [
    { label: "Compressor", kind: "motor", measurement: { method: "v_i_pf", volts: 400, amps: 80, pf: 0.78, sense: "lagging" } },
    { label: "Saw line", kind: "motor", quantity: 2, measurement: { method: "kw_kva", kW: 18, kVA: 25 } },
    { label: "Lighting", kind: "lighting", measurement: { method: "kw_pf", kW: 6, pf: 0.92, sense: "lagging" } },
  ],
  ...over,
});
