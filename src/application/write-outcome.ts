import type { Repositories } from "../store/ports.js";

/**
 * An answer's body already serialised as JSON text: answered and stored under an Idempotency-Key as it is, never
 * serialised again (a stored survey's answer is mostly its result, whose text the store writes too).
 */
export class JsonText {
  /** JSON text, or the UTF-8 bytes of it. */
  constructor(readonly json: string | Uint8Array) {}
}

/** What a write answers; stored whole under its Idempotency-Key and answered again on a replay. */
export interface WriteOutcome {
  status: number;
  /** A value to serialise, or a JsonText. */
  body: unknown;
  location?: string;
}

/**
 * Called by a use case inside its write transaction with the answer it will give: the Idempotency-Key's record is
 * completed there, so the key and the work commit together (or neither).
 */
export type Seal = (tx: Repositories, outcome: WriteOutcome) => Promise<void>;

export const noSeal: Seal = async () => {};

/** Who acts, for whom, under which request: every write is audited with it. */
export interface Who {
  orgId: string;
  actorId: string;
  requestId: string | null;
}

/** Inside the write transaction: the answer for the stored result, sealed with the Idempotency-Key's record. */
export type Finish<T> = (tx: Repositories, result: T) => Promise<WriteOutcome>;

/** A Finish from the HTTP layer's answer (status, body, location) and the idempotency seal. */
export function finishWith<T>(seal: Seal, answer: (result: T) => WriteOutcome): Finish<T> {
  return async (tx, result) => {
    const outcome = answer(result);
    await seal(tx, outcome);
    return outcome;
  };
}

/** The JSON text of a body: a JsonText's own, else serialised. */
export function jsonTextOf(body: unknown): string {
  if (!(body instanceof JsonText)) return JSON.stringify(body);
  return typeof body.json === "string" ? body.json : Buffer.from(body.json.buffer, body.json.byteOffset, body.json.byteLength).toString("utf8");
}
