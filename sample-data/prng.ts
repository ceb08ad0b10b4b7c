/**
 * A small seeded pseudo-random generator for the demo scenario, so the same seed always gives the
 * same files byte for byte (Math.random cannot be seeded).
 * mulberry32: a 32-bit state, one multiply-xorshift step per draw; plenty for synthetic soundings.
 */
export interface Random {
  /** Uniform in [0, 1). */
  next(): number;
  /** Uniform in [low, high). */
  between(low: number, high: number): number;
  /** Normal with mean 0 and the given standard deviation, clipped to ±limit (Box–Muller). */
  clippedNormal(standardDeviation: number, limit: number): number;
}

export function mulberry32(seed: number): Random {
  let state = seed >>> 0;
  function next(): number {
    state = (state + 0x6d2b79f5) >>> 0;
    let mixed = state;
    mixed = Math.imul(mixed ^ (mixed >>> 15), mixed | 1);
    mixed ^= mixed + Math.imul(mixed ^ (mixed >>> 7), mixed | 61);
    return ((mixed ^ (mixed >>> 14)) >>> 0) / 4294967296;
  }
  return {
    next,
    between: (low, high) => low + (high - low) * next(),
    clippedNormal(standardDeviation, limit) {
      // 1 − next() lies in (0, 1], so the logarithm is finite.
      const radius = Math.sqrt(-2 * Math.log(1 - next()));
      const value = standardDeviation * radius * Math.cos(2 * Math.PI * next());
      return Math.max(-limit, Math.min(limit, value));
    },
  };
}
