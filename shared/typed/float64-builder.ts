/**
 * A growable Float64Array: soundings arrive row by row (and chunk by chunk when streamed), but the
 * engine wants one flat typed array per column. Capacity doubles, so appending n values costs O(n).
 */
export class Float64Builder {
  private data: Float64Array;
  length = 0;

  constructor(initialCapacity = 1024) {
    this.data = new Float64Array(Math.max(16, initialCapacity));
  }

  push(value: number): void {
    if (this.length === this.data.length) {
      const grown = new Float64Array(this.data.length * 2);
      grown.set(this.data);
      this.data = grown;
    }
    this.data[this.length++] = value;
  }

  /** Room for `capacity` values in all, so a caller that knows the count spares the regrowth. */
  reserve(capacity: number): void {
    if (capacity <= this.data.length) return;
    const grown = new Float64Array(capacity);
    grown.set(this.data.subarray(0, this.length));
    this.data = grown;
  }

  /**
   * The values, right-sized: the builder's own array when it is exactly full (as after `reserve`
   * of the exact count; it must then not be pushed to again), else a copy.
   */
  toArray(): Float64Array {
    if (this.length === this.data.length) {
      const full = this.data;
      this.data = new Float64Array(16);
      this.length = 0;
      return full;
    }
    return this.data.slice(0, this.length);
  }
}
