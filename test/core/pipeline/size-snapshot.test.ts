import { describe, expect, it } from "vitest";
import { differences, snapshotOutputs, storedOutputs } from "./size-snapshot.js";

/**
 * The engine's full output on varied bodies against the stored output of the same bodies (write-size-snapshot.ts):
 * a change made for speed must leave every key, its order and every figure in place. Tolerance 1e-9 relative: a
 * rewritten loop may round differently in the last bits, and no figure the engine reports means anything at 1e-9.
 * A regression guard, not an oracle: the stored figures are the engine's own; their correctness is checked against
 * published references and independent calculations in the other test/core suites.
 */
const REL = 1e-9;

describe("size() output against the stored snapshot", () => {
  const stored = storedOutputs();
  const now = snapshotOutputs();

  it("has the same cases", () => {
    expect(now.map((c) => c.name)).toEqual(stored.map((c) => c.name));
    expect(stored.length).toBeGreaterThanOrEqual(8);
  });

  it.each(stored.map((c, i) => [c.name, i] as const))("%s: same keys, order and figures", (_name, i) => {
    expect(differences(now[i]!.output, stored[i]!.output, REL)).toEqual([]);
  });

  it("the comparison sees a figure moved, a key reordered and a text reworded", () => {
    expect(differences({ a: 1, b: "x y" }, { a: 1 + 1e-6, b: "x y" }, REL)).toHaveLength(1);
    expect(differences({ b: "x y", a: 1 }, { a: 1, b: "x y" }, REL)).toHaveLength(1);
    expect(differences({ a: 1, b: "x z" }, { a: 1, b: "x y" }, REL)).toHaveLength(1);
    expect(differences({ a: 1, b: "x: y" }, { a: 1, b: "x — y" }, REL)).toEqual([]);
  });
});
