import { z } from "zod";
import { harmonicScanRequestSchema } from "../schemas/harmonics.js";
import { harmonicScanResultSchema, sizingWithHarmonicsSchema } from "../schemas/results.js";
import { sizingRequestSchema } from "../schemas/sizing.js";
import { html, json, pdf, problems, withKey, type RouteContract } from "./types.js";

/** The stateless computations: a sizing, a harmonic scan, and a sizing's report. */

export const size: RouteContract = {
  operationId: "size",
  summary: "Size power-factor correction from readings (stateless)",
  description:
    "Each load's power triangle, the site's displacement PF, the kvar to the target, a recommended bank, the proposed bank's stages and a resonance screen against the supply transformer.",
  tags: ["sizing"],
  security: withKey,
  body: sizingRequestSchema,
  response: { "200": json("the sizing result", sizingWithHarmonicsSchema), ...problems(withKey, 400, 413, 415) },
};

export const harmonicScan: RouteContract = {
  operationId: "harmonicScan",
  summary: "Harmonic study with the impedance scan series per stage",
  description:
    "The sizing body plus scan options: |Z(h)| at the capacitor bus for the bus alone and every cumulative stage of the recommended and proposed banks, parallel-resonance peaks and series-tuned dips, harmonic voltages and THD_v against IEEE Std 519-2014 Table 1, capacitor duty against IEEE Std 18, and a detuned design when a stage fails.",
  tags: ["harmonics"],
  security: withKey,
  body: harmonicScanRequestSchema,
  response: { "200": json("the study with scan series", harmonicScanResultSchema), ...problems(withKey, 400, 413, 415) },
};

export const paperQuery = z.enum(["a4", "letter"]).optional().describe("paper size of the PDF (default a4)");

export const sizingReport: RouteContract = {
  operationId: "sizingReport",
  summary: "The report of a sizing request, as a self-contained HTML page or a PDF (nothing is stored)",
  tags: ["sizing", "reports"],
  security: withKey,
  querystring: z.object({ format: z.enum(["html", "pdf"]).optional().describe("html (default) or pdf"), paper: paperQuery }),
  body: sizingRequestSchema,
  response: {
    "200": {
      description: "the report: HTML by default, a PDF with format=pdf",
      content: { ...html("").content, ...pdf("").content },
    },
    ...problems(withKey, 400, 413, 415),
  },
};
