import { describe, expect, it } from "vitest";
import { VISION_SIMULATIONS, contrastRatio, deltaE76, simulatedLab } from "./colour-vision";
import { LAND_COLOUR, STATUS_COLOURS, WATER_COLOUR, WORK_LIMIT_COLOUR } from "./palette";
import { ZONE_COLOURS, ZONE_COLOUR_VALUES, defaultZoneColour, isZoneColour, zoneColourName } from "./zone-colours";

// Zone outlines and names are drawn in the zone's colour: names on a white halo, outlines over a
// white casing, both over the basemap's land and water and over the cells (through the casing).
// The name is always written beside the colour, so colour is never the only cue (WCAG 1.4.1):
// the pairs are asked to stay ΔE76 15 apart (practice), less than the cell fills' 20, which have
// no name on them.
const MIN_PAIR_DELTA_E = 15;

describe("zone colours", () => {
  it("each reads as text on the white halo: WCAG 2.x contrast at least 4.5:1 (published, SC 1.4.3)", () => {
    for (const { value, name } of ZONE_COLOURS) expect(contrastRatio(value, "#ffffff"), name).toBeGreaterThanOrEqual(4.5);
  });

  it("each outline stands out from the land and the water: at least 3:1 (published, SC 1.4.11)", () => {
    for (const { value, name } of ZONE_COLOURS) {
      expect(contrastRatio(value, LAND_COLOUR), `${name} on land`).toBeGreaterThanOrEqual(3);
      expect(contrastRatio(value, WATER_COLOUR), `${name} on water`).toBeGreaterThanOrEqual(3);
    }
  });

  it("the contrast formula gives WCAG's end points: black on white 21:1, a colour on itself 1:1 (published)", () => {
    expect(contrastRatio("#000000", "#ffffff")).toBeCloseTo(21, 6);
    expect(contrastRatio("#777755", "#777755")).toBe(1);
    // #777777 on white is 4.48:1, just under the text threshold (computed; a commonly quoted example)
    expect(contrastRatio("#777777", "#ffffff")).toBeCloseTo(4.48, 2);
  });

  for (const [vision, matrix] of Object.entries(VISION_SIMULATIONS)) {
    it(`every pair, and each against the work limit's red, at least ΔE76 ${MIN_PAIR_DELTA_E} apart: ${vision} (Machado 2009)`, () => {
      const all = [...ZONE_COLOURS, { value: WORK_LIMIT_COLOUR, name: "work limit" }];
      for (let first = 0; first < all.length; first++) {
        for (let second = first + 1; second < all.length; second++) {
          const distance = deltaE76(simulatedLab(all[first].value, matrix), simulatedLab(all[second].value, matrix));
          expect(distance, `${all[first].name} vs ${all[second].name} (${vision})`).toBeGreaterThanOrEqual(MIN_PAIR_DELTA_E);
        }
      }
    });
  }

  it("the pair check can fail: two blues a designer might pick collapse under deuteranopia (computed)", () => {
    const distance = deltaE76(simulatedLab("#3366cc", VISION_SIMULATIONS.deuteranopia), simulatedLab("#5b3aa6", VISION_SIMULATIONS.deuteranopia));
    expect(distance).toBeLessThan(MIN_PAIR_DELTA_E);
  });

  it("are not the cell fills' colours: a zone is an outline, never taken for a status", () => {
    for (const value of ZONE_COLOUR_VALUES) expect(Object.values(STATUS_COLOURS)).not.toContain(value);
  });

  it("defaults: the first colour no other zone has, in order; then round again by place", () => {
    expect(defaultZoneColour([], 0)).toBe("#0d5c66");
    expect(defaultZoneColour(["#0d5c66"], 1)).toBe("#aa6600");
    expect(defaultZoneColour(["#aa6600"], 1)).toBe("#0d5c66"); // a freed colour is given again
    expect(defaultZoneColour(ZONE_COLOUR_VALUES, 9)).toBe(ZONE_COLOUR_VALUES[1]);
  });

  it("knows its own values only, and names them", () => {
    expect(isZoneColour("#552288")).toBe(true);
    expect(isZoneColour("#552289")).toBe(false);
    expect(isZoneColour("#552288 ")).toBe(false);
    expect(zoneColourName("#552288")).toBe("Violet");
    expect(new Set(ZONE_COLOURS.map((colour) => colour.name)).size).toBe(ZONE_COLOURS.length);
  });
});
