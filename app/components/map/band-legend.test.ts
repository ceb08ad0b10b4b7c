import { Color, createExpression } from "@maplibre/maplibre-gl-style-spec";
import { describe, expect, it } from "vitest";
import { bandColour, bandLegend, type BandBounds } from "./paint";

// The bands as the bands API gives them (shared/bands.ts: open ends as null), out of order.
const bands: BandBounds[] = [
  { lower: 2, upper: 3 },
  { lower: null, upper: 0.25 },
  { lower: 4, upper: null },
  { lower: 0.25, upper: 0.5 },
  { lower: 0.5, upper: 1 },
];

describe("the bands' legend", () => {
  for (const surface of ["remaining", "depth"] as const) {
    it(`${surface}: each entry's colour is what MapLibre's evaluator paints that band (invariant)`, () => {
      const expression = createExpression(bandColour(surface, bands), { type: "color", "property-type": "data-driven", expression: { interpolated: false, parameters: ["zoom", "feature"] } } as never);
      if (expression.result !== "success") throw new Error(JSON.stringify(expression.value));
      const legend = bandLegend(surface, bands, "ft");
      const sorted = [...bands].sort((a, b) => (a.lower ?? -Infinity) - (b.lower ?? -Infinity));
      expect(legend.length).toBe(bands.length);
      for (const [index, band] of sorted.entries()) {
        const painted = Color.parse(expression.value.evaluate({ zoom: 16 }, { type: "Polygon", properties: band } as never) as string | Color);
        expect(Color.parse(legend[index].colour), `band ${JSON.stringify(band)}`).toEqual(painted);
      }
    });
  }

  it("names each class with its bounds and unit, shallow to deep (computed)", () => {
    expect(bandLegend("remaining", bands, "ft").map((entry) => entry.label)).toEqual(["under 0.25 ft", "0.25 to 0.5 ft", "0.5 to 1 ft", "2 to 3 ft", "4 ft and more"]);
  });

  it("classes read light to dark (practice: order by lightness alone)", () => {
    const lightness = bandLegend("depth", bands, "m").map((entry) => {
      const colour = Color.parse(entry.colour)!;
      return 0.2126 * colour.r + 0.7152 * colour.g + 0.0722 * colour.b;
    });
    for (let index = 1; index < lightness.length; index++) expect(lightness[index]).toBeLessThan(lightness[index - 1]);
  });
});
