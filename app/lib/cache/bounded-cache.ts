/**
 * A small least-recently-used cache of promises: at most `capacity` entries, the oldest-read
 * dropped first. A promise that rejects is dropped, so the next read computes again. Keys carry
 * the project's recompute stamp, so an entry for an old stamp is never read again and ages out.
 */
export class BoundedCache<Value> {
  private readonly entries = new Map<string, Promise<Value>>();

  constructor(readonly capacity: number) {
    if (!Number.isInteger(capacity) || capacity < 1) throw new RangeError("a cache holds at least one entry");
  }

  get size(): number {
    return this.entries.size;
  }

  has(key: string): boolean {
    return this.entries.has(key);
  }

  /** The cached value for `key`, or `compute()` stored under it. */
  getOrCompute(key: string, compute: () => Promise<Value>): Promise<Value> {
    const cached = this.entries.get(key);
    if (cached) {
      // Map keeps insertion order: re-inserting marks the entry as the most recently used.
      this.entries.delete(key);
      this.entries.set(key, cached);
      return cached;
    }
    const value = compute();
    this.entries.set(key, value);
    value.catch(() => {
      if (this.entries.get(key) === value) this.entries.delete(key);
    });
    while (this.entries.size > this.capacity) this.entries.delete(this.entries.keys().next().value!);
    return value;
  }

  /** The cached value for `key` (settled or still computing) without computing it or marking it used; undefined when there is none. */
  peek(key: string): Promise<Value> | undefined {
    return this.entries.get(key);
  }

  /** Drops every entry whose key `drop` picks (a project's entries of an older stamp). */
  dropWhere(drop: (key: string) => boolean): void {
    for (const key of [...this.entries.keys()]) if (drop(key)) this.entries.delete(key);
  }

  /** Drops every entry whose key starts with `prefix` (a project's entries on recompute). */
  dropPrefix(prefix: string): void {
    for (const key of [...this.entries.keys()]) if (key.startsWith(prefix)) this.entries.delete(key);
  }
}
