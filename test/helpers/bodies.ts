/**
 * Request bodies shared by the API tests. Each call returns a fresh copy the test may mutate.
 */

/** The contract example: one 480 V motor read with V, I and PF; 1500 kVA 6 % transformer; 500 MVA utility;
 *  a proposed 2 × 100 kvar bank rated 480 V behind 7 % reactors. */
export function exampleSizingBody(): Record<string, any> {
  return {
    system: { voltageV: 480, frequencyHz: 60, phases: 3 },
    targetPF: 0.95,
    loads: [
      {
        label: "Press line motor",
        kind: "motor",
        measurement: { method: "v_i_pf", volts: 480, amps: 120, pf: 0.78, sense: "lagging" },
      },
    ],
    transformer: { kVA: 1500, impedancePct: 6 },
    utility: { faultMVA: 500 },
    proposedBank: { ratedVoltageV: 480, steps: [{ kvar: 100 }, { kvar: 100 }], reactorPct: 7 },
  };
}
