import type { FastifyInstance } from "fastify";
import * as contracts from "../contracts/sizing.js";
import { size } from "../../core/pipeline/size.js";
import { problem, ProblemError } from "../problem.js";
import { harmonicScanRequestSchema } from "../schemas/harmonics.js";
import { engineIssuesTo400, parseOr400 } from "../validate.js";

/** POST /v1/harmonics/scan: the sizing body plus scan options → the study with its |Z(h)| series for plots. */
export async function harmonicsRoutes(app: FastifyInstance): Promise<void> {
  app.post("/v1/harmonics/scan", { schema: contracts.harmonicScan }, async (request) => {
    const body = parseOr400(harmonicScanRequestSchema, request.body);
    if (!body.transformer && !body.utility) {
      throw new ProblemError(
        problem(400, "validation", "The request is not valid", "transformer: a harmonic scan needs the source strength", [
          { path: "transformer", message: "a harmonic scan needs the source strength: give the transformer (and the utility fault level if known)" },
        ]),
      );
    }
    const { scan, combination, ...sizing } = body;
    const outcome = size(sizing, {
      forceHarmonicStudy: true,
      harmonics: { includeScanSeries: true, ...(scan ? { scan } : {}), ...(combination ? { combination } : {}) },
    });
    if (!outcome.ok) throw engineIssuesTo400(outcome.issues);
    const r = outcome.result;
    return {
      engineVersion: r.engineVersion,
      system: r.system,
      site: r.site,
      correction: r.correction,
      resonance: r.resonance,
      recommendedBank: r.recommendedBank,
      ...(r.proposedBank ? { proposedBank: r.proposedBank } : {}),
      study: outcome.study,
      warnings: r.warnings,
      cautions: r.cautions,
    };
  });
}
