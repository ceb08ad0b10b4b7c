/**
 * Percent complete as a colour: a single-hue ramp from pale sand (0 %) to the lagoon blue of the
 * design tokens (100 %), so the order reads without a legend key per colour; no data is grey.
 */
const START = [0xf1, 0xe4, 0xbf];
const END = [0x14, 0x60, 0x6e];

export function percentColour(percent: number | null): string {
  if (percent === null || !Number.isFinite(percent)) return "#d5dcdf";
  const share = Math.min(1, Math.max(0, percent / 100));
  const channel = (index: number) => Math.round(START[index] + (END[index] - START[index]) * share).toString(16).padStart(2, "0");
  return `#${channel(0)}${channel(1)}${channel(2)}`;
}
