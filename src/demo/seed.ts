import { computeRevision } from "../application/survey-sizing.js";
import { newId } from "../store/ids.js";
import { DEFAULT_ORG_ID, type Store } from "../store/ports.js";
import type { BuildingRecord } from "../store/types.js";
import { DEMO_BUILDING, DEMO_SURVEYS } from "./scenario.js";

export const DEMO_ACTOR = "demo";

/**
 * On a database that has never held anything (no building, no audit entry), store the demo building and its
 * surveys, sized by the real engine before the write. One transaction under the store's start-up lock, so
 * instances starting together seed once: all of it or none. Returns the building id, or null when the database
 * was not empty.
 */
export async function seedDemo(store: Store): Promise<string | null> {
  const orgId = DEFAULT_ORG_ID;
  const at = store.now().toISOString();
  const buildingId = newId("bld");
  // The building as create() will store it (version 1): the surveys are sized against it before the write.
  const planned: BuildingRecord = {
    ...DEMO_BUILDING,
    economics: DEMO_BUILDING.economics ?? null,
    id: buildingId,
    version: 1,
    createdAt: at,
    updatedAt: at,
  };
  const surveys = DEMO_SURVEYS.map((inputs) => {
    const surveyId = newId("srv");
    return computeRevision(planned, inputs, { surveyId, n: 1, reason: null, actor: DEMO_ACTOR, at });
  });
  return store.exclusively(async (tx) => {
    if (!(await tx.isPristine())) return null;
    const building = await tx.buildings.create(orgId, buildingId, DEMO_BUILDING, DEMO_ACTOR, at);
    const audit = (action: string, resourceType: string, resourceId: string) =>
      tx.audit.record({ orgId, actor: DEMO_ACTOR, action, resourceType, resourceId, requestId: null, at });
    await audit("building.create", "building", building.id);
    for (const first of surveys) {
      await tx.surveys.create(orgId, building.id, first);
      await audit("survey.create", "survey", first.surveyId);
    }
    return building.id;
  });
}
