/**
 * The little a server-drawn SVG chart needs: a linear scale from data to pixels and "nice" tick
 * values (1, 2 or 5 times a power of ten), so axes read in round numbers.
 */
export interface LinearScale {
  (value: number): number;
  domain: readonly [number, number];
  range: readonly [number, number];
}

export function linearScale(domain: readonly [number, number], range: readonly [number, number]): LinearScale {
  const [d0, d1] = domain;
  const [r0, r1] = range;
  const span = d1 - d0;
  const scale = ((value: number) => (span === 0 ? (r0 + r1) / 2 : r0 + ((value - d0) / span) * (r1 - r0))) as LinearScale;
  scale.domain = domain;
  scale.range = range;
  return scale;
}

/** A step of 1, 2 or 5 × 10ⁿ giving about `count` intervals over [0, max]. */
export function niceStep(max: number, count = 5): number {
  if (!(max > 0)) return 1;
  const raw = max / count;
  const power = 10 ** Math.floor(Math.log10(raw));
  const fraction = raw / power;
  const nice = fraction <= 1 ? 1 : fraction <= 2 ? 2 : fraction <= 5 ? 5 : 10;
  return nice * power;
}

/** Ticks from 0 up to the first multiple of the step at or above `max`. */
export function niceTicks(max: number, count = 5): number[] {
  const step = niceStep(max, count);
  const top = Math.max(step, Math.ceil(max / step - 1e-9) * step);
  const ticks: number[] = [];
  for (let value = 0; value <= top + step * 1e-9; value += step) ticks.push(Number(value.toPrecision(12)));
  return ticks;
}

/**
 * Positions for end-of-line labels so that none sits closer than `minGap` to the next: labels
 * keep their order by wanted position and are pushed apart, then the block is moved back inside
 * [low, high] where it can be. Returns the positions in the input's order.
 */
export function spreadLabels(wanted: readonly number[], minGap: number, low = -Infinity, high = Infinity): number[] {
  const order = wanted.map((_, index) => index).sort((a, b) => wanted[a] - wanted[b]);
  const placed = new Array<number>(wanted.length);
  let previous = -Infinity;
  for (const index of order) {
    placed[index] = Math.max(wanted[index], previous + minGap);
    previous = placed[index];
  }
  if (order.length > 0) {
    const overflow = placed[order[order.length - 1]] - high;
    if (overflow > 0) {
      const room = placed[order[0]] - low;
      const shift = Math.min(overflow, Math.max(0, room));
      for (const index of order) placed[index] -= shift;
    }
  }
  return placed;
}
