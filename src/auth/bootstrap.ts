import { generateKey, keyShapeProblem, parseKey, hashSecret, type Role } from "./keys.js";
import { newId } from "../store/ids.js";
import { DEFAULT_ORG_ID, type Repositories, type Store } from "../store/ports.js";
import type { ApiKeyRecord } from "../store/types.js";

export interface IssuedKey {
  /** The full key: shown once, never stored. */
  key: string;
  record: ApiKeyRecord;
}

interface KeyRequest {
  orgId: string;
  role: Role;
  label?: string | null;
  createdBy: string;
  requestId?: string | null;
  audit?: boolean;
}

/** The key's record (hash and prefix) in `k.orgId`; with `given`, that key instead of a random one. */
function newKey(store: Store, k: KeyRequest, given?: string): IssuedKey {
  const parsed = given === undefined ? undefined : parseKey(given);
  if (given !== undefined && !parsed) throw new Error(`the given key is not a key: ${keyShapeProblem(given) ?? "it does not have the key's shape"}`);
  const fresh = parsed ? { key: given as string, prefix: parsed.prefix, secretSha256: hashSecret(parsed.secret) } : generateKey();
  const record: ApiKeyRecord = {
    id: newId("key"),
    orgId: k.orgId,
    prefix: fresh.prefix,
    secretSha256: fresh.secretSha256,
    role: k.role,
    label: k.label ?? null,
    createdAt: store.now().toISOString(),
    createdBy: k.createdBy,
    revokedAt: null,
    lastUsedAt: null,
  };
  return { key: fresh.key, record };
}

async function storeKey(tx: Repositories, k: KeyRequest, issued: IssuedKey): Promise<void> {
  await tx.keys.create(issued.record);
  if (k.audit !== false) {
    const r = issued.record;
    await tx.audit.record({
      orgId: k.orgId,
      actor: k.createdBy,
      action: "key.create",
      resourceType: "api_key",
      resourceId: r.id,
      requestId: k.requestId ?? null,
      at: r.createdAt,
    });
  }
}

/** Store a new key (its hash and prefix) in `orgId`; with `given`, that key instead of a random one. */
export async function issueKey(store: Store, k: KeyRequest, given?: string): Promise<IssuedKey> {
  const issued = newKey(store, k, given);
  await store.transaction((tx) => storeKey(tx, k, issued));
  return issued;
}

/** The organisation named `name`, created when there is none. */
export async function organisationNamed(store: Store, name: string): Promise<{ id: string; name: string; created: boolean }> {
  return store.transaction(async (tx) => {
    const found = await tx.keys.organisationByName(name);
    if (found) return { id: found.id, name: found.name, created: false };
    const org = await tx.keys.createOrganisation(newId("org"), name, store.now().toISOString());
    return { id: org.id, name: org.name, created: true };
  });
}

/**
 * On a database without any key: an admin key for the first organisation, from `given` (PFC_BOOTSTRAP_KEY)
 * or random. Under the store's start-up lock, so instances starting together make one key. Returns the key only
 * when it was generated here (the caller prints it once).
 */
export async function bootstrapAdminKey(store: Store, given: string | undefined): Promise<{ generated?: string; created: boolean }> {
  const k: KeyRequest = { orgId: DEFAULT_ORG_ID, role: "admin", label: "bootstrap", createdBy: "bootstrap", audit: false };
  const issued = newKey(store, k, given);
  const created = await store.exclusively(async (tx) => {
    if ((await tx.keys.count()) > 0) return false;
    await storeKey(tx, k, issued);
    return true;
  });
  if (!created) return { created: false };
  return given === undefined ? { generated: issued.key, created: true } : { created: true };
}
