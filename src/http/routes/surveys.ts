import type { FastifyInstance } from "fastify";
import * as contracts from "../contracts/surveys.js";
import { z } from "zod";
import { recordSurvey, reviseSurvey, type RecordedSurvey } from "../../application/surveys.js";
import { finishWith, JsonText } from "../../application/write-outcome.js";
import type { Store } from "../../store/ports.js";
import { whoOf } from "../actor.js";
import { idempotentWrite } from "../idempotency.js";
import { revisionInputsSchema, surveyInputsSchema } from "../schemas/surveys.js";
import { parseOr400 } from "../validate.js";

const idParams = z.object({ id: z.string() });

const CLOSE = Buffer.from("}");

/**
 * The 201 answer `{ id, revision, buildingId, result }` as UTF-8 JSON around the result's stored bytes: the same
 * bytes JSON.stringify would give, without serialising the result a second time.
 */
function created(s: RecordedSurvey, buildingId: string, location: string) {
  const head = Buffer.from(`{"id":${JSON.stringify(s.surveyId)},"revision":${s.revision.n},"buildingId":${JSON.stringify(buildingId)},"result":`);
  return { status: 201, body: new JsonText(Buffer.concat([head, s.revision.resultUtf8, CLOSE])), location };
}

/** Writes of surveys: a new survey, and new revisions of one (nothing is ever changed in place). */
export async function surveysRoutes(app: FastifyInstance, opts: { store: Store }): Promise<void> {
  const { store } = opts;

  app.post("/v1/buildings/:id/surveys", { schema: contracts.createSurvey }, async (request, reply) => {
    const { id: buildingId } = parseOr400(idParams, request.params);
    const inputs = parseOr400(surveyInputsSchema, request.body);
    return idempotentWrite(store, request, reply, (seal) =>
      recordSurvey(
        store,
        whoOf(request),
        buildingId,
        inputs,
        finishWith(seal, (s) => created(s, buildingId, `/v1/surveys/${s.surveyId}`)),
      ),
    );
  });

  app.post("/v1/surveys/:id/revisions", { schema: contracts.reviseSurvey }, async (request, reply) => {
    const { id: surveyId } = parseOr400(idParams, request.params);
    const { reason, ...inputs } = parseOr400(revisionInputsSchema, request.body);
    return idempotentWrite(store, request, reply, (seal) =>
      reviseSurvey(
        store,
        whoOf(request),
        surveyId,
        reason,
        inputs,
        finishWith(seal, (s) => created(s, s.buildingId, `/v1/surveys/${surveyId}/revisions/${s.revision.n}`)),
      ),
    );
  });
}
