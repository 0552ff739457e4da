import { z } from "zod";
import { ROLES } from "../../auth/keys.js";

/** Request and response schemas of /v1/keys. */

export const keyCreateSchema = z.strictObject({
  role: z.enum(ROLES),
  label: z.string().trim().min(1).max(100).optional(),
});

export const keySchema = z.object({
  id: z.string(),
  prefix: z.string(),
  role: z.enum(ROLES),
  label: z.string().nullable(),
  createdAt: z.string(),
  createdBy: z.string(),
  lastUsedAt: z.string().nullable(),
  revokedAt: z.string().nullable(),
});
export const keyCreatedSchema = keySchema.extend({ key: z.string().describe("the API key: shown this once, stored only as a hash") });
export const keyListSchema = z.object({ items: z.array(keySchema) });
