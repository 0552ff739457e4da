import type { FastifyInstance, InjectOptions, LightMyRequestResponse } from "fastify";
import request from "supertest";
import { issueKey } from "../../src/auth/bootstrap.js";
import { generateKey, parseKey, type Role } from "../../src/auth/keys.js";
import { DEFAULT_ORG_ID } from "../../src/store/ports.js";

/** The admin key each test app was built with (its PFC_BOOTSTRAP_KEY). */
const keys = new WeakMap<FastifyInstance, string>();
/** The id of every key the helpers stored or found, by the key: keyIdOf answers without a query. */
const idsOfKeys = new Map<string, string>();

/** A fresh random key for PFC_BOOTSTRAP_KEY. */
export const newBootstrapKey = (): string => generateKey().key;

/** Remember `key` as the app's admin key; on a database that already had keys (a reopened file), store it too. */
export async function registerAdminKey(app: FastifyInstance, key: string): Promise<void> {
  const parsed = parseKey(key);
  if (!parsed) throw new Error("not a key");
  const found = await app.store.keys.findByPrefix(parsed.prefix);
  const id = found
    ? found.id
    : (await issueKey(app.store, { orgId: DEFAULT_ORG_ID, role: "admin", label: "test", createdBy: "test", audit: false }, key)).record.id;
  idsOfKeys.set(key, id);
  keys.set(app, key);
}

export function adminKeyOf(app: FastifyInstance): string {
  const key = keys.get(app);
  if (!key) throw new Error("this app was not made by the test helpers; pass a key");
  return key;
}

export const bearer = (key: string) => ({ authorization: `Bearer ${key}` });

/** A supertest client of the app whose every request carries Authorization: Bearer <key> (the app's admin key by default). */
export function api(app: FastifyInstance, key: string = adminKeyOf(app)) {
  const agent = request.agent(app.server);
  agent.set("authorization", `Bearer ${key}`);
  return agent;
}

/** app.inject with the Authorization header added (the app's admin key by default); the request's own headers win. */
export function inject(app: FastifyInstance, opts: InjectOptions | string, key: string = adminKeyOf(app)): Promise<LightMyRequestResponse> {
  const o: InjectOptions = typeof opts === "string" ? { url: opts } : opts;
  return app.inject({ ...o, headers: { ...bearer(key), ...(o.headers ?? {}) } });
}

/** A new key of `role` in the organisation (the first one by default), stored directly. */
export async function keyFor(app: FastifyInstance, role: Role, orgId: string = DEFAULT_ORG_ID): Promise<string> {
  const issued = await issueKey(app.store, { orgId, role, label: `test ${role}`, createdBy: "test" });
  idsOfKeys.set(issued.key, issued.record.id);
  return issued.key;
}

/** The id of a key (what the audit log and histories record as the actor); the app's admin key by default. */
export function keyIdOf(app: FastifyInstance, key: string = adminKeyOf(app)): string {
  const id = idsOfKeys.get(key);
  if (!id) throw new Error("a key the test helpers did not make");
  return id;
}
