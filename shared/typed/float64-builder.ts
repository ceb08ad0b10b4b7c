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

  /** A right-sized copy; the builder may keep growing afterwards. */
  toArray(): Float64Array {
    return this.data.slice(0, this.length);
  }
}
