import { createHash } from "node:crypto";
import type { FastifyReply, FastifyRequest } from "fastify";
import { canonicalJson } from "../application/canonical-json.js";
import { jsonTextOf, JsonText, noSeal, type Seal, type WriteOutcome } from "../application/write-outcome.js";
import type { Store } from "../store/ports.js";
import { problem, ProblemError, validationProblem } from "./problem.js";

/** How long a key answers replays: for KEEP_HOURS after its first use; older records are deleted lazily. */
export const KEEP_HOURS = 48;
const KEEP_MS = KEEP_HOURS * 3600_000;
/**
 * A claim never completed is taken over after this lease: its instance died mid-request (a live request ends
 * within REQUEST_TIMEOUT_MS, 30 s by default). Until then a second request with the key gets 409 + Retry-After.
 */
export const CLAIM_LEASE_MS = 30_000;
/** Retry-After of a 409 while the key's first request is in flight: a survey is sized and stored in well under this. */
const IN_FLIGHT_RETRY_AFTER_S = 1;
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

export function requestHash(method: string, url: string, body: unknown): string {
  return createHash("sha256")
    .update(`${method.toUpperCase()} ${url}\n${canonicalJson(body ?? null)}`)
    .digest("hex");
}

async function purgeNowAndThen(store: Store, nowMs: number): Promise<void> {
  if (nowMs - (lastPurge.get(store) ?? 0) < PURGE_EVERY_MS) return;
  lastPurge.set(store, nowMs);
  await store.idempotency.purgeBefore(new Date(nowMs - KEEP_MS).toISOString());
}

function reused(key: string, firstAt: string): ProblemError {
  const message = `Idempotency-Key "${key}" was first used at ${firstAt} with a different request; use a new key for a new request`;
  return new ProblemError(problem(422, "idempotency-key-reused", "Idempotency-Key reused", message, [{ path: "headers.idempotency-key", message }]));
}

/**
 * Run a write with its Idempotency-Key, if the request sent one, by the store's claim protocol (IETF
 * Idempotency-Key draft): the key is claimed first (committed, so every instance sees it); the work's transaction
 * completes the claim with the answer (`seal`), or the claim is released when the work fails. The same key and
 * request again: the stored answer (Idempotent-Replayed: true), or 409 with Retry-After while the first is still in
 * flight; the same key with another request (method, URL, canonical body): 422. `hashedBody` stands for the body
 * when that is a stream (a digest of what was read).
 */
export async function idempotentWrite(
  store: Store,
  request: FastifyRequest,
  reply: FastifyReply,
  work: (seal: Seal) => Promise<WriteOutcome>,
  hashedBody: unknown = request.body,
): Promise<unknown> {
  const key = idempotencyKeyOf(request);
  let outcome: WriteOutcome & { replayed?: boolean };
  if (key === undefined) {
    outcome = await work(noSeal);
  } else {
    const { orgId } = request.actor;
    const nowMs = store.now().getTime();
    await purgeNowAndThen(store, nowMs);
    const hash = requestHash(request.method, request.url, hashedBody);
    const createdAt = new Date(nowMs).toISOString();
    const claim = await store.idempotency.claim(
      orgId,
      key,
      { requestHash: hash, createdAt },
      new Date(nowMs - KEEP_MS).toISOString(),
      new Date(nowMs - CLAIM_LEASE_MS).toISOString(),
    );
    if (claim.kind === "done") {
      if (claim.record.requestHash !== hash) throw reused(key, claim.record.createdAt);
      const r = claim.record;
      outcome = { status: r.status, body: new JsonText(r.responseJson), ...(r.location ? { location: r.location } : {}), replayed: true };
    } else if (claim.kind === "in_flight") {
      if (claim.claim.requestHash !== hash) throw reused(key, claim.claim.createdAt);
      const message = `a request with Idempotency-Key "${key}" is still being worked; retry after ${IN_FLIGHT_RETRY_AFTER_S} s for its answer`;
      throw new ProblemError(
        problem(409, "idempotency-key-in-flight", "Request with this Idempotency-Key in progress", message, [
          { path: "headers.idempotency-key", message },
        ]),
        {
          "retry-after": String(IN_FLIGHT_RETRY_AFTER_S),
        },
      );
    } else {
      const seal: Seal = (tx, o) =>
        tx.idempotency.complete(orgId, key, {
          requestHash: hash,
          status: o.status,
          location: o.location ?? null,
          responseJson: jsonTextOf(o.body),
          createdAt,
        });
      try {
        outcome = { ...(await work(seal)), replayed: false };
      } catch (err) {
        await store.idempotency.release(orgId, key, hash);
        throw err;
      }
    }
  }
  reply.code(outcome.status);
  if (outcome.location) reply.header("location", outcome.location);
  if (key !== undefined) reply.header("idempotent-replayed", String(outcome.replayed));
  if (outcome.body instanceof JsonText) {
    // a string with a JSON content type goes out as it is (fastify serialises only objects)
    reply.type("application/json; charset=utf-8");
    return outcome.body.json;
  }
  return outcome.body;
}
export { canonicalJson };
