import { findBuilding } from "./buildings.js";
import type { Finish, Who, WriteOutcome } from "./write-outcome.js";
import type { IntervalSummary } from "../core/interval/summary.js";
import { newId } from "../store/ids.js";
import type { Store } from "../store/ports.js";
import type { IntervalAnalysisRecord } from "../store/types.js";

/** Store an analysed upload's summary with its building (the analysis itself ran before, outside any transaction). */
export async function attachIntervalAnalysis(
  store: Store,
  who: Who,
  buildingId: string,
  summary: IntervalSummary,
  finish: Finish<IntervalAnalysisRecord>,
): Promise<WriteOutcome> {
  return store.transaction(async (tx) => {
    await findBuilding(tx, who.orgId, buildingId);
    const at = store.now().toISOString();
    const id = newId("iva");
    const stored = await tx.intervalAnalyses.create(who.orgId, {
      id,
      buildingId,
      createdAt: at,
      actor: who.actorId,
      requestId: who.requestId,
      summary,
    });
    await tx.audit.record({
      orgId: who.orgId,
      actor: who.actorId,
      action: "interval_analysis.create",
      resourceType: "interval_analysis",
      resourceId: id,
      requestId: who.requestId,
      at,
    });
    return finish(tx, stored);
  });
}
