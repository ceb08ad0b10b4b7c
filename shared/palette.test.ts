import { describe, expect, it } from "vitest";
import { CELL_STATUSES } from "./cell-status";
import { VISION_SIMULATIONS, deltaE76, simulatedLab } from "./colour-vision";
import { STATUS_COLOURS, coolRamp, sedimentRamp } from "./palette";

// Colour-vision deficiency simulation (Machado 2009) and CIE76 distances: shared/colour-vision.ts.
const SIMULATIONS = VISION_SIMULATIONS;

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
