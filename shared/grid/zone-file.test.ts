import { describe, expect, it } from "vitest";
import { zoneCandidatesOf } from "./zone-file";

const square = (x: number) => ({ type: "Polygon", coordinates: [[[x, 0], [x + 1, 0], [x + 1, 1], [x, 1], [x, 0]]] });

describe("zoneCandidatesOf: one zone per feature or polygon", () => {
  it("takes each polygon feature of a collection, named from its name or zone property in any case", () => {
    const { candidates, problems } = zoneCandidatesOf({
      type: "FeatureCollection",
      features: [
        { type: "Feature", properties: { NAME: "North cove" }, geometry: square(0) },
        { type: "Feature", properties: { Zone: 7 }, geometry: square(2) },
        { type: "Feature", properties: { depth: 3 }, geometry: { type: "MultiPolygon", coordinates: [square(4).coordinates, square(6).coordinates] } },
      ],
    });
    expect(problems).toEqual([]);
    expect(candidates.map((candidate) => [candidate.source, candidate.name])).toEqual([["feature 1", "North cove"], ["feature 2", "7"], ["feature 3", null]]);
    // A feature is one zone, even of several polygons.
    expect((candidates[2].geometry as { type: string }).type).toBe("MultiPolygon");
  });

  it("names a feature that is not a polygon, by its number and name", () => {
    const { candidates, problems } = zoneCandidatesOf({
      type: "FeatureCollection",
      features: [{ type: "Feature", properties: { name: "Buoy" }, geometry: { type: "Point", coordinates: [0, 0] } }, { type: "Feature", properties: {}, geometry: square(0) }],
    });
    expect(candidates.map((candidate) => candidate.source)).toEqual(["feature 2"]);
    expect(problems).toEqual(['Feature 1 ("Buoy") is a Point, not a polygon: a zone is a closed outline.']);
  });

  it("splits bare geometry (a DXF's or CSV's outlines) into one zone per polygon, unnamed", () => {
    const { candidates } = zoneCandidatesOf({ type: "MultiPolygon", coordinates: [square(0).coordinates, square(2).coordinates] });
    expect(candidates).toEqual([
      { source: "polygon 1", name: null, geometry: square(0) },
      { source: "polygon 2", name: null, geometry: square(2) },
    ]);
    expect(zoneCandidatesOf(square(0)).candidates).toHaveLength(1);
  });

  it("refuses an empty collection and anything but polygons", () => {
    expect(zoneCandidatesOf({ type: "FeatureCollection", features: [] }).problems).toEqual(["The file holds no polygon."]);
    expect(zoneCandidatesOf({ type: "LineString", coordinates: [] }).problems[0]).toMatch(/LineString; zones are polygons/);
    expect(zoneCandidatesOf("x").problems).toEqual(["The file is not a GeoJSON object."]);
  });
});
