/**
 * Colour differences as people with a colour-vision deficiency see them: the full-severity (1.0)
 * matrices of Machado, Oliveira & Fernandes (2009), "A physiologically-based model for simulation
 * of color vision deficiency", IEEE TVCG 15(6), applied to linear sRGB (published). Distances are
 * CIE76 ΔE*ab in CIELAB (D65), with the sRGB transfer function and matrix of IEC 61966-2-1
 * (published). Contrast ratios are those of WCAG 2.x (relative luminance, (L1 + 0.05) / (L2 + 0.05)).
 */
type Matrix = readonly [readonly [number, number, number], readonly [number, number, number], readonly [number, number, number]];

export const VISION_SIMULATIONS: Record<string, Matrix> = {
  "normal vision": [[1, 0, 0], [0, 1, 0], [0, 0, 1]],
  protanopia: [[0.152286, 1.052583, -0.204868], [0.114503, 0.786281, 0.099216], [-0.003882, -0.048116, 1.051998]],
  deuteranopia: [[0.367322, 0.860646, -0.227968], [0.280085, 0.672501, 0.047413], [-0.01182, 0.04294, 0.968881]],
  tritanopia: [[1.255528, -0.076749, -0.178779], [-0.078411, 0.930809, 0.147602], [0.004733, 0.691367, 0.3039]],
};

function channels(hex: string): [number, number, number] {
  const value = Number.parseInt(hex.slice(1), 16);
  return [(value >> 16) & 255, (value >> 8) & 255, value & 255];
}

function linear(channel255: number): number {
  const value = channel255 / 255;
  return value <= 0.04045 ? value / 12.92 : ((value + 0.055) / 1.055) ** 2.4;
}

function labOfLinear([red, green, blue]: readonly number[]): [number, number, number] {
  const x = 0.4124 * red + 0.3576 * green + 0.1805 * blue;
  const y = 0.2126 * red + 0.7152 * green + 0.0722 * blue;
  const z = 0.0193 * red + 0.1192 * green + 0.9505 * blue;
  const f = (t: number) => (t > 216 / 24389 ? Math.cbrt(t) : ((24389 / 27) * t + 16) / 116);
  const fx = f(x / 0.95047), fy = f(y), fz = f(z / 1.08883);
  return [116 * fy - 16, 500 * (fx - fy), 200 * (fy - fz)];
}

/** The CIELAB colour of `hex` as seen through `matrix` (one of VISION_SIMULATIONS). */
export function simulatedLab(hex: string, matrix: Matrix): [number, number, number] {
  const rgb = channels(hex).map(linear);
  const simulated = matrix.map((row) => Math.min(1, Math.max(0, row[0] * rgb[0] + row[1] * rgb[1] + row[2] * rgb[2])));
  return labOfLinear(simulated);
}

export function deltaE76(a: readonly number[], b: readonly number[]): number {
  return Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2]);
}

/** WCAG 2.x relative luminance of an sRGB colour. */
export function relativeLuminance(hex: string): number {
  const [red, green, blue] = channels(hex).map(linear);
  return 0.2126 * red + 0.7152 * green + 0.0722 * blue;
}

/** WCAG 2.x contrast ratio between two colours (1 to 21). */
export function contrastRatio(first: string, second: string): number {
  const [lighter, darker] = [relativeLuminance(first), relativeLuminance(second)].sort((a, b) => b - a);
  return (lighter + 0.05) / (darker + 0.05);
}
