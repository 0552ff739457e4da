/** Worker-thread entry of the heavy-work pool: piscina calls the default export with each task's envelope. */
import { runHeavyTask, type HeavyEnvelope } from "./tasks.js";

export default function heavyWorker(envelope: HeavyEnvelope): Promise<unknown> {
  return runHeavyTask(envelope);
}
