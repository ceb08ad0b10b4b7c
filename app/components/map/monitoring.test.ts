import { describe, expect, it } from "vitest";
import { clockOf, sightingFeatures, type MapSighting } from "./monitoring";

describe("the time a sighting or reading is read out at", () => {
  it("is the instant's local day and clock in the project's zone (computed: 2026-11-04 17:05 UTC is 12:05 in New York, UTC−5)", () => {
    expect(clockOf("2026-11-04T17:05:00.000Z", "America/New_York")).toBe("04 Nov, 12:05");
    expect(clockOf("2026-11-04T17:05:00.000Z", "UTC")).toBe("04 Nov, 17:05");
  });

  it("labels a sighting's point with the clock the server wrote, not one made in the page", () => {
    const sighting: MapSighting = {
      id: 7, species: "manatee", seenAt: "2026-11-04T17:05:00.000Z", seenClock: "04 Nov, 12:05", distance: 40, gone: false,
      observer: "R. Osei", note: "", lonLat: [-82.1, 29.2], standDownInForce: true,
    };
    const unplaced: MapSighting = { ...sighting, id: 8, lonLat: null };
    const features = sightingFeatures([sighting, unplaced]).features;
    expect(features).toHaveLength(1);
    expect(features[0].properties).toMatchObject({ key: "sighting:7", label: "manatee 04 Nov, 12:05" });
  });
});
