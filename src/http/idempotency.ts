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

/** Keys answer replays for at least KEEP_MS; records older than PURGE_MS are deleted lazily. */
export const KEEP_MS = 24 * 3600_000;
export const PURGE_MS = 48 * 3600_000;
const PURGE_EVERY_MS = 10 * 60_000;
const lastPurge = new WeakMap<Store, number>();

const KEY = /^[\x21-\x7e]{1,255}$/;

export function idempotencyKeyOf(request: FastifyRequest): string | undefined {
  const raw = request.headers["idempotency-key"];
  if (raw === undefined) return undefined;
  if (typeof raw !== "string" || !KEY.test(raw)) {
    throw new ProblemError(
      validationProblem([{ path: "headers.idempotency-key", message: "Idempotency-Key must be 1 to 255 visible ASCII characters, sent once" }]),
    );
  }
  return raw;
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
  store.idempotency.purgeBefore(new Date(nowMs - PURGE_MS).toISOString());
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
      if (prior && Date.parse(prior.createdAt) > nowMs - PURGE_MS) {
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
