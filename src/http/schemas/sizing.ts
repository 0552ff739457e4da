import { z } from "zod";
import { MAX_LOADS, TARGET_PF_MAX, TARGET_PF_MIN, VOLTS_MAX, VOLTS_MIN, type SizingInput } from "../../core/inputs.js";
import { installedBankIssues } from "../../core/bank/installed.js";

/** Request schemas. They produce the engine's input types; results have their own schemas in ./results.ts. */

/** Upper bound of any single power or current figure: far above any real load, far below float overflow. */
export const MAX_FIGURE = 1e6;
/**
 * Lower bound of a power or current figure: 0.001 (1 W, 1 var, 1 mA), below any meter's resolution. Smaller
 * positive figures (down to 5e-324) underflow in the products and quotients of the engine (S_sc, X_C, Z_base).
 */
export const MIN_FIGURE = 0.001;
const positive = (what: string) =>
  z
    .number({ error: `${what} must be a number` })
    .min(MIN_FIGURE, `${what} must be at least ${MIN_FIGURE}`)
    .max(MAX_FIGURE, `${what} must be at most ${MAX_FIGURE}`);
const volts = z
  .number({ error: "volts must be a number" })
  .min(VOLTS_MIN, `volts must be between ${VOLTS_MIN} and ${VOLTS_MAX} V`)
  .max(VOLTS_MAX, `volts must be between ${VOLTS_MIN} and ${VOLTS_MAX} V`);
/** PF 0.01 to 1: below 0.01 no load runs (a motor at no load reads about 0.1), and tan φ runs to float overflow. */
export const MIN_PF = 0.01;
const pf = z
  .number({ error: "pf must be a number" })
  .min(MIN_PF, `pf must be greater than 0 and at most 1 (at least ${MIN_PF})`)
  .max(1, `pf must be greater than 0 and at most 1 (at least ${MIN_PF})`);
/** 0 (a plain bank) or 0.1 to 20 %: a smaller reactor detunes nothing, and near 0 its tuning order 1/√p overflows. */
export const MIN_REACTOR_PCT = 0.1;
const reactorPct = z
  .number({ error: "reactorPct must be a number" })
  .min(0, "reactorPct must be 0 to 20 %")
  .max(20, "reactorPct must be 0 to 20 %")
  .refine((p) => p === 0 || p >= MIN_REACTOR_PCT, `reactorPct must be 0 (a plain bank) or ${MIN_REACTOR_PCT} to 20 %`);
const sense = z.enum(["lagging", "leading", "unity"]);

const common = {
  pfType: z.enum(["displacement", "true"]).optional().describe('"displacement" (default) or "true" when the meter PF includes harmonics'),
  currentTHDPct: z.number().min(0).max(300).optional().describe("current THD in percent, with a true-PF reading"),
};

export const measurementSchema = z.discriminatedUnion(
  "method",
  [
    z.strictObject({ method: z.literal("kw_kva"), kW: positive("kW"), kVA: positive("kVA"), sense: sense.optional(), ...common }),
    z.strictObject({
      method: z.literal("kw_kvar"),
      kW: positive("kW"),
      kvar: z
        .number({ error: "kvar must be a number" })
        .min(-MAX_FIGURE, `kvar must be within ±${MAX_FIGURE}`)
        .max(MAX_FIGURE, `kvar must be within ±${MAX_FIGURE}`)
        .describe("signed: > 0 lagging, < 0 leading"),
      ...common,
    }),
    z.strictObject({ method: z.literal("kw_pf"), kW: positive("kW"), pf, sense, ...common }),
    z.strictObject({ method: z.literal("v_i_kw"), volts, amps: positive("amps"), kW: positive("kW"), sense: sense.optional(), ...common }),
    z.strictObject({ method: z.literal("v_i_pf"), volts, amps: positive("amps"), pf, sense, ...common }),
  ],
  { error: "method must be one of kw_kva, kw_kvar, kw_pf, v_i_kw, v_i_pf" },
);

export const harmonicSpectrumSchema = z
  .array(
    z.strictObject({
      order: z.number().int("order must be a whole number").min(2, "order must be 2 to 50").max(50, "order must be 2 to 50"),
      pct: z.number().min(0, "pct must not be negative").max(300),
    }),
  )
  .max(49)
  .refine((s) => s.reduce((a, c) => a + c.pct, 0) <= 300, "the spectrum sums to more than 300 %, which no real load produces")
  .refine((s) => new Set(s.map((c) => c.order)).size === s.length, "each harmonic order may appear only once")
  .describe("measured current spectrum, percent of the load's fundamental current");

const phases = z.union([z.literal(1), z.literal(3)], { error: "phases must be 1 or 3" });

export const loadSchema = z.strictObject({
  label: z.string().trim().min(1, "label must not be empty").max(200),
  kind: z.enum(["motor", "drive", "lighting", "hvac", "welder", "other"]).optional(),
  phases: phases.optional(),
  quantity: z.number().int("quantity must be a whole number").min(1).max(10_000).optional(),
  measurement: measurementSchema,
  harmonics: harmonicSpectrumSchema.optional(),
  starting: z
    .enum(["across_the_line", "star_delta", "soft_starter", "reduced_voltage", "jogging", "plugging", "reversing", "multi_speed"])
    .optional()
    .describe("how a motor is started: decides whether capacitors may go at its terminals"),
  separateCapacitorContactor: z.boolean().optional().describe("a terminal capacitor would have its own contactor"),
  group: z.string().trim().min(1).max(100).optional().describe("MCC or feeder the load is fed from"),
  noLoadAmps: z
    .number()
    .min(MIN_FIGURE, `noLoadAmps must be at least ${MIN_FIGURE}`)
    .max(MAX_FIGURE)
    .optional()
    .describe("no-load (uncoupled) line current of one motor, A"),
  continuousDuty: z.boolean().optional(),
  motorConductorAmpacityA: z
    .number()
    .min(MIN_FIGURE, `motorConductorAmpacityA must be at least ${MIN_FIGURE}`)
    .max(MAX_FIGURE)
    .optional()
    .describe("ampacity of the motor-circuit conductors, A: a terminal capacitor's conductors need at least one third of it (NFPA 70 460.8(A))"),
});

export const systemSchema = z.strictObject({
  voltageV: volts.describe("nominal bus voltage, line-to-line on three-phase"),
  frequencyHz: z.union([z.literal(50), z.literal(60)], { error: "frequencyHz must be 50 or 60" }),
  phases,
});

export const transformerSchema = z.strictObject({
  kVA: positive("kVA").max(1_000_000),
  impedancePct: z.number().gt(0.5, "impedancePct must be above 0.5 %").max(25, "impedancePct must be at most 25 %"),
  // below 0.1 the source is a resistor (no transformer is), and near 0 its reactance underflows
  xOverR: z.number().min(0.1, "xOverR must be 0.1 to 100").max(100, "xOverR must be 0.1 to 100").optional(),
});

export const utilitySchema = z.strictObject({ faultMVA: positive("faultMVA").max(1_000_000) });

/**
 * Smallest step: 0.01 kvar (10 var), below any capacitor unit made; smaller figures are typing slips, and near the
 * float minimum they make X_C = V²/Q infinite.
 */
export const MIN_STEP_KVAR = 0.01;
const stepKvar = z
  .number({ error: "kvar must be a number" })
  .min(MIN_STEP_KVAR, `kvar must be at least ${MIN_STEP_KVAR} (10 var)`)
  .max(100_000, "kvar must be at most 100000");
/** Most steps in all the installed banks of one request: each is a switchable unit of the combined study. */
export const MAX_INSTALLED_STEPS = 64;

export const bankSchema = z.strictObject({
  ratedVoltageV: volts,
  ratedFrequencyHz: z.union([z.literal(50), z.literal(60)]).optional(),
  steps: z
    .array(z.strictObject({ kvar: stepKvar }))
    .min(1, "a bank needs at least one step")
    .max(64, "a bank has at most 64 steps"),
  reactorPct: reactorPct.optional(),
});

const isoDate = z.iso.date({ error: "installedOn must be an ISO 8601 date such as 2021-06-30" });

export const installedBankSchema = z.strictObject({
  label: z
    .string()
    .trim()
    .min(1, "label must not be empty")
    .max(100, "label must be at most 100 characters")
    .describe("unique within the building; bank readings refer to it"),
  location: z.enum(["service", "group", "motor"], { error: "location must be service, group or motor" }),
  group: z.string().trim().min(1).max(100).optional().describe("the MCC or feeder of a group bank"),
  loadLabel: z.string().trim().min(1).max(200).optional().describe("the motor (load label) of a terminal unit"),
  control: z.enum(["fixed", "automatic"], { error: "control must be fixed or automatic" }),
  ratedVoltageV: volts.describe("nameplate voltage, line-to-line on three phases"),
  ratedFrequencyHz: z.union([z.literal(50), z.literal(60)], { error: "ratedFrequencyHz must be 50 or 60" }).optional(),
  connection: z.enum(["delta", "wye"]).optional(),
  reactorPct: reactorPct.optional().describe("series (detuning) reactor; 0 or absent: plain"),
  steps: z
    .array(z.strictObject({ kvar: stepKvar }))
    .min(1, "a bank needs at least one step")
    .max(32, "an installed bank has at most 32 steps")
    .describe("nameplate kvar per step at the rated voltage and frequency; a fixed bank is one step"),
  installedOn: isoDate.optional(),
});

export const installedBanksSchema = z
  .array(installedBankSchema)
  .max(50, "at most 50 installed banks")
  .superRefine((banks, ctx) => {
    const steps = banks.reduce((n, b) => n + b.steps.length, 0);
    if (steps > MAX_INSTALLED_STEPS)
      ctx.addIssue({ code: "custom", path: [], message: `the installed banks have ${steps} steps in all: at most ${MAX_INSTALLED_STEPS}` });
    for (const i of installedBankIssues(banks, [])) ctx.addIssue({ code: "custom", path: i.path, message: i.message });
  });

const stepNumber = z.number().int("step must be a whole number").min(1, "steps are numbered from 1").max(32, "steps are numbered 1 to 32");
const amps = z.number({ error: "amps must be a number" }).min(0, "amps must not be negative").max(MAX_FIGURE, `amps must be at most ${MAX_FIGURE}`);

export const bankReadingSchema = z.strictObject({
  bank: z.string().trim().min(1, "bank must name an installed bank's label").max(100),
  inServiceSteps: z.array(stepNumber).max(32).describe("steps energised while the site readings were taken (1-based)"),
  voltageV: volts.optional().describe("voltage measured at the bank; default the system voltage"),
  stepCurrents: z
    .array(
      z.strictObject({
        step: stepNumber,
        amps: z
          .union([z.tuple([amps, amps, amps]), amps], { error: "amps must be one figure, or three (one per phase)" })
          .describe("per phase [a, b, c], or one figure; 0 in a phase is a finding"),
      }),
    )
    .max(32)
    .optional(),
});

export const bankReadingsSchema = z.array(bankReadingSchema).max(50);

export const backgroundDistortionSchema = z
  .array(
    z.strictObject({
      order: z.number().int("order must be a whole number").min(2, "order must be 2 to 50").max(50, "order must be 2 to 50"),
      pct: z.number().min(0, "pct must not be negative").max(20, "background distortion above 20 % of the fundamental is not plausible"),
    }),
  )
  .max(49)
  .refine((s) => new Set(s.map((c) => c.order)).size === s.length, "each harmonic order may appear only once")
  .describe("background voltage distortion at the bus, percent of the fundamental per order");

export const harmonicSourcesSchema = z.array(z.enum(["six_pulse", "twelve_pulse", "single_phase_electronic"])).max(3);

export const targetPFSchema = z
  .number({ error: "targetPF must be a number" })
  .min(TARGET_PF_MIN, `targetPF must be between ${TARGET_PF_MIN} and ${TARGET_PF_MAX}`)
  .max(TARGET_PF_MAX, `targetPF must be between ${TARGET_PF_MIN} and ${TARGET_PF_MAX}`);

export const loadsSchema = z.array(loadSchema).min(1, "at least one load is needed").max(MAX_LOADS, `at most ${MAX_LOADS} loads`);
export const serviceEntranceSchema = z.strictObject({ label: z.string().max(200).optional(), measurement: measurementSchema });

export const bankDesignSchema = z.strictObject({
  ctRatio: z.number().min(MIN_FIGURE, `ctRatio must be at least ${MIN_FIGURE} (primary/secondary, e.g. 200 for 1000/5)`).max(100_000).optional(),
  ratedVoltageV: volts.optional(),
  reactorPct: reactorPct.optional(),
  coverage: z.number().min(0.5, "coverage must be 0.5 to 1").max(1, "coverage must be 0.5 to 1").optional(),
  protectionDevice: z.enum(["fuse", "breaker"]).optional(),
  ocpdFactor: z.number().min(1, "ocpdFactor must be 1 to 3").max(3, "ocpdFactor must be 1 to 3").optional(),
  capacitorConnection: z.enum(["delta", "wye"]).optional(),
  dischargeResistorConnection: z.enum(["across_each_capacitor", "star_across_delta", "two_across_delta", "delta_across_wye"]).optional(),
});

const money = (what: string) =>
  z
    .number({ error: `${what} must be a number` })
    .min(0, `${what} must not be negative`)
    .max(1e9);

export const tariffSchema = z.discriminatedUnion(
  "form",
  [
    z.strictObject({ form: z.literal("kva_demand"), chargePerKVA: money("chargePerKVA").describe("per kVA of billing demand, a month") }),
    z.strictObject({
      form: z.literal("kw_demand_pf_adjusted"),
      chargePerKW: money("chargePerKW").describe("per billed kW, a month"),
      basePF: z.number().min(0.7, "basePF must be 0.70 to 1.00").max(1, "basePF must be 0.70 to 1.00").describe("billed kW = kW·basePF/PF below it"),
      pfBasis: z
        .enum(["average", "at_peak"], { error: "pfBasis must be average or at_peak" })
        .optional()
        .describe(
          "the PF compared with basePF: average = the period's kWh / √(kWh² + lagging kvarh²); at_peak = the PF of the interval with the peak kW (default average)",
        ),
    }),
    z.strictObject({
      form: z.literal("kvarh_excess"),
      chargePerKvarh: money("chargePerKvarh"),
      allowanceRatio: z.number().min(0, "allowanceRatio must be 0 to 2").max(2, "allowanceRatio must be 0 to 2").describe("kvarh allowed per kWh"),
    }),
    z.strictObject({ form: z.literal("none") }),
  ],
  { error: "form must be one of kva_demand, kw_demand_pf_adjusted, kvarh_excess, none" },
);

export const economicsSchema = z.strictObject({
  currency: z.string().regex(/^[A-Z]{3}$/, "currency must be an ISO 4217 code such as USD or EUR"),
  tariff: tariffSchema,
  operatingHoursPerMonth: z
    .number()
    .min(MIN_FIGURE, `operatingHoursPerMonth must be at least ${MIN_FIGURE}`)
    .max(744, "a month has at most 744 hours")
    .optional(),
  losses: z
    .strictObject({
      lossesPct: z.number().min(0).max(20, "lossesPct must be 0 to 20 %"),
      energyPricePerKWh: money("energyPricePerKWh"),
    })
    .optional(),
  cost: z
    .strictObject({
      perKvar: money("perKvar").optional(),
      perStep: money("perStep").optional(),
      fixed: money("fixed").optional(),
      reactorPerKvar: money("reactorPerKvar")
        .optional()
        .describe("detuning reactors, per kvar of a detuned bank; with reactorPerStep absent too, reactors are not priced"),
      reactorPerStep: money("reactorPerStep").optional().describe("detuning reactors, per step of a detuned bank"),
    })
    .optional(),
});

export const scopeSchema = z
  .enum(["whole_site", "partial"], { error: 'scope must be "whole_site" or "partial"' })
  .describe(
    "what the readings cover; default whole_site when a serviceEntrance reading is given, else partial. Interval demand drives the central bank only for a whole-site survey",
  );

export const sizingRequestSchema = z.strictObject({
  system: systemSchema,
  targetPF: targetPFSchema.optional(),
  scope: scopeSchema.optional(),
  loads: loadsSchema,
  serviceEntrance: serviceEntranceSchema.optional(),
  transformer: transformerSchema.optional(),
  utility: utilitySchema.optional(),
  proposedBank: bankSchema.optional(),
  harmonicSources: harmonicSourcesSchema.optional(),
  backgroundVoltageDistortion: backgroundDistortionSchema.optional(),
  lightLoad: serviceEntranceSchema.optional().describe("a reading at the main at light load: caps the fixed part of the bank"),
  bankDesign: bankDesignSchema.optional(),
  economics: economicsSchema.optional(),
  installedBanks: installedBanksSchema.optional().describe("capacitor banks already installed"),
  bankReadings: bankReadingsSchema.optional().describe("which installed steps were energised during the readings, and their measured currents"),
});

export type SizingRequest = z.infer<typeof sizingRequestSchema>;

// Compile-time check: a parsed request is an engine input.
const _assignable: (r: SizingRequest) => SizingInput = (r) => r;
void _assignable;
