import { z } from "zod";
import { economicsSchema, installedBanksSchema, systemSchema, transformerSchema, utilitySchema } from "./sizing.js";

/** Request and response schemas of /v1/buildings. */

const name = z.string({ error: "name must be a string" }).trim().min(1, "name must not be empty").max(200, "name must be at most 200 characters");
const address = z.string({ error: "address must be a string" }).trim().max(500, "address must be at most 500 characters");
const notes = z.string({ error: "notes must be a string" }).max(5000, "notes must be at most 5000 characters");

export const buildingCreateSchema = z.strictObject({
  name,
  address: address.optional(),
  notes: notes.optional(),
  system: systemSchema,
  transformer: transformerSchema.optional(),
  utility: utilitySchema.optional(),
  economics: economicsSchema.optional().describe("tariff and costs: surveys of the building get savings and payback"),
  installedBanks: installedBanksSchema.optional().describe("capacitor banks already installed; surveys read them with bankReadings"),
});

/** Partial update: omitted fields stay; null clears an optional one. */
export const buildingPatchSchema = z
  .strictObject({
    name: name.optional(),
    address: address.nullable().optional(),
    notes: notes.nullable().optional(),
    system: systemSchema.optional(),
    transformer: transformerSchema.nullable().optional(),
    utility: utilitySchema.nullable().optional(),
    economics: economicsSchema.nullable().optional().describe("replaces the whole settings; null clears them"),
    installedBanks: installedBanksSchema.optional().describe("replaces the whole list; [] when none are left"),
  })
  .refine((p) => Object.keys(p).length > 0, "send at least one field to change");

export type BuildingCreate = z.infer<typeof buildingCreateSchema>;
export type BuildingPatch = z.infer<typeof buildingPatchSchema>;

export const buildingListQuerySchema = z.strictObject({
  q: z.string().trim().max(200, "q must be at most 200 characters").optional(),
  limit: z.string().optional(),
  cursor: z.string().optional(),
});

/** The stored EconomicsSettings as responses show them (documentation; the request side is economicsSchema). */
export const economicsSettingsViewSchema = z.object({
  currency: z.string(),
  tariff: z.object({ form: z.string() }).loose(),
  operatingHoursPerMonth: z.number().optional(),
  losses: z.object({ lossesPct: z.number(), energyPricePerKWh: z.number() }).optional(),
  cost: z.object({ perKvar: z.number().optional(), perStep: z.number().optional(), fixed: z.number().optional() }).optional(),
});

/** An installed bank as responses show it (the request side is installedBankSchema). */
export const installedBankViewSchema = z.object({
  label: z.string(),
  location: z.enum(["service", "group", "motor"]),
  group: z.string().optional(),
  loadLabel: z.string().optional(),
  control: z.enum(["fixed", "automatic"]),
  ratedVoltageV: z.number(),
  ratedFrequencyHz: z.number().optional(),
  connection: z.enum(["delta", "wye"]).optional(),
  reactorPct: z.number().optional(),
  steps: z.array(z.object({ kvar: z.number() })),
  installedOn: z.string().optional(),
});

const electrical = {
  system: z.object({ voltageV: z.number(), frequencyHz: z.number(), phases: z.number() }),
  transformer: z.object({ kVA: z.number(), impedancePct: z.number(), xOverR: z.number().optional() }).nullable(),
  utility: z.object({ faultMVA: z.number() }).nullable(),
  economics: economicsSettingsViewSchema.nullable().describe("tariff and costs; null when none"),
  installedBanks: z.array(installedBankViewSchema).describe("capacitor banks already installed; [] when none"),
};

export const buildingSchema = z.object({
  id: z.string(),
  version: z.number().int().describe("1 on creation, +1 on every change"),
  name: z.string(),
  address: z.string().nullable(),
  notes: z.string().nullable(),
  ...electrical,
  createdAt: z.string(),
  updatedAt: z.string(),
});

export const buildingPageSchema = z.object({
  items: z.array(buildingSchema),
  nextCursor: z.string().nullable().describe("pass as ?cursor= for the next page; null on the last page"),
});

export const buildingHistorySchema = z.object({
  buildingId: z.string(),
  order: z.literal("oldest_first"),
  items: z.array(
    z.object({
      version: z.number().int(),
      recordedAt: z.string(),
      actor: z.string(),
      name: z.string(),
      address: z.string().nullable(),
      notes: z.string().nullable(),
      ...electrical,
    }),
  ),
});
