import type { Repositories } from "../store/ports.js";

/** What a write answers; stored whole under its Idempotency-Key and answered again on a replay. */
export interface WriteOutcome {
  status: number;
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
