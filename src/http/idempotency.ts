import { createHash } from "node:crypto";
import type { FastifyReply, FastifyRequest } from "fastify";
import type { Store } from "../store/store.js";
import { problem, ProblemError, validationProblem } from "./problem.js";

/** What a write answers; stored whole under its Idempotency-Key. */
export interface WriteOutcome {
  status: number;
  body: unknown;
  location?: string;
}

/** How long a key answers replays: for KEEP_HOURS after its first use; older records are deleted lazily. */
export const KEEP_HOURS = 48;
const KEEP_MS = KEEP_HOURS * 3600_000;
const PURGE_EVERY_MS = 10 * 60_000;
const lastPurge = new WeakMap<Store, number>();

const KEY = /^[\x21-\x7e]{1,255}$/;
/** An RFC 8941 sf-string: DQUOTE, then printable ASCII with " and \ escaped by a backslash, then DQUOTE (§3.3.3). */
const SF_STRING = /^"((?:[\x20\x21\x23-\x5b\x5d-\x7e]|\\["\\])*)"$/;

/**
 * The request's Idempotency-Key. The IETF draft defining the header makes its value a Structured Field string
 * (`Idempotency-Key: "k1"`); clients also send the bare token (`k1`). Both name the same key: the quoted form is
 * unescaped. Either way the key is 1 to 255 visible ASCII characters.
 */
export function idempotencyKeyOf(request: FastifyRequest): string | undefined {
  const raw = request.headers["idempotency-key"];
  if (raw === undefined) return undefined;
  const key = typeof raw === "string" ? unquoted(raw) : undefined; // an array: the header was sent twice
  if (key === undefined || !KEY.test(key)) {
    const message = 'Idempotency-Key must be 1 to 255 visible ASCII characters, bare (k1) or as a quoted string ("k1"), sent once';
    throw new ProblemError(validationProblem([{ path: "headers.idempotency-key", message }]));
  }
  return key;
}

/** The key a header value names: a quoted string unescaped, a bare value as it is; undefined for a broken quoted string. */
function unquoted(value: string): string | undefined {
  if (!value.startsWith('"')) return value;
  const m = SF_STRING.exec(value);
  return m ? (m[1] as string).replace(/\\(["\\])/g, "$1") : undefined;
}

/** JSON with object keys sorted at every level, so equal bodies hash equally whatever their key order. */
export function canonicalJson(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map(canonicalJson).join(",")}]`;
  if (value !== null && typeof value === "object") {
    const entries = Object.entries(value as Record<string, unknown>)
      .filter(([, v]) => v !== undefined)
      .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
    return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonicalJson(v)}`).join(",")}}`;
  }
  return JSON.stringify(value) ?? "null";
}

export function requestHash(method: string, url: string, body: unknown): string {
  return createHash("sha256").update(`${method.toUpperCase()} ${url}\n${canonicalJson(body ?? null)}`).digest("hex");
}

function purgeNowAndThen(store: Store, nowMs: number): void {
  if (nowMs - (lastPurge.get(store) ?? 0) < PURGE_EVERY_MS) return;
  lastPurge.set(store, nowMs);
  store.idempotency.purgeBefore(new Date(nowMs - KEEP_MS).toISOString());
}

/**
 * Run a write in one transaction with its Idempotency-Key, if the request sent one: a replay
 * (same key, same method, URL and canonical body) answers the stored response and writes
 * nothing; the same key with another request is a 422. The key record commits with the write. `hashedBody` stands
 * for the body when that is a stream (a digest of what was read).
 */
export function idempotentWrite(
  store: Store,
  request: FastifyRequest,
  reply: FastifyReply,
  write: () => WriteOutcome,
  hashedBody: unknown = request.body,
): unknown {
  const key = idempotencyKeyOf(request);
  const { orgId } = request.actor;
  const outcome = store.write(() => {
    const nowMs = store.now().getTime();
    purgeNowAndThen(store, nowMs);
    const hash = key === undefined ? "" : requestHash(request.method, request.url, hashedBody);
    if (key !== undefined) {
      const prior = store.idempotency.find(orgId, key);
      if (prior && Date.parse(prior.createdAt) > nowMs - KEEP_MS) {
        if (prior.requestHash !== hash) {
          const message = `Idempotency-Key "${key}" was first used at ${prior.createdAt} with a different request; use a new key for a new request`;
          throw new ProblemError(
            problem(422, "idempotency-key-reused", "Idempotency-Key reused", message, [{ path: "headers.idempotency-key", message }]),
          );
        }
        return { status: prior.status, body: JSON.parse(prior.responseJson) as unknown, location: prior.location ?? undefined, replayed: true };
      }
    }
    const fresh = write();
    if (key !== undefined) {
      store.idempotency.save(orgId, key, {
        requestHash: hash,
        status: fresh.status,
        location: fresh.location ?? null,
        responseJson: JSON.stringify(fresh.body),
        createdAt: new Date(nowMs).toISOString(),
      });
    }
    return { ...fresh, replayed: false };
  });
  reply.code(outcome.status);
  if (outcome.location) reply.header("location", outcome.location);
  if (key !== undefined) reply.header("idempotent-replayed", String(outcome.replayed));
  return outcome.body;
}
