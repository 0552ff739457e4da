/**
 * Recording and revising surveys. The engine sizes the survey BEFORE the write transaction opens, against the
 * building (and interval analysis) read then; the transaction only checks that neither moved and writes. When one
 * did (a building PATCH or another revision committed meanwhile) the survey is sized once more against the new
 * state; moved twice, the caller gets a Conflict.
 *
 * The sizing runs on the event loop, not on the worker pool: measured on the 2-core bench machine (when each group
 * still blocked the loop for its fsync), surveys sized on worker threads came back one by one and formed groups of
 * about two per COMMIT (against six or seven sized here, src/store/sqlite/group-commit.ts), while the threads
 * competed with the loop for the same cores; stored surveys per second fell by about a third.
 */
import { findBuilding } from "./buildings.js";
import { Conflict, FieldRejected, NotFound } from "./errors.js";
import { computeSerializedRevision, type SerializedRevision } from "./survey-sizing.js";
import type { Finish, Who, WriteOutcome } from "./write-outcome.js";
import { newId } from "../store/ids.js";
import type { Repositories, Store } from "../store/ports.js";
import type { IntervalAnalysisRecord, SurveyInputs } from "../store/types.js";

/** How many times a write sized against a state that moved is sized again before the caller is told. */
const SIZING_ATTEMPTS = 2;

/**
 * The interval analysis a survey of the building is sized with: the one named (it must be the same building's),
 * none when null, else the building's newest (none when it has none).
 */
export async function analysisFor(
  repos: Repositories,
  orgId: string,
  buildingId: string,
  requested: string | null | undefined,
): Promise<IntervalAnalysisRecord | undefined> {
  if (requested === null) return undefined;
  if (requested === undefined) return repos.intervalAnalyses.newestOf(orgId, buildingId);
  const a = await repos.intervalAnalyses.get(orgId, requested);
  if (a && a.buildingId === buildingId) return a;
  throw new FieldRejected(
    "intervalAnalysisId",
    `building ${buildingId} has no interval analysis ${requested}; see GET /v1/buildings/${buildingId}/interval-analyses`,
  );
}

/** The revision as sized, and what it was sized against: the transaction checks both are still current. */
interface Sized {
  revision: SerializedRevision;
  buildingVersion: number;
  analysisId: string | null;
}

async function sizeAgainst(
  repos: Repositories,
  who: Who,
  buildingId: string,
  inputs: SurveyInputs,
  meta: { surveyId: string; n: number; reason: string | null; at: string },
): Promise<Sized> {
  const building = await findBuilding(repos, who.orgId, buildingId);
  const analysis = await analysisFor(repos, who.orgId, buildingId, inputs.intervalAnalysisId);
  const revision = computeSerializedRevision(building, inputs, { ...meta, actor: who.actorId }, analysis);
  return { revision, buildingVersion: building.version, analysisId: analysis?.id ?? null };
}

/** Inside the transaction: is what the revision was sized against still the building's current state? */
async function stillCurrent(tx: Repositories, who: Who, buildingId: string, inputs: SurveyInputs, s: Sized): Promise<boolean> {
  const b = await findBuilding(tx, who.orgId, buildingId);
  if (b.version !== s.buildingVersion) return false;
  if (inputs.intervalAnalysisId !== undefined) return true; // named or none: a new analysis changes nothing
  return ((await tx.intervalAnalyses.newestOf(who.orgId, buildingId))?.id ?? null) === s.analysisId;
}

const movedTwice = (what: string) =>
  new Conflict("changed_meanwhile", `${what} changed twice while this request was being sized; read it again and retry`);

export interface RecordedSurvey {
  surveyId: string;
  revision: SerializedRevision;
  buildingId: string;
}

export async function recordSurvey(
  store: Store,
  who: Who,
  buildingId: string,
  inputs: SurveyInputs,
  finish: Finish<RecordedSurvey>,
): Promise<WriteOutcome> {
  const surveyId = newId("srv");
  for (let attempt = 1; ; attempt++) {
    const at = store.now().toISOString();
    const sized = await sizeAgainst(store, who, buildingId, inputs, { surveyId, n: 1, reason: null, at });
    const outcome = await store.transaction(async (tx) => {
      if (!(await stillCurrent(tx, who, buildingId, inputs, sized))) return undefined;
      await tx.surveys.create(who.orgId, buildingId, sized.revision);
      await tx.audit.record({
        orgId: who.orgId,
        actor: who.actorId,
        action: "survey.create",
        resourceType: "survey",
        resourceId: surveyId,
        requestId: who.requestId,
        at,
      });
      return finish(tx, { surveyId, revision: sized.revision, buildingId });
    });
    if (outcome) return outcome;
    if (attempt >= SIZING_ATTEMPTS) throw movedTwice(`building ${buildingId}`);
  }
}

export async function reviseSurvey(
  store: Store,
  who: Who,
  surveyId: string,
  reason: string | null,
  inputs: SurveyInputs,
  finish: Finish<RecordedSurvey>,
): Promise<WriteOutcome> {
  for (let attempt = 1; ; attempt++) {
    const head = await store.surveys.head(who.orgId, surveyId);
    if (!head) throw new NotFound(`survey ${surveyId}`);
    const at = store.now().toISOString();
    const sized = await sizeAgainst(store, who, head.buildingId, inputs, { surveyId, n: head.revision + 1, reason, at });
    const outcome = await store.transaction(async (tx) => {
      if (!(await stillCurrent(tx, who, head.buildingId, inputs, sized))) return undefined;
      // revise() refuses when revision n - 1 is no longer the latest (another revision committed meanwhile).
      if (!(await tx.surveys.revise(who.orgId, sized.revision))) return undefined;
      await tx.audit.record({
        orgId: who.orgId,
        actor: who.actorId,
        action: "survey.revise",
        resourceType: "survey",
        resourceId: surveyId,
        requestId: who.requestId,
        at,
      });
      return finish(tx, { surveyId, revision: sized.revision, buildingId: head.buildingId });
    });
    if (outcome) return outcome;
    if (attempt >= SIZING_ATTEMPTS) throw movedTwice(`survey ${surveyId}`);
  }
}
