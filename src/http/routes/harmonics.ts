import type { FastifyInstance } from "fastify";
import * as contracts from "../contracts/sizing.js";
import { problem, ProblemError } from "../problem.js";
import { harmonicScanRequestSchema } from "../schemas/harmonics.js";
import { engineIssuesTo400, parseOr400 } from "../validate.js";

/** POST /v1/harmonics/scan: the sizing body plus scan options → the study with its |Z(h)| series for plots. */
export async function harmonicsRoutes(app: FastifyInstance): Promise<void> {
  app.post("/v1/harmonics/scan", { schema: contracts.harmonicScan }, async (request, reply) => {
    const body = parseOr400(harmonicScanRequestSchema, request.body);
    if (!body.transformer && !body.utility) {
      throw new ProblemError(
        problem(400, "validation", "The request is not valid", "transformer: a harmonic scan needs the source strength", [
          { path: "transformer", message: "a harmonic scan needs the source strength: give the transformer (and the utility fault level if known)" },
        ]),
      );
    }
    const { scan, combination, ...sizing } = body;
    // On a worker thread: a dense scan of a large bank, and its JSON, take long enough to hold other requests up.
    const out = await app.heavyWork.run("harmonicScan", {
      input: sizing,
      options: {
        forceHarmonicStudy: true,
        harmonics: { includeScanSeries: true, ...(scan ? { scan } : {}), ...(combination ? { combination } : {}) },
      },
    });
    if (!ArrayBuffer.isView(out)) throw engineIssuesTo400(out.issues);
    return reply.type("application/json; charset=utf-8").send(Buffer.from(out.buffer, out.byteOffset, out.byteLength));
  });
}
