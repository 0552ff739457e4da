/** A Float64Array that doubles as it fills: amortised O(1) push, no per-element allocation. */
export class GrowableF64 {
  data: Float64Array;
  length = 0;

  constructor(initialCapacity = 4096) {
    this.data = new Float64Array(Math.max(16, initialCapacity));
  }

  push(value: number): void {
    if (this.length === this.data.length) {
      const bigger = new Float64Array(this.data.length * 2);
      bigger.set(this.data);
      this.data = bigger;
    }
    this.data[this.length++] = value;
  }

  /** Make room for at least `capacity` values in one step (avoids repeated doubling copies). */
  reserve(capacity: number): void {
    if (capacity <= this.data.length) return;
    const bigger = new Float64Array(capacity);
    bigger.set(this.data.subarray(0, this.length));
    this.data = bigger;
  }

  /** The filled part (a view, no copy). */
  view(): Float64Array {
    return this.data.subarray(0, this.length);
  }
}
