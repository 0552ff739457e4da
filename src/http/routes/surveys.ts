import type { FastifyInstance } from "fastify";
import * as contracts from "../contracts/surveys.js";
import { z } from "zod";
import { newId } from "../../store/ids.js";
import type { Store } from "../../store/store.js";
import type { IntervalAnalysisRecord } from "../../store/types.js";
import { idempotentWrite } from "../idempotency.js";
import { notFound, ProblemError, validationProblem } from "../problem.js";
import { revisionInputsSchema, surveyInputsSchema } from "../schemas/surveys.js";
import { computeRevision } from "../../application/survey-sizing.js";
import { parseOr400 } from "../validate.js";
import { findBuilding } from "./buildings.js";

const idParams = z.object({ id: z.string() });

/**
 * The interval analysis a survey of the building is sized with: the one named (it must be the same building's),
 * none when null, else the building's newest (none when it has none).
 */
export function analysisFor(store: Store, orgId: string, buildingId: string, requested: string | null | undefined): IntervalAnalysisRecord | undefined {
  if (requested === null) return undefined;
  if (requested === undefined) return store.intervalAnalyses.newestOf(orgId, buildingId);
  const a = store.intervalAnalyses.get(orgId, requested);
  if (a && a.buildingId === buildingId) return a;
  const message = `building ${buildingId} has no interval analysis ${requested}; see GET /v1/buildings/${buildingId}/interval-analyses`;
  throw new ProblemError(validationProblem([{ path: "intervalAnalysisId", message }]));
}

/** Writes of surveys: a new survey, and new revisions of one (nothing is ever changed in place). */
export async function surveysRoutes(app: FastifyInstance, opts: { store: Store }): Promise<void> {
  const { store } = opts;

  app.post("/v1/buildings/:id/surveys", { schema: contracts.createSurvey }, async (request, reply) => {
    const { id: buildingId } = parseOr400(idParams, request.params);
    const inputs = parseOr400(surveyInputsSchema, request.body);
    const { orgId, actorId } = request.actor;
    return idempotentWrite(store, request, reply, () => {
      const building = findBuilding(store, orgId, buildingId);
      const at = store.now().toISOString();
      const surveyId = newId("srv");
      const analysis = analysisFor(store, orgId, buildingId, inputs.intervalAnalysisId);
      const first = computeRevision(building, inputs, { surveyId, n: 1, reason: null, actor: actorId, at }, analysis);
      store.surveys.create(orgId, buildingId, first);
      store.audit.record({ orgId, actor: actorId, action: "survey.create", resourceType: "survey", resourceId: surveyId, requestId: request.id, at });
      return {
        status: 201,
        body: { id: surveyId, revision: 1, buildingId, result: first.result },
        location: `/v1/surveys/${surveyId}`,
      };
    });
  });

  app.post("/v1/surveys/:id/revisions", { schema: contracts.reviseSurvey }, async (request, reply) => {
    const { id: surveyId } = parseOr400(idParams, request.params);
    const { reason, ...inputs } = parseOr400(revisionInputsSchema, request.body);
    const { orgId, actorId } = request.actor;
    return idempotentWrite(store, request, reply, () => {
      const head = store.surveys.head(orgId, surveyId);
      if (!head) throw new ProblemError(notFound(`survey ${surveyId}`));
      const building = findBuilding(store, orgId, head.buildingId);
      const at = store.now().toISOString();
      const n = head.revision + 1;
      const analysis = analysisFor(store, orgId, head.buildingId, inputs.intervalAnalysisId);
      const next = computeRevision(building, inputs, { surveyId, n, reason, actor: actorId, at }, analysis);
      if (!store.surveys.revise(orgId, next)) throw new Error(`survey ${surveyId} moved inside its own transaction`);
      store.audit.record({ orgId, actor: actorId, action: "survey.revise", resourceType: "survey", resourceId: surveyId, requestId: request.id, at });
      return {
        status: 201,
        body: { id: surveyId, revision: n, buildingId: head.buildingId, result: next.result },
        location: `/v1/surveys/${surveyId}/revisions/${n}`,
      };
    });
  });
}
