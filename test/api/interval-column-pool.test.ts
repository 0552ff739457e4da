import { describe, expect, it } from "vitest";
import { columnPool } from "../../src/http/interval/column-pool.js";

describe("the interval column pool", () => {
  it("hands a kept array back once, the smallest long enough, and makes a new one otherwise", () => {
    const small = new Float64Array(1000),
      big = new Float64Array(5000);
    columnPool.give(big);
    columnPool.give(small);
    columnPool.give(small); // twice: kept once
    expect(columnPool.take(800)).toBe(small);
    const other = columnPool.take(800); // small is out: big is the only one left
    expect(other).toBe(big);
    const fresh = columnPool.take(800);
    expect(fresh).not.toBe(small);
    expect(fresh.length).toBe(800);
  });

  it("keeps the whole buffer of a view, and nothing of a detached one", () => {
    const whole = new Float64Array(2000);
    columnPool.give(whole.subarray(0, 10));
    expect(columnPool.take(1500).buffer).toBe(whole.buffer);
    const moved = new Float64Array(3000);
    structuredClone(moved.buffer, { transfer: [moved.buffer] }); // detaches it
    columnPool.give(moved);
    expect(columnPool.take(2500).buffer).not.toBe(moved.buffer);
  });
});
