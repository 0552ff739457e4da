/** A 20-load survey body with every measurement method, invented values. */
export function twentyLoadBody(): Record<string, unknown> {
  const methods = [
    (i: number) => ({ method: "v_i_pf", volts: 480, amps: 40 + 7 * i, pf: 0.72 + (i % 5) * 0.04, sense: "lagging" }),
    (i: number) => ({ method: "kw_pf", kW: 15 + 3 * i, pf: 0.8 + (i % 4) * 0.03, sense: "lagging" }),
    (i: number) => ({ method: "kw_kva", kW: 20 + 2 * i, kVA: 28 + 2.5 * i }),
    (i: number) => ({ method: "kw_kvar", kW: 12 + i, kvar: i % 7 === 0 ? -4 : 6 + i }),
    (i: number) => ({ method: "v_i_kw", volts: 480, amps: 30 + 4 * i, kW: (480 * (30 + 4 * i) * 1.732 * 0.7) / 1000 }),
  ];
  const kinds = ["motor", "hvac", "lighting", "drive", "welder", "other"];
  return {
    system: { voltageV: 480, frequencyHz: 60, phases: 3 },
    targetPF: 0.95,
    loads: Array.from({ length: 20 }, (_, i) => ({
      label: `Load ${i + 1}`,
      kind: kinds[i % kinds.length] === "drive" ? "motor" : kinds[i % kinds.length],
      quantity: 1 + (i % 3),
      measurement: (methods[i % methods.length] as (i: number) => Record<string, unknown>)(i),
    })),
    transformer: { kVA: 2000, impedancePct: 5.75 },
    utility: { faultMVA: 250 },
    proposedBank: { ratedVoltageV: 480, steps: [{ kvar: 50 }, { kvar: 50 }, { kvar: 100 }, { kvar: 100 }], reactorPct: 7 },
  };
}
