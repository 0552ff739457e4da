import { generateKey, keyShapeProblem, parseKey, hashSecret, type Role } from "./keys.js";
import { newId } from "../store/ids.js";
import { DEFAULT_ORG_ID, type Store } from "../store/store.js";
import type { ApiKeyRecord } from "../store/keys-repo.js";

export interface IssuedKey {
  /** The full key: shown once, never stored. */
  key: string;
  record: ApiKeyRecord;
}

/** Store a new key (its hash and prefix) in `orgId`; with `given`, that key instead of a random one. */
export function issueKey(
  store: Store,
  k: { orgId: string; role: Role; label?: string | null; createdBy: string; requestId?: string | null; audit?: boolean },
  given?: string,
): IssuedKey {
  const parsed = given === undefined ? undefined : parseKey(given);
  if (given !== undefined && !parsed) throw new Error(`the given key is not a key: ${keyShapeProblem(given) ?? "it does not have the key's shape"}`);
  const fresh = parsed ? { key: given as string, prefix: parsed.prefix, secretSha256: hashSecret(parsed.secret) } : generateKey();
  const at = store.now().toISOString();
  const record: ApiKeyRecord = {
    id: newId("key"), orgId: k.orgId, prefix: fresh.prefix, secretSha256: fresh.secretSha256, role: k.role,
    label: k.label ?? null, createdAt: at, createdBy: k.createdBy, revokedAt: null, lastUsedAt: null,
  };
  store.write(() => {
    store.keys.create(record);
    if (k.audit !== false) store.audit.record({ orgId: k.orgId, actor: k.createdBy, action: "key.create", resourceType: "api_key", resourceId: record.id, requestId: k.requestId ?? null, at });
  });
  return { key: fresh.key, record };
}

/** The organisation named `name`, created when there is none. */
export function organisationNamed(store: Store, name: string): { id: string; name: string; created: boolean } {
  return store.write(() => {
    const found = store.keys.organisationByName(name);
    if (found) return { id: found.id, name: found.name, created: false };
    const org = store.keys.createOrganisation(newId("org"), name, store.now().toISOString());
    return { id: org.id, name: org.name, created: true };
  });
}

/**
 * On a database without any key: an admin key for the first organisation, from `given` (PFC_BOOTSTRAP_KEY)
 * or random. Returns the key only when it was generated here (the caller prints it once); undefined otherwise.
 */
export function bootstrapAdminKey(store: Store, given: string | undefined): { generated?: string; created: boolean } {
  if (store.keys.count() > 0) return { created: false };
  const issued = issueKey(store, { orgId: DEFAULT_ORG_ID, role: "admin", label: "bootstrap", createdBy: "bootstrap", audit: false }, given);
  return given === undefined ? { generated: issued.key, created: true } : { created: true };
}
