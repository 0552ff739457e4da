import type { FastifyInstance } from "fastify";
import * as contracts from "../contracts/surveys.js";
import { z } from "zod";
import { bankHealthOf } from "../../application/survey-reads.js";
import type { Store } from "../../store/ports.js";
import { parseOr400 } from "../validate.js";

const idParams = z.object({ id: z.string() });
export { BANK_HEALTH_MAX_SURVEYS } from "../../application/survey-reads.js";

/** GET /v1/buildings/{id}/bank-health: capacitance and status of every installed step across the surveys. */
export async function bankHealthRoutes(app: FastifyInstance, opts: { store: Store }): Promise<void> {
  const { store } = opts;
  app.get("/v1/buildings/:id/bank-health", { schema: contracts.buildingBankHealth }, async (request) => {
    const { id } = parseOr400(idParams, request.params);
    const { truncated, series } = await bankHealthOf(store, request.actor.orgId, id);
    return { buildingId: id, order: "oldest_first", truncated, series };
  });
}
