import type { BuildingData, SurveyInputs } from "../store/types.js";

/**
 * An invented site for the demo: a bottling hall at a fictional works with an automatic capacitor bank
 * whose controller had failed, so the first survey found the power factor poor with the bank off (each
 * step was switched in by hand and its current read). A year later, with the controller replaced, the
 * main meter shows the power factor drifting back down: step 3 has lost capacitance, step 5's contactor
 * has failed open, and a third compressor has been added.
 */

export const DEMO_BUILDING: BuildingData = {
  name: "Quillmoor Bottling Works — Line 2 hall",
  address: "Unit 4, Fernhollow Trading Estate (invented demo site)",
  notes: "Demo data: an invented site. Fed from its own 1500 kVA transformer; main switchboard MSB-2.",
  system: { voltageV: 480, frequencyHz: 60, phases: 3 },
  transformer: { kVA: 1500, impedancePct: 5.75, xOverR: 6 },
  utility: { faultMVA: 250 },
  // Invented tariff and prices for the demo: a PF-adjusted kW demand charge, two shifts.
  economics: {
    currency: "USD",
    tariff: { form: "kw_demand_pf_adjusted", chargePerKW: 14.5, basePF: 0.9 },
    operatingHoursPerMonth: 400,
    losses: { lossesPct: 2.5, energyPricePerKWh: 0.11 },
    cost: { perKvar: 38, perStep: 350, fixed: 4200 },
  },
  // Invented: 5 × 50 kvar at 525 V behind 7 % reactors, on MSB-2. A healthy step draws
  // 50·(480/525)²/0.93 = 44.94 kvar → 44 942/(√3·480) = 54.06 A at 480 V.
  installedBanks: [
    {
      label: "MSB-2 automatic bank",
      location: "service",
      control: "automatic",
      ratedVoltageV: 525,
      ratedFrequencyHz: 60,
      connection: "delta",
      reactorPct: 7,
      steps: [50, 50, 50, 50, 50].map((kvar) => ({ kvar })),
      installedOn: "2019-06-20",
    },
  ],
};

const commonLoads: SurveyInputs["loads"] = [
  { label: "Filler carousel drive", kind: "drive", measurement: { method: "kw_pf", kW: 55, pf: 0.96, sense: "lagging" } },
  { label: "Air compressor C1", kind: "motor", measurement: { method: "v_i_pf", volts: 480, amps: 118, pf: 0.82, sense: "lagging" } },
  { label: "Air compressor C2", kind: "motor", measurement: { method: "v_i_pf", volts: 478, amps: 112, pf: 0.8, sense: "lagging" } },
  { label: "Conveyor motors, hall 2", kind: "motor", quantity: 12, measurement: { method: "kw_pf", kW: 4.1, pf: 0.72, sense: "lagging" } },
  { label: "Glycol chiller", kind: "hvac", measurement: { method: "kw_kva", kW: 148, kVA: 188 } },
  { label: "Bottle washer pumps", kind: "motor", quantity: 3, measurement: { method: "kw_pf", kW: 15, pf: 0.78, sense: "lagging" } },
  { label: "Hall lighting (LED)", kind: "lighting", measurement: { method: "kw_pf", kW: 38, pf: 0.93, sense: "lagging" } },
  { label: "Labeller and capper", kind: "motor", measurement: { method: "v_i_kw", volts: 480, amps: 41, kW: 22 } },
];

export const DEMO_SURVEYS: SurveyInputs[] = [
  {
    surveyedAt: "2023-03-14T09:30:00-05:00",
    surveyor: "T. Ashgrove (demo surveyor)",
    notes:
      "Readings at each MCC feeder during the morning shift, line 2 at full rate. The bank's controller had failed: " +
      "all steps off during the readings; afterwards each step was switched in by hand and its currents read.",
    targetPF: 0.95,
    loads: commonLoads,
    bankReadings: [
      {
        bank: "MSB-2 automatic bank",
        inServiceSteps: [],
        voltageV: 482,
        stepCurrents: [
          { step: 1, amps: [54.5, 54.3, 54.6] },
          { step: 2, amps: [54.2, 54.4, 54.1] },
          { step: 3, amps: [53.0, 53.3, 52.8] },
          { step: 4, amps: [54.3, 54.0, 54.2] },
          { step: 5, amps: [54.1, 54.4, 54.2] },
        ],
      },
    ],
  },
  {
    surveyedAt: "2024-03-19T10:15:00-05:00",
    surveyor: "T. Ashgrove (demo surveyor)",
    notes:
      "Controller replaced in June 2023. Main meter read with the bank online (steps 1-4 switched in): " +
      "step 5 contactor found failed open, step 3 reading low. Compressor C3 added in January 2024.",
    targetPF: 0.95,
    loads: [
      ...commonLoads,
      { label: "Air compressor C3", kind: "motor", measurement: { method: "v_i_pf", volts: 479, amps: 104, pf: 0.81, sense: "lagging" } },
    ],
    serviceEntrance: { label: "MSB-2 main meter (bank online)", measurement: { method: "kw_kvar", kW: 603, kvar: 236 } },
    bankReadings: [
      {
        bank: "MSB-2 automatic bank",
        inServiceSteps: [1, 2, 3, 4],
        voltageV: 479,
        stepCurrents: [
          { step: 1, amps: [53.9, 54.1, 53.8] },
          { step: 2, amps: [53.7, 53.9, 53.6] },
          { step: 3, amps: [47.2, 46.9, 47.4] },
          { step: 4, amps: [53.8, 53.6, 53.9] },
          { step: 5, amps: [0, 0, 0] },
        ],
      },
    ],
  },
];
