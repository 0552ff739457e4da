import { describe, expect, it } from "vitest";
import { columnPool } from "../../src/http/interval/column-pool.js";

const shared = (length: number) => new Float64Array(new SharedArrayBuffer(length * 8));

describe("the interval column pool", () => {
  it("hands a kept array back once, the smallest long enough, and makes a new one otherwise", () => {
    const small = shared(1000),
      big = shared(5000);
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

  it("makes shared arrays (both analysis tasks read them without a copy)", () => {
    expect(columnPool.take(100).buffer).toBeInstanceOf(SharedArrayBuffer);
  });

  it("keeps the whole buffer of a view, and nothing of a plain (unshared) array", () => {
    const whole = shared(2000);
    columnPool.give(whole.subarray(0, 10));
    expect(columnPool.take(1500).buffer).toBe(whole.buffer);
    const plain = new Float64Array(3000);
    columnPool.give(plain);
    expect(columnPool.take(2500).buffer).not.toBe(plain.buffer);
  });
});
