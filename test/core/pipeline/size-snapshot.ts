/** The snapshot cases sized (the body parsed as the route parses it, then size(), as plain JSON) and their comparison. */
import { readFileSync } from "node:fs";
import { brotliDecompressSync } from "node:zlib";
import { size } from "../../../src/core/pipeline/size.js";
import { sizingRequestSchema } from "../../../src/http/schemas/sizing.js";
import { snapshotCases } from "./size-snapshot-bodies.js";

export const SNAPSHOT_FIXTURE = new URL("./fixtures/size-outputs.json.br", import.meta.url);

export interface SnapshotOutput {
  name: string;
  output: unknown;
}

export function snapshotOutputs(): SnapshotOutput[] {
  return snapshotCases().map((c) => ({
    name: c.name,
    output: JSON.parse(JSON.stringify(size(sizingRequestSchema.parse(c.body), c.options ?? {}))) as unknown,
  }));
}

export function storedOutputs(): SnapshotOutput[] {
  return JSON.parse(brotliDecompressSync(readFileSync(SNAPSHOT_FIXTURE)).toString("utf8")) as SnapshotOutput[];
}

/** Letters and digits only: a text's punctuation may be reworded without the engine changing (the figures in it may not). */
const wording = (s: string) => s.replace(/[^\p{L}\p{N}]+/gu, "");

/**
 * Where `actual` differs from `expected`: the same keys in the same order, arrays of the same length, numbers within
 * `rel` of each other (relative to the larger, or both below 1e-300), texts equal in their letters and digits, the rest
 * equal. At most `max` differences, each with its path.
 */
export function differences(actual: unknown, expected: unknown, rel: number, max = 20): string[] {
  const out: string[] = [];
  const walk = (a: unknown, e: unknown, path: string): void => {
    if (out.length >= max) return;
    if (typeof e === "number" && typeof a === "number") {
      const scale = Math.max(Math.abs(a), Math.abs(e));
      if (!(a === e || Math.abs(a - e) <= rel * scale || scale < 1e-300)) out.push(`${path}: ${a} ≠ ${e}`);
      return;
    }
    if (typeof e === "string" && typeof a === "string") {
      if (wording(a) !== wording(e)) out.push(`${path}: "${a}" ≠ "${e}"`);
      return;
    }
    if (Array.isArray(e) && Array.isArray(a)) {
      if (a.length !== e.length) out.push(`${path}: ${a.length} items ≠ ${e.length}`);
      else e.forEach((x, i) => walk(a[i], x, `${path}[${i}]`));
      return;
    }
    if (e !== null && a !== null && typeof e === "object" && typeof a === "object" && !Array.isArray(a) && !Array.isArray(e)) {
      const ka = Object.keys(a);
      const ke = Object.keys(e);
      if (ka.join("|") !== ke.join("|")) out.push(`${path}: keys [${ka.join(", ")}] ≠ [${ke.join(", ")}]`);
      else for (const k of ke) walk((a as Record<string, unknown>)[k], (e as Record<string, unknown>)[k], `${path}.${k}`);
      return;
    }
    if (a !== e) out.push(`${path}: ${JSON.stringify(a)} ≠ ${JSON.stringify(e)}`);
  };
  walk(actual, expected, "");
  return out;
}
