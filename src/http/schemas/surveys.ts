import { z } from "zod";
import { economicsSettingsViewSchema, installedBankViewSchema } from "./buildings.js";
import { sizingResultSchema } from "./results.js";
import {
  backgroundDistortionSchema,
  bankDesignSchema,
  bankReadingsSchema,
  bankSchema,
  harmonicSourcesSchema,
  loadsSchema,
  scopeSchema,
  serviceEntranceSchema,
  targetPFSchema,
} from "./sizing.js";
import type { SurveyInputs } from "../../store/types.js";

/** Request and response schemas of surveys and their revisions. */

/** Years a survey can plausibly carry; also keeps year 0000 (which PostgreSQL's timestamptz refuses) out of both stores. */
const FIRST_YEAR = 1900;
const LAST_YEAR = 2200;
export const isoInstantSchema = z
  .union([z.iso.date(), z.iso.datetime({ offset: true })], {
    error: "must be an ISO 8601 date (2024-03-05) or date-time with a zone (2024-03-05T09:30:00Z or …+01:00)",
  })
  .refine(
    (v) => {
      const year = new Date(v).getUTCFullYear();
      return year >= FIRST_YEAR && year <= LAST_YEAR;
    },
    { error: `must fall between the years ${FIRST_YEAR} and ${LAST_YEAR}` },
  );

export const surveyInputsSchema = z.strictObject({
  surveyedAt: isoInstantSchema.describe("when the readings were taken"),
  surveyor: z.string({ error: "surveyor must be a string" }).trim().min(1, "surveyor must not be empty").max(200),
  notes: z.string({ error: "notes must be a string" }).max(5000, "notes must be at most 5000 characters").optional(),
  targetPF: targetPFSchema,
  scope: scopeSchema.optional(),
  loads: loadsSchema,
  serviceEntrance: serviceEntranceSchema.optional(),
  proposedBank: bankSchema.optional(),
  harmonicSources: harmonicSourcesSchema.optional(),
  backgroundVoltageDistortion: backgroundDistortionSchema.optional(),
  lightLoad: serviceEntranceSchema.optional(),
  bankDesign: bankDesignSchema.optional(),
  bankReadings: bankReadingsSchema
    .optional()
    .describe("the building's installed banks as found: steps energised during the readings, measured currents"),
  intervalAnalysisId: z
    .string({ error: "intervalAnalysisId must be a string or null" })
    .trim()
    .min(1, "intervalAnalysisId must not be empty")
    .max(100, "intervalAnalysisId must be at most 100 characters")
    .nullable()
    .optional()
    .describe("a stored interval analysis of this building to design the bank from; absent: the building's newest, if any; null: none"),
});

export const revisionInputsSchema = surveyInputsSchema.extend({
  reason: z
    .string({ error: "reason is required: say why the survey is revised" })
    .trim()
    .min(1, "reason must not be empty: say why the survey is revised")
    .max(1000, "reason must be at most 1000 characters"),
});

// Compile-time check: parsed survey inputs are what the store keeps.
const _assignable: (r: z.infer<typeof surveyInputsSchema>) => SurveyInputs = (r) => r;
void _assignable;

export const surveyListQuerySchema = z.strictObject({
  from: isoInstantSchema.optional().describe("inclusive; a date means from its start (UTC)"),
  to: isoInstantSchema.optional().describe("inclusive; a date means to its end (UTC)"),
  limit: z.string().optional(),
  cursor: z.string().optional(),
});

export const trendQuerySchema = z.strictObject({ from: isoInstantSchema.optional(), to: isoInstantSchema.optional() });

export const buildingSnapshotSchema = z.object({
  buildingVersion: z.number().int(),
  system: z.object({ voltageV: z.number(), frequencyHz: z.number(), phases: z.number() }),
  transformer: z.object({ kVA: z.number(), impedancePct: z.number(), xOverR: z.number().optional() }).nullable(),
  utility: z.object({ faultMVA: z.number() }).nullable(),
  economics: economicsSettingsViewSchema.nullable().describe("the building's tariff and costs the economics were computed with"),
  intervalAnalysisId: z.string().nullable().describe("the interval analysis the bank design rests on; null when none"),
  installedBanks: z.array(installedBankViewSchema).describe("the building's installed banks the result was computed with"),
});

export const surveyCreatedSchema = z.object({
  id: z.string(),
  revision: z.number().int(),
  buildingId: z.string(),
  result: sizingResultSchema,
});

const revisionFields = {
  buildingId: z.string(),
  revision: z.number().int(),
  createdAt: z.string().describe("when this revision was stored"),
  actor: z.string(),
  reason: z.string().nullable().describe("why this revision was made; null on revision 1"),
  engineVersion: z.string(),
  inputs: surveyInputsSchema,
  result: sizingResultSchema.describe("as computed when the revision was stored, never recomputed"),
  building: buildingSnapshotSchema.describe("the building's data the result was computed with"),
};

export const revisionSchema = z.object({ surveyId: z.string(), ...revisionFields });

export const surveySchema = z.object({
  id: z.string(),
  ...revisionFields,
  revisions: z.array(z.object({ n: z.number().int(), createdAt: z.string(), reason: z.string().nullable() })),
});

export const surveySummarySchema = z.object({
  id: z.string(),
  revision: z.number().int(),
  surveyedAt: z.string(),
  surveyor: z.string(),
  kW: z.number(),
  kvar: z.number(),
  displacementPF: z.number(),
  kvarRequired: z.number(),
  warningCount: z.number().int(),
});

export const surveyPageSchema = z.object({ items: z.array(surveySummarySchema), nextCursor: z.string().nullable() });

/** Page 1 of a stored survey's report as data: the same lines, from the same code (src/report/sections/verdict.ts). */
export const verdictSchema = z.object({
  surveyId: z.string(),
  revision: z.number().int(),
  install: z.array(z.string()).describe("what to install, one line per place; empty when nothing is to be bought"),
  instead: z.string().nullable().describe("the line when nothing is installed"),
  repairFirst: z.array(z.string()).describe("what to repair before anything new is bought"),
  after: z.string().describe("the PF and kVA after, from before"),
  money: z
    .object({ cost: z.string().nullable(), savingPerYear: z.string().nullable(), payback: z.string().nullable() })
    .nullable()
    .describe("formatted in the building's currency; null without a tariff"),
  risks: z.array(z.string()).describe("the one or two risks that matter, most serious first"),
  caution: z.string().describe("the safety line page 1 carries"),
});

export const trendSchema = z.object({
  buildingId: z.string(),
  order: z.literal("oldest_first"),
  truncated: z.boolean().describe("true when more points exist than one response carries; narrow from/to"),
  items: z.array(
    z.object({
      surveyId: z.string(),
      revision: z.number().int(),
      surveyedAt: z.string(),
      kW: z.number(),
      kvar: z.number(),
      displacementPF: z.number(),
      kvarRequired: z.number(),
      installedKvarInService: z
        .number()
        .nullable()
        .describe("rated kvar (at the system voltage) of the installed steps energised during the readings; null: no installed banks"),
      kvarDelivered: z.number().nullable().describe("kvar those steps delivered, from the measured currents where given; null: no installed banks"),
    }),
  ),
});

export const bankHealthSchema = z.object({
  buildingId: z.string(),
  order: z.literal("oldest_first"),
  truncated: z.boolean().describe("true when the building has more surveys with installed banks than one answer reads"),
  series: z.array(
    z.object({
      bank: z.string(),
      startedBecause: z
        .enum(["first_seen", "replaced", "renamed"])
        .describe("a bank redefined (replaced) or relabelled (renamed) in the building history starts a new series"),
      note: z.string().nullable(),
      definition: installedBankViewSchema,
      steps: z.array(
        z.object({
          step: z.number().int(),
          nameplateKvar: z.number(),
          points: z.array(
            z.object({
              surveyId: z.string(),
              surveyedAt: z.string(),
              capacitancePct: z.number().nullable().describe("null when the step's current was not measured"),
              status: z.enum(["healthy", "degraded", "failed", "unbalanced", "not_measured"]),
              measuredKvar: z.number().nullable(),
            }),
          ),
        }),
      ),
    }),
  ),
});

export const auditPageSchema = z.object({
  items: z.array(
    z.object({
      id: z.number().int(),
      at: z.string(),
      actor: z.string(),
      action: z.string(),
      resourceType: z.string(),
      resourceId: z.string(),
      requestId: z.string().nullable(),
    }),
  ),
  nextCursor: z.string().nullable(),
});
