import { canonicalJson } from "./canonical-json.js";
import { NotFound } from "./errors.js";
import type { Finish, Who, WriteOutcome } from "./write-outcome.js";
import { newId } from "../store/ids.js";
import type { Repositories, Store } from "../store/ports.js";
import type { BuildingData, BuildingRecord } from "../store/types.js";

/** The building's data as stored (without id, version and times). */
export function dataOf(b: BuildingRecord): BuildingData {
  return {
    name: b.name,
    address: b.address,
    notes: b.notes,
    system: b.system,
    transformer: b.transformer,
    utility: b.utility,
    economics: b.economics,
    ...(b.installedBanks ? { installedBanks: b.installedBanks } : {}),
  };
}

/** Field order fixed and absent parts explicit, so an unchanged PATCH compares equal. */
export function normalised(d: BuildingData): BuildingData {
  return {
    name: d.name,
    address: d.address,
    notes: d.notes,
    system: { voltageV: d.system.voltageV, frequencyHz: d.system.frequencyHz, phases: d.system.phases },
    transformer: d.transformer,
    utility: d.utility,
    economics: d.economics ?? null,
    installedBanks: d.installedBanks ?? [],
  };
}

/** A change to a building: each field given replaces the stored one (null clears an optional part). */
export type BuildingChange = { [K in keyof BuildingData]?: BuildingData[K] | undefined };

export async function findBuilding(repos: Repositories, orgId: string, id: string): Promise<BuildingRecord> {
  const b = await repos.buildings.get(orgId, id);
  if (!b) throw new NotFound(`building ${id}`);
  return b;
}

export async function createBuilding(store: Store, who: Who, data: BuildingData, finish: Finish<BuildingRecord>): Promise<WriteOutcome> {
  const at = store.now().toISOString();
  const normal = normalised(data);
  return store.transaction(async (tx) => {
    const b = await tx.buildings.create(who.orgId, newId("bld"), normal, who.actorId, at);
    await tx.audit.record({
      orgId: who.orgId,
      actor: who.actorId,
      action: "building.create",
      resourceType: "building",
      resourceId: b.id,
      requestId: who.requestId,
      at,
    });
    return finish(tx, b);
  });
}

/**
 * Apply `change` as the building's next version (its history keeps the previous one). An unchanged building
 * writes no version. The version read is the one written against: a concurrent change in between is retried.
 */
export async function updateBuilding(
  store: Store,
  who: Who,
  id: string,
  change: BuildingChange,
  finish: Finish<BuildingRecord>,
): Promise<WriteOutcome> {
  return store.transaction(async (tx) => {
    const current = await findBuilding(tx, who.orgId, id);
    const now = dataOf(current);
    const next = normalised({ ...now, ...Object.fromEntries(Object.entries(change).filter(([, v]) => v !== undefined)) } as BuildingData);
    if (canonicalJson(next) === canonicalJson(normalised(now))) return finish(tx, current); // nothing changed: no new version
    const at = store.now().toISOString();
    const b = await tx.buildings.update(who.orgId, id, current.version, next, who.actorId, at);
    if (!b) throw new Error(`building ${id} changed inside its own transaction`);
    await tx.audit.record({
      orgId: who.orgId,
      actor: who.actorId,
      action: "building.update",
      resourceType: "building",
      resourceId: id,
      requestId: who.requestId,
      at,
    });
    return finish(tx, b);
  });
}
