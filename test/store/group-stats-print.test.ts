import { describe, expect, it } from "vitest";
import { groupsSince } from "../../bench/surveys.js";
import type { GroupCommitStats } from "../../src/store/sqlite/group-commit.js";

/** The bench prints how the surveys shared COMMITs and syncs (bench/surveys.ts); the counts come from the store. */
describe("the bench's group-commit line", () => {
  it("gives the COMMITs, transactions per COMMIT, syncs of the log and the sizes between two readings", () => {
    const before: GroupCommitStats = { groups: 2, transactions: 3, largest: 2, bySize: [0, 1, 1], syncs: 2, checkpoints: 0 };
    // since then: one COMMIT of 1, two of 4 (9 transactions in 3 COMMITs) and 2 syncs
    const after: GroupCommitStats = { groups: 5, transactions: 12, largest: 4, bySize: [0, 2, 1, 0, 2], syncs: 4, checkpoints: 1 };
    expect(groupsSince(before, after)).toBe("3 COMMITs, 3.0 transactions each on average, 2 syncs of the log; sizes 1×1 4×2");
    expect(groupsSince(after, after)).toBe("no COMMIT");
  });
});
