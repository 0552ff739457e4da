import type { FastifyInstance } from "fastify";
import * as contracts from "../contracts/intervals.js";
import type { Store } from "../../store/ports.js";
import { INTERVAL_MAX_BYTES } from "../interval/ingest.js";
import { analyseUpload, installUploadParsers } from "../interval/upload.js";
import { storedIntervalRoutes } from "./stored-intervals.js";

/**
 * Interval data: POST /v1/interval-analyses (a year of interval demand data in, reactive-demand figures and a bank
 * simulation out, nothing stored), and analyses stored with a building (./stored-intervals.ts). One plugin, so the
 * upload routes share its body parsers.
 */
export async function intervalAnalysesRoutes(app: FastifyInstance, opts: { store: Store }): Promise<void> {
  await installUploadParsers(app);

  app.post(
    "/v1/interval-analyses",
    { bodyLimit: INTERVAL_MAX_BYTES, schema: contracts.analyseIntervals },
    async (request) => (await analyseUpload(request)).answer,
  );

  storedIntervalRoutes(app, opts.store);
}
