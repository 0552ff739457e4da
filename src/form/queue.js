// The send queue: surveys waiting for the service, each with its Idempotency-Key, in localStorage. Entries are
// sent in order; a network failure, a time-out, 5xx, 429 or a key problem keeps an entry (and stops the round:
// the next ones would fail the same way); any other answer settles it. One round at a time.

import { call, problemText } from "./api.js";
import { readJson, writeJson } from "./drafts.js";

const QUEUE_STORE = "pfc-form.queue";
const KEEP = (status) => status === 0 || status >= 500 || status === 429 || status === 401 || status === 403;

export const readQueue = () => readJson(QUEUE_STORE, []);
const writeQueue = (q) => writeJson(QUEUE_STORE, q);

/** Add a survey, or replace the body of the one already waiting under the same key (a corrected draft). */
export function enqueue(entry) {
  const q = readQueue();
  const at = q.findIndex((e) => e.idem === entry.idem);
  if (at >= 0) q[at] = { ...q[at], ...entry };
  else q.push(entry);
  writeQueue(q);
}
const update = (idem, patch) => writeQueue(readQueue().map((e) => (e.idem === idem ? { ...e, ...patch } : e)));
const drop = (idem) => writeQueue(readQueue().filter((e) => e.idem !== idem));

let round = null;
export const sending = () => round !== null;

/**
 * Send what waits. `on.stored(entry, body)`, `on.rejected(entry, answer)`, `on.waiting(entry, text)` report each
 * outcome; `on.settled()` runs when the round ends. A call while a round runs joins it.
 */
export function flush(on) {
  if (round) return round;
  round = (async () => {
    // Re-read after each send: a survey queued during the round is sent in it too.
    const tried = new Set();
    for (let entry; (entry = readQueue().find((e) => !tried.has(e.idem)));) {
      tried.add(entry.idem);
      const r = await call("POST", `/v1/buildings/${encodeURIComponent(entry.buildingId)}/surveys`, {
        body: entry.body,
        headers: { "idempotency-key": entry.idem },
      });
      if (r.status === 201 || r.status === 200) {
        drop(entry.idem);
        on.stored(entry, r.data);
      } else if (KEEP(r.status)) {
        const text = problemText(r);
        update(entry.idem, { lastError: text, lastTriedAt: new Date().toISOString() });
        on.waiting(entry, text);
        break;
      } else {
        drop(entry.idem);
        on.rejected(entry, r);
      }
    }
  })().finally(() => {
    round = null;
    on.settled();
  });
  return round;
}
