import { z } from "zod";

/** Response schemas: documentation and contract tests only; responses are plain objects built in code. */

const sense = z.enum(["lagging", "leading", "unity"]);
const triangle = {
  kW: z.number(),
  kvar: z.number().describe("signed: > 0 lagging, < 0 leading"),
  kVA: z.number(),
  displacementPF: z.number(),
  sense,
};

export const warningSchema = z.object({
  code: z.string(),
  message: z.string(),
  severity: z
    .enum(["info", "warning", "error"])
    .describe("info: worth knowing; warning: look before ordering; error: a standard's limit broken by the design"),
  path: z.string().optional(),
  subjects: z.array(z.string()).optional().describe("the stages or loads this one concern covers"),
});
export const cautionSchema = z.object({ code: z.string(), title: z.string(), text: z.string(), reference: z.string().optional() });

export const loadResultSchema = z.object({
  label: z.string(),
  kind: z.string(),
  method: z.string(),
  quantity: z.number(),
  phases: z.number(),
  ...triangle,
  measuredKVA: z.number().optional(),
  truePF: z.number().optional(),
  lineCurrentA: z.number().describe("line current of the whole entry at currentVoltageV"),
  currentVoltageV: z.number().describe("the voltage the current is worked at: the reading's volts, else the system voltage"),
  currentBasis: z.enum(["reading", "system_voltage"]).describe('"system_voltage" when the reading has no volts'),
});

export const siteResultSchema = z.object({
  ...triangle,
  basis: z.enum(["sum_of_loads", "service_entrance"]),
  lineCurrentA: z.number(),
  sumOfLoads: z.object(triangle),
  unmetered: z.object({ kW: z.number(), kvar: z.number() }).optional(),
});

export const correctionSchema = z.object({
  targetPF: z.number(),
  action: z.enum(["add", "remove", "none"]).describe("add capacitors (lagging beyond the target), remove the leading excess, or none"),
  kvarRequired: z.number(),
  kvarPerKW: z.number(),
  leadingExcessKvar: z.number(),
  pfAfter: z.number().describe("after the action: capacitors added, or the leading excess taken out of service"),
  pfAfterSense: sense,
  kvarAfter: z.number(),
  kVABefore: z.number(),
  kVAAfter: z.number(),
  kVAReleased: z.number(),
  lineCurrentBeforeA: z.number(),
  lineCurrentAfterA: z.number(),
  lossReductionPct: z.number(),
  kvarInstalledInService: z
    .number()
    .optional()
    .describe("with installed banks: kvar the energised steps delivered during the readings (measured where given, else rated)"),
  kvarIncludedInReadings: z.number().optional().describe("installed kvar the readings already include, added back to find the uncorrected site"),
  kvarRequiredTotal: z.number().optional().describe("what the uncorrected site needs to reach the target"),
  kvarInstalledRated: z.number().optional().describe("rated kvar of every installed step at the system voltage and frequency"),
  kvarAdditional: z.number().optional().describe("what remains after the installed banks are restored to health and fully used"),
  repairFirst: z
    .array(
      z.object({
        bank: z.string(),
        step: z.number().int(),
        status: z.enum(["failed", "degraded", "unbalanced"]),
        restoresKvar: z.number(),
        finding: z.string(),
      }),
    )
    .optional()
    .describe("steps whose repair gives kvar before any new capacitor is bought, largest first"),
  kvarRestoredByRepair: z.number().optional(),
  leadingRelief: z
    .object({
      takeOutOfService: z.array(z.object({ bank: z.string(), step: z.number().int(), control: z.enum(["fixed", "automatic"]), kvar: z.number() })),
      kvarRemoved: z.number(),
      kvarAfter: z.number(),
      pfAfter: z.number(),
      senseAfter: sense,
      reachesTarget: z.boolean(),
    })
    .optional()
    .describe("a site leading beyond the target: the energised installed steps to take out, and the PF after"),
  basisNote: z.string().optional(),
});

export const installedStepResultSchema = z.object({
  step: z.number().int(),
  nameplateKvar: z.number(),
  ratedKvarAtSystem: z.number(),
  inService: z.boolean(),
  expectedCurrentA: z.number().describe("a healthy step's current at the measured (or system) voltage and frequency"),
  expectedKvar: z.number(),
  measuredCurrentA: z.number().optional().describe("mean of the measured phases"),
  phaseCurrentsA: z.array(z.number()).optional(),
  currentPct: z.number().optional().describe("measured / expected × 100"),
  capacitancePct: z.number().optional().describe("measured capacitance, percent of rated (= currentPct on a plain step)"),
  unbalancePct: z.number().optional().describe("largest phase deviation from the mean, percent of the mean"),
  measuredKvar: z.number().optional(),
  status: z.enum(["healthy", "degraded", "failed", "unbalanced", "not_measured"]),
  finding: z.string(),
});

export const installedBankResultSchema = z.object({
  label: z.string(),
  location: z.enum(["service", "group", "motor"]),
  group: z.string().optional(),
  loadLabel: z.string().optional(),
  control: z.enum(["fixed", "automatic"]),
  reactorPct: z.number(),
  nameplateKvar: z.number(),
  ratedKvarAtSystem: z.number().describe("what a healthy bank delivers at the system voltage and frequency, reactor included"),
  inServiceKvar: z.number().describe("rated kvar at the system voltage of the steps energised during the readings"),
  measuredKvar: z.number().optional(),
  deliveredKvar: z.number(),
  voltageV: z.number(),
  voltageMeasured: z.boolean(),
  read: z.boolean(),
  steps: z.array(installedStepResultSchema),
});

export const bankStageSchema = z.object({
  stage: z.number(),
  cumulativeNameplateKvar: z.number(),
  cumulativeCapacitorKvar: z.number(),
  cumulativeKvar: z.number(),
  resonanceOrder: z.number().nullable(),
  resonanceHz: z.number().nullable(),
  nearHarmonic: z.number().nullable(),
  voltageRisePct: z.number().nullable(),
});

export const bankAnalysisSchema = z.object({
  ratedVoltageV: z.number(),
  ratedFrequencyHz: z.number(),
  reactorPct: z.number(),
  steps: z.array(z.object({ kvar: z.number() })),
  nameplateKvar: z.number(),
  capacitorKvar: z.number(),
  effectiveKvar: z.number(),
  capacitorVoltageV: z.number(),
  capacitorVoltagePctOfRated: z.number(),
  tuningOrder: z.number().nullable(),
  tuningHz: z.number().nullable(),
  ratedCurrentA: z.number(),
  capacitancePerPhase: z.object({ deltaUF: z.number(), wyeUF: z.number() }),
  reactancePerPhaseOhm: z.number(),
  stages: z.array(bankStageSchema),
});

const protectionSchema = z
  .object({
    label: z.string(),
    kvar: z.number(),
    ratedCurrentA: z.number(),
    conductorMinAmpacityA: z.number(),
    disconnectMinA: z.number(),
    device: z.string(),
    ocpdFactor: z.number(),
    ocpdMinA: z.number(),
    ocpdRatingA: z.number().nullable().describe("null above the largest standard rating"),
  })
  .loose();

export const recommendedBankSchema = bankAnalysisSchema.extend({
  combinedProgram: z
    .object({
      steps: z.array(z.object({ source: z.enum(["installed", "new"]), kvar: z.number() })),
      fixedKvar: z.number(),
      metShare: z.number(),
      newAloneMetShare: z.number(),
      note: z.string(),
    })
    .optional()
    .describe("with an installed automatic bank: both banks' steps under one controller, installed first"),
  arrangement: z.enum(["fixed", "automatic", "fixed_and_automatic"]),
  reason: z.string(),
  belowTarget: z.boolean(),
  fixedKvar: z.number(),
  switchedKvar: z.number(),
  fixedNameplateKvar: z.number().describe("fixed part at nameplate (standard sizes at ratedVoltageV); fixedKvar is what it delivers"),
  switchedNameplateKvar: z.number(),
  physicalSteps: z.array(z.object({ role: z.enum(["fixed", "switched"]), effectiveKvar: z.number(), nameplateKvar: z.number() })),
  stepPlan: z.object({ source: z.string(), samples: z.number(), coverage: z.number(), metShare: z.number() }).loose(),
  controller: z.object({ ctRatio: z.number(), smallestStepKvar: z.number(), responseA: z.number() }).nullable(),
  protection: z.object({ steps: z.array(protectionSchema), bank: protectionSchema }).nullable(),
  discharge: z.array(z.object({ kvar: z.number(), ratedVoltageV: z.number(), maxResistanceOhm: z.number(), governingCitation: z.string() }).loose()),
  notes: z.array(z.string()),
});

export const placementSchema = z.object({
  loads: z.array(
    z
      .object({
        index: z.number(),
        label: z.string(),
        location: z.string(),
        reason: z.string(),
        needKvar: z.number(),
        terminal: z
          .object({
            perMotorKvar: z.number().describe("kvar one unit delivers at voltageV"),
            perMotorNameplateKvar: z.number().describe("a standard size at ratedVoltageV"),
            ratedVoltageV: z.number(),
            voltageV: z.number(),
            totalKvar: z.number(),
            selfExcitationLimitKvar: z.number(),
            lineCurrentBeforeA: z.number(),
            lineCurrentAfterA: z.number(),
            overloadNote: z.string(),
            capacitorRatedCurrentA: z.number(),
            conductorMinAmpacityA: z.number().describe("NFPA 70 460.8(A)"),
            conductorNote: z.string(),
          })
          .optional(),
      })
      .loose(),
  ),
  locations: z.array(z.object({ location: z.string(), kvar: z.number(), loads: z.array(z.string()) })),
  totalKvar: z.number(),
  siteRequiredKvar: z.number(),
  differenceKvar: z.number(),
  balanceNote: z.string(),
  notes: z.array(z.string()),
  warnings: z.array(warningSchema),
});

export const resonanceSchema = z.object({
  shortCircuitKVA: z.number(),
  transformerShortCircuitKVA: z.number().nullable(),
  utilityShortCircuitKVA: z.number().nullable(),
  harmonicOrdersPresent: z.array(z.number()),
  nonlinearKVA: z.number(),
  nonlinearSharePct: z.number().nullable(),
  harmonicStudyAdvised: z.boolean(),
  harmonicStudyReasons: z.array(z.string()).describe("why the study is advised; a detuned proposal always is a reason"),
  recommendedBankVoltageRisePct: z.number().nullable(),
  proposedBankVoltageRisePct: z.number().nullable(),
});

const billedCharge = z.object({
  billedQuantity: z.number(),
  billedUnit: z.enum(["kVA", "kW", "kvarh", "none"]),
  charge: z.number(),
  pf: z.number().optional().describe("the PF a PF-adjusted demand clause compared with its base"),
});
export const economicsResultSchema = z.object({
  currency: z.string(),
  tariff: z.object({ form: z.string() }).loose(),
  basis: z.enum(["interval_data", "survey_demand"]),
  intervalMethod: z
    .object({ method: z.enum(["monthly_load_points", "site_load_points_scaled"]), estimate: z.boolean(), note: z.string() })
    .optional()
    .describe("with interval data: how the after-correction months were worked, and whether they are an estimate"),
  periods: z.array(
    z.object({
      label: z.string(),
      figures: z
        .object({
          kWh: z.number(),
          peakKW: z.number(),
          peakKVABefore: z.number(),
          peakKVAAfter: z.number(),
          kvarhLaggingBefore: z.number(),
          kvarhLaggingAfter: z.number(),
          kvarhLeadingBefore: z.number(),
          kvarhLeadingAfter: z.number(),
        })
        .describe("the period's demand and energy before and after correction; leading kvarh shown apart"),
      before: billedCharge,
      after: billedCharge,
      tariffSaving: z.number(),
      lossSavingKWh: z.number(),
      lossSaving: z.number(),
      saving: z.number(),
    }),
  ),
  savingPerMonth: z.number(),
  savingPerYear: z.number(),
  installedCost: z.number().nullable(),
  costBreakdown: z.object({ perKvar: z.number(), perStep: z.number(), fixed: z.number() }).nullable(),
  costItems: z
    .array(
      z.object({
        item: z.enum(["central_bank", "central_bank_plain", "motor_terminal", "group_bank"]),
        label: z.string(),
        kvar: z.number(),
        units: z.number(),
        reactorPct: z.number(),
        counted: z.boolean(),
        capacitorCost: z.number(),
        reactorCost: z.number().nullable().describe("null: a detuned bank's reactors, not priced"),
        cost: z.number(),
      }),
    )
    .describe("what is proposed, one line each; counted = false: an option shown for comparison, not in the installed cost"),
  simplePaybackYears: z.number().nullable(),
  assumptions: z.array(z.string()),
});

const combinedStageStudySchema = z.object({
  installed: z.array(z.string()),
  newStage: z.number().int().describe("the new bank's stage switched in with them; 0: none"),
  totalKvar: z.number(),
  thdVPct: z.number(),
  worstIndividual: z.object({ order: z.number().int(), pct: z.number() }).nullable(),
  ieee519: z.object({ pass: z.boolean(), thdLimitPct: z.number(), individualLimitPct: z.number() }),
  duty: z.array(
    z.object({
      bank: z.string().describe('installed bank label, or "new"'),
      nameplateKvar: z.number(),
      rmsVoltagePct: z.number(),
      peakVoltagePct: z.number(),
      rmsCurrentPct: z.number(),
      reactivePowerPct: z.number(),
      pass: z.boolean().describe("every quantity within its IEEE Std 18 limit"),
    }),
  ),
});

const combinedHarmonicsSchema = z.object({
  stagesStudied: z.number().int(),
  truncated: z.boolean(),
  worstThdV: combinedStageStudySchema.nullable(),
  flagged: z
    .array(combinedStageStudySchema)
    .describe("combinations breaking an IEEE 519 limit or with a capacitor above 100 % of a rating, worst THD_v first (at most 50)"),
});

export const sizingResultSchema = z.object({
  engineVersion: z.string(),
  system: z.object({ voltageV: z.number(), frequencyHz: z.number(), phases: z.number() }),
  scope: z.object({
    scope: z.enum(["whole_site", "partial"]),
    defaulted: z.boolean().describe("true when the request gave no scope"),
    note: z.string(),
  }),
  loads: z.array(loadResultSchema),
  site: siteResultSchema,
  correction: correctionSchema,
  installedBanks: z.array(installedBankResultSchema).optional(),
  combinedStages: z
    .array(
      z.object({
        withNewBank: z.string().describe('"recommended", "proposed detuned", or "none"'),
        stagesScreened: z.number().int(),
        hazards: z.array(
          z.object({
            installed: z.array(z.string()),
            newStage: z.number().int().describe("the new bank's stage switched in with them; 0: none"),
            totalKvar: z.number(),
            resonanceOrders: z.array(z.number()),
            nearHarmonics: z.array(z.number()),
          }),
        ),
        lowestOrder: z.number().nullable(),
        highestOrder: z.number().nullable(),
        truncated: z.boolean(),
        harmonics: combinedHarmonicsSchema.optional().describe("the harmonic study of the same combinations, when the site has harmonic sources"),
      }),
    )
    .optional()
    .describe("resonance of every combination of installed and new steps the controllers can switch"),
  placement: placementSchema.optional(),
  recommendedBank: recommendedBankSchema.nullable(),
  proposedBank: bankAnalysisSchema.optional(),
  resonance: resonanceSchema.optional(),
  economics: economicsResultSchema.optional(),
  warnings: z.array(warningSchema),
  cautions: z.array(cautionSchema),
});

export const problemSchema = z.object({
  type: z.string(),
  title: z.string(),
  status: z.number(),
  detail: z.string(),
  instance: z.string().optional(),
  errors: z.array(z.object({ path: z.string(), message: z.string() })).optional(),
});

export const healthSchema = z.object({ status: z.literal("ok") });
export const readySchema = z.object({ status: z.literal("ready"), database: z.literal("reachable"), migrations: z.literal("current") });

const limitCheck = z.object({ valuePct: z.number(), limitPct: z.number(), marginPct: z.number(), pass: z.boolean() });
const dutyQuantity = limitCheck.extend({ aboveRating: z.boolean() });
const peak = z.object({ order: z.number(), impedanceOhm: z.number(), timesSourceImpedance: z.number(), timesBaseImpedance: z.number() });
const fullLine = z.object({
  order: z.number(),
  currentA: z.number(),
  impedanceOhm: z.number(),
  injectedPhaseV: z.number(),
  injectedPct: z.number(),
  backgroundPct: z.number(),
  voltagePct: z.number(),
  voltagePhaseV: z.number(),
});
const compactLine = z.object({ order: z.number(), voltagePct: z.number() });
const ieee519 = z.object({
  limits: z.object({ individualPct: z.number(), thdPct: z.number() }).loose(),
  thd: limitCheck,
  individual: limitCheck.extend({ order: z.number().nullable() }),
  pass: z.boolean(),
});
const finding = z.object({
  code: z.string(),
  message: z.string(),
  subject: z.string(),
  bankName: z.string().optional(),
  stageNumber: z.number().optional(),
});

function busStudy(line: z.ZodType) {
  return {
    peaks: z.array(peak),
    dips: z.array(z.object({ order: z.number(), impedanceOhm: z.number() })),
    series: z
      .object({ orders: z.array(z.number()), impedanceOhm: z.array(z.number()) })
      .optional()
      .describe("only from /v1/harmonics/scan"),
    distortion: z.object({ lines: z.array(line), thdVPct: z.number(), worstIndividual: z.object({ order: z.number(), pct: z.number() }).nullable() }),
    ieee519,
    resonanceWithin10PctOf: z.array(z.number()),
  };
}

/** The study's schema; `compact` is the form kept in sizing results (per-order figures trimmed, no series). */
function studySchema(compact: boolean) {
  const duty = z.object({
    ratedPhaseV: z.number(),
    ratedCurrentA: z.number(),
    ...(compact ? {} : { orders: z.array(z.object({ order: z.number(), voltagePhaseV: z.number(), currentA: z.number() })) }),
    rmsVoltage: dutyQuantity,
    peakVoltage: dutyQuantity,
    rmsCurrent: dutyQuantity,
    reactivePower: dutyQuantity,
    pass: z.boolean(),
    aboveRating: z.boolean(),
  });
  const stage = z.object({
    ...busStudy(compact ? compactLine : fullLine),
    stageNumber: z.number(),
    nameplateKvar: z.number(),
    capacitorKvarAtSystem: z.number(),
    effectiveKvar: z.number(),
    tuningOrder: z.number().nullable(),
    estimatedResonanceOrder: z.number(),
    duty,
  });
  const bank = z.object({
    name: z.string(),
    ratedVoltageV: z.number(),
    ratedFrequencyHz: z.number(),
    reactorPct: z.number(),
    stages: z.array(stage),
  });
  return z.object({
    source: z.object({
      baseImpedanceOhm: z.number(),
      resistanceOhm: z.number(),
      reactanceOhm: z.number(),
      xOverR: z.number(),
      xOverRBasis: z.string(),
    }),
    loadResistanceOhm: z.number().nullable(),
    presentOrders: z.array(z.number()),
    sources: z
      .array(
        z.object({
          label: z.string(),
          spectrumBasis: z.enum(["measured_spectrum", "typical_six_pulse_scaled_to_measured_thd", "typical_six_pulse"]),
          currentTHDPct: z.number(),
          kVABasis: z.enum(["rms", "fundamental"]),
          fundamentalA: z.number(),
          note: z.string(),
        }),
      )
      .describe("which spectrum and fundamental current each harmonic source was given"),
    thirdHarmonicSignificant: z.boolean(),
    withoutCapacitors: z.object(busStudy(fullLine)),
    banks: z.array(bank),
    findings: z.array(finding),
    proposals: z.array(
      z.object({
        forBank: z.string(),
        triggeredBy: z.array(z.string()),
        design: z
          .object({
            reactorPct: z.number(),
            tuningOrder: z.number(),
            ratedVoltageV: z.number(),
            ratedFrequencyHz: z.number(),
            capacitorFundamentalVoltageV: z.number(),
            steps: z.array(z.object({ nameplateKvar: z.number(), effectiveKvar: z.number(), requiredEffectiveKvar: z.number() })),
            rationale: z.array(z.string()),
          })
          .loose(),
        purchaseSteps: z
          .array(z.object({ nameplateKvar: z.number(), effectiveKvar: z.number(), requiredEffectiveKvar: z.number() }))
          .optional()
          .describe("what to buy: the bank's physical steps (fixed first) at the proposal's reactor and capacitor voltage"),
        study: bank,
        findings: z.array(finding),
      }),
    ),
    assumptions: z.array(z.string()),
  });
}

export const harmonicStudySchema = studySchema(false);
export const sizingHarmonicsSchema = studySchema(true);

export const sizingWithHarmonicsSchema = sizingResultSchema.extend({ harmonics: sizingHarmonicsSchema.optional() });

export const harmonicScanResultSchema = z.object({
  engineVersion: z.string(),
  system: sizingResultSchema.shape.system,
  site: siteResultSchema,
  correction: correctionSchema,
  resonance: resonanceSchema.optional(),
  recommendedBank: recommendedBankSchema.nullable(),
  proposedBank: bankAnalysisSchema.optional(),
  study: harmonicStudySchema,
  warnings: z.array(warningSchema),
  cautions: z.array(cautionSchema),
});
