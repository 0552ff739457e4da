import type { SizingInput } from "../../src/core/inputs.js";

/**
 * An invented plant read at the service with four weeks of hourly data (900 kW / 700 kvar by day, 300 kW /
 * 220 kvar by night) and an installed automatic 5 × 50 kvar, 480 V service bank found switched off.
 */
export function plantWithInstalledAutomaticBank(): SizingInput {
  const kW: number[] = [];
  const kvar: number[] = [];
  for (let h = 0; h < 24 * 28; h++) {
    const day = h % 24 >= 7 && h % 24 < 19;
    kW.push(day ? 900 : 300);
    kvar.push(day ? 700 : 220);
  }
  return {
    system: { voltageV: 480, frequencyHz: 60, phases: 3 },
    targetPF: 0.95,
    scope: "whole_site",
    loads: [{ label: "Plant", kind: "other", measurement: { method: "kw_kvar", kW: 900, kvar: 700 } }],
    serviceEntrance: { measurement: { method: "kw_kvar", kW: 900, kvar: 700 } },
    intervalDemand: { kW, kvar, intervalMinutes: 60 },
    installedBanks: [
      { label: "Old bank", location: "service", control: "automatic", ratedVoltageV: 480, steps: [50, 50, 50, 50, 50].map((k) => ({ kvar: k })) },
    ],
    bankReadings: [{ bank: "Old bank", inServiceSteps: [] }],
  } as SizingInput;
}
