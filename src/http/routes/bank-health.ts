import type { FastifyInstance } from "fastify";
import * as contracts from "../contracts/surveys.js";
import { z } from "zod";
import { bankHealthSeries } from "../../application/bank-health.js";
import { surveyResultsRepo } from "../../store/bank-health-repo.js";
import type { Store } from "../../store/store.js";
import { parseOr400 } from "../validate.js";
import { findBuilding } from "./buildings.js";

const idParams = z.object({ id: z.string() });
/** Surveys read per answer; more are left off and the answer says so. */
export const BANK_HEALTH_MAX_SURVEYS = 1000;

/** GET /v1/buildings/{id}/bank-health: capacitance and status of every installed step across the surveys. */
export async function bankHealthRoutes(app: FastifyInstance, opts: { store: Store }): Promise<void> {
  const { store } = opts;
  const repo = surveyResultsRepo(store.db);
  app.get("/v1/buildings/:id/bank-health", { schema: contracts.buildingBankHealth }, async (request) => {
    const { id } = parseOr400(idParams, request.params);
    const { orgId } = request.actor;
    findBuilding(store, orgId, id);
    const rows = repo.withInstalledBanks(orgId, id, BANK_HEALTH_MAX_SURVEYS + 1);
    const series = bankHealthSeries(
      rows.slice(0, BANK_HEALTH_MAX_SURVEYS).map((r) => ({
        surveyId: r.surveyId,
        surveyedAt: r.surveyedAt,
        definitions: r.building.installedBanks ?? [],
        results: r.result.installedBanks ?? [],
      })),
    );
    return { buildingId: id, order: "oldest_first", truncated: rows.length > BANK_HEALTH_MAX_SURVEYS, series };
  });
}
