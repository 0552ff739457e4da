/**
 * The heaviest requests the sizing and scan schemas accept: every list at its limit, every magnitude at its top.
 * Invented figures. The cost-bound tests send them; the property test keeps its bodies inside the same limits.
 */
const FULL_SPECTRUM = Array.from({ length: 49 }, (_, i) => ({ order: i + 2, pct: 300 / 49 }));

export interface WorstOptions {
  loads?: number;
  /** Give every load the full 49-order spectrum. */
  spectra?: boolean;
  installedBanks?: number;
  proposedReactorPct?: number;
}

export function worstSizingBody(o: WorstOptions = {}): Record<string, unknown> {
  const loads = Array.from({ length: o.loads ?? 2000 }, (_, i) => ({
    label: `Line ${i + 1}`,
    kind: i % 2 === 1 ? "drive" : "motor",
    quantity: 10_000,
    group: `MCC ${(i % 50) + 1}`,
    measurement: { method: "kw_pf", kW: 1e6, pf: 0.5 + (i % 40) / 100, sense: "lagging" },
    ...(o.spectra ? { harmonics: FULL_SPECTRUM } : {}),
  }));
  const banks = o.installedBanks ?? 2;
  // 64 steps in all (MAX_INSTALLED_STEPS), at most 32 a bank
  const stepsEach = banks > 0 ? Math.min(32, Math.floor(64 / banks)) : 0;
  return {
    system: { voltageV: 480, frequencyHz: 60, phases: 3 },
    targetPF: 1,
    loads,
    serviceEntrance: { measurement: { method: "kw_pf", kW: 1e6, pf: 0.6, sense: "lagging" } },
    lightLoad: { measurement: { method: "kw_pf", kW: 1e5, pf: 0.7, sense: "lagging" } },
    transformer: { kVA: 1_000_000, impedancePct: 5.75 },
    utility: { faultMVA: 1_000_000 },
    backgroundVoltageDistortion: FULL_SPECTRUM.map((c) => ({ order: c.order, pct: 2 })),
    proposedBank: { ratedVoltageV: 480, reactorPct: o.proposedReactorPct ?? 7, steps: Array.from({ length: 64 }, (_, i) => ({ kvar: 100_000 - i })) },
    ...(banks > 0
      ? {
          installedBanks: Array.from({ length: banks }, (_, b) => ({
            label: `Bank ${b + 1}`,
            location: "service",
            control: "automatic",
            ratedVoltageV: 480,
            reactorPct: b % 2 ? 7 : 0,
            steps: Array.from({ length: stepsEach }, (_, s) => ({ kvar: 50 + b + s })),
          })),
        }
      : {}),
    economics: { currency: "USD", tariff: { form: "kva_demand", chargePerKVA: 1e9 }, cost: { perKvar: 1e9, perStep: 1e9, fixed: 1e9 } },
  };
}
