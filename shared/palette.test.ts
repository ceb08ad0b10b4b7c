import { describe, expect, it } from "vitest";
import { CELL_STATUSES } from "./cell-status";
import { STATUS_COLOURS, coolRamp, hexToRgb, sedimentRamp } from "./palette";

// Colour-vision deficiency simulation: the full-severity (1.0) matrices of Machado, Oliveira &
// Fernandes (2009), "A physiologically-based model for simulation of color vision deficiency",
// IEEE TVCG 15(6), applied to linear sRGB (published). Distances are CIE76 ΔE*ab in CIELAB (D65),
// with the sRGB transfer function and matrix of IEC 61966-2-1 (published).
type Matrix = [[number, number, number], [number, number, number], [number, number, number]];
const SIMULATIONS: Record<string, Matrix> = {
  "normal vision": [[1, 0, 0], [0, 1, 0], [0, 0, 1]],
  protanopia: [[0.152286, 1.052583, -0.204868], [0.114503, 0.786281, 0.099216], [-0.003882, -0.048116, 1.051998]],
  deuteranopia: [[0.367322, 0.860646, -0.227968], [0.280085, 0.672501, 0.047413], [-0.01182, 0.04294, 0.968881]],
  tritanopia: [[1.255528, -0.076749, -0.178779], [-0.078411, 0.930809, 0.147602], [0.004733, 0.691367, 0.3039]],
};

function linear(channel255: number): number {
  const value = channel255 / 255;
  return value <= 0.04045 ? value / 12.92 : ((value + 0.055) / 1.055) ** 2.4;
}

function labOfLinear([red, green, blue]: number[]): [number, number, number] {
  const x = 0.4124 * red + 0.3576 * green + 0.1805 * blue;
  const y = 0.2126 * red + 0.7152 * green + 0.0722 * blue;
  const z = 0.0193 * red + 0.1192 * green + 0.9505 * blue;
  const f = (t: number) => (t > 216 / 24389 ? Math.cbrt(t) : ((24389 / 27) * t + 16) / 116);
  const fx = f(x / 0.95047), fy = f(y), fz = f(z / 1.08883);
  return [116 * fy - 16, 500 * (fx - fy), 200 * (fy - fz)];
}

function simulatedLab(hex: string, matrix: Matrix): [number, number, number] {
  const rgb = hexToRgb(hex).map(linear);
  const simulated = matrix.map((row) => Math.min(1, Math.max(0, row[0] * rgb[0] + row[1] * rgb[1] + row[2] * rgb[2])));
  return labOfLinear(simulated);
}

function deltaE76(a: number[], b: number[]): number {
  return Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2]);
}

// A ΔE*ab of about 2.3 is a just-noticeable difference (Sharma 2003, memory); map symbols need far
// more than that to be told apart at a glance on a small cell, so we ask for 20 (practice).
const MIN_DELTA_E = 20;

describe("status palette under colour-vision deficiency simulation (Machado 2009)", () => {
  for (const [name, matrix] of Object.entries(SIMULATIONS)) {
    it(`keeps every pair of status colours at least ΔE76 ${MIN_DELTA_E} apart: ${name}`, () => {
      for (let first = 0; first < CELL_STATUSES.length; first++) {
        for (let second = first + 1; second < CELL_STATUSES.length; second++) {
          const a = CELL_STATUSES[first], b = CELL_STATUSES[second];
          const distance = deltaE76(simulatedLab(STATUS_COLOURS[a], matrix), simulatedLab(STATUS_COLOURS[b], matrix));
          expect(distance, `${a} vs ${b} (${name})`).toBeGreaterThanOrEqual(MIN_DELTA_E);
        }
      }
    });
  }

  it("the simulation itself separates what it should not: pure red and green collapse under deuteranopia", () => {
    // A control so the check can fail: #ff0000 vs #00a000 are far apart normally but close for a deuteranope (computed).
    const normal = deltaE76(simulatedLab("#ff0000", SIMULATIONS["normal vision"]), simulatedLab("#00a000", SIMULATIONS["normal vision"]));
    const deutan = deltaE76(simulatedLab("#ff0000", SIMULATIONS.deuteranopia), simulatedLab("#00a000", SIMULATIONS.deuteranopia));
    expect(normal).toBeGreaterThan(80);
    expect(deutan).toBeLessThan(normal / 3);
  });
});

describe("band ramps", () => {
  it("darken step by step, so the order reads by lightness alone (invariant)", () => {
    for (const colours of [sedimentRamp(7), coolRamp(9)]) {
      const lightness = colours.map((hex) => simulatedLab(hex, SIMULATIONS["normal vision"])[0]);
      for (let index = 1; index < lightness.length; index++) expect(lightness[index]).toBeLessThan(lightness[index - 1]);
    }
  });
});
