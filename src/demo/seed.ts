import { computeRevision } from "../application/survey-sizing.js";
import { newId } from "../store/ids.js";
import { DEFAULT_ORG_ID, type Store } from "../store/store.js";
import { DEMO_BUILDING, DEMO_SURVEYS } from "./scenario.js";

export const DEMO_ACTOR = "demo";

/**
 * On a database that has never held anything (no building, no audit entry), store the demo
 * building and its surveys, sized by the real engine. Returns the building id, or null when
 * the database was not empty. One transaction: all of it or none.
 */
export function seedDemo(store: Store): string | null {
  return store.write(() => {
    const used = store.db.prepare("SELECT (SELECT count(*) FROM buildings) + (SELECT count(*) FROM audit_log) AS n").get() as { n: number };
    if (used.n > 0) return null;
    const orgId = DEFAULT_ORG_ID;
    const at = store.now().toISOString();
    const building = store.buildings.create(orgId, newId("bld"), DEMO_BUILDING, DEMO_ACTOR, at);
    const audit = (action: string, resourceType: string, resourceId: string) =>
      store.audit.record({ orgId, actor: DEMO_ACTOR, action, resourceType, resourceId, requestId: null, at });
    audit("building.create", "building", building.id);
    for (const inputs of DEMO_SURVEYS) {
      const surveyId = newId("srv");
      const first = computeRevision(building, inputs, { surveyId, n: 1, reason: null, actor: DEMO_ACTOR, at });
      store.surveys.create(orgId, building.id, first);
      audit("survey.create", "survey", surveyId);
    }
    return building.id;
  });
}
