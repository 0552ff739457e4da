import { Conflict, NotFound } from "./errors.js";
import type { Who } from "./write-outcome.js";
import type { Store } from "../store/ports.js";

/** Revoke a key of the caller's organisation; an organisation's last active admin key stays. Revoking twice is fine. */
export async function revokeKey(store: Store, who: Who, id: string): Promise<void> {
  await store.transaction(async (tx) => {
    const k = await tx.keys.get(who.orgId, id);
    if (!k) throw new NotFound(`key ${id}`);
    if (k.revokedAt) return;
    if (k.role === "admin" && (await tx.keys.activeAdminCount(who.orgId)) === 1) {
      throw new Conflict("last_admin_key", "this is the organisation's last active admin key; create another admin key first", "id");
    }
    const at = store.now().toISOString();
    await tx.keys.revoke(who.orgId, id, at);
    await tx.audit.record({
      orgId: who.orgId,
      actor: who.actorId,
      action: "key.revoke",
      resourceType: "api_key",
      resourceId: id,
      requestId: who.requestId,
      at,
    });
  });
}
