import { z } from "zod";
import { MAX_SCAN_POINTS } from "../../core/harmonics/harmonics-api.js";
import { sizingRequestSchema } from "./sizing.js";

export const scanOptionsSchema = z
  .strictObject({
    fromOrder: z.number().min(1, "fromOrder must be at least 1").max(50).optional(),
    toOrder: z.number().min(1).max(50, "toOrder must be at most 50").optional(),
    stepOrder: z.number().min(0.001, "stepOrder must be at least 0.001").max(1, "stepOrder must be at most 1").optional(),
  })
  .refine((s) => (s.fromOrder ?? 1) < (s.toOrder ?? 50), { message: "fromOrder must be below toOrder", path: ["fromOrder"] })
  .refine((s) => ((s.toOrder ?? 50) - (s.fromOrder ?? 1)) / (s.stepOrder ?? 0.01) <= MAX_SCAN_POINTS, {
    message: `the scan would have more than ${MAX_SCAN_POINTS} points: use a larger stepOrder`,
    path: ["stepOrder"],
  });

export const harmonicScanRequestSchema = sizingRequestSchema.extend({
  scan: scanOptionsSchema.optional(),
  combination: z
    .enum(["arithmetic", "rss"])
    .optional()
    .describe("how same-order currents of several sources add; default arithmetic (in phase, worst case)"),
});
