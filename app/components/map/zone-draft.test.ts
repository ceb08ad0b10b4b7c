import { describe, expect, it } from "vitest";
import { addsVertex, draftFeatures, draftPolygon } from "./zone-draft";

// The click-to-draw outline: a double-click adds one vertex, the polygon is closed once, and the
// draft shows a line only from two vertices and a fill only from three (practice: a polygon
// needs three corners; RFC 7946 §3.1.6: a ring's first and last positions are the same).
describe("zone draft", () => {
  it("ignores the second click of a double-click, not a click a few pixels away (practice)", () => {
    expect(addsVertex(null, { x: 10, y: 10 })).toBe(true);
    expect(addsVertex({ x: 10, y: 10 }, { x: 11, y: 10 })).toBe(false);
    expect(addsVertex({ x: 10, y: 10 }, { x: 14, y: 10 })).toBe(true);
  });

  it("closes the ring once (published: RFC 7946)", () => {
    const polygon = draftPolygon([[-82.1, 28.1], [-82.0, 28.1], [-82.0, 28.2]]);
    expect(polygon.coordinates[0]).toEqual([[-82.1, 28.1], [-82.0, 28.1], [-82.0, 28.2], [-82.1, 28.1]]);
  });

  it("draws points, then a line, then a fill as vertices are added (practice)", () => {
    const kinds = (count: number) => draftFeatures(Array.from({ length: count }, (_, i) => [i, i * i] as [number, number])).features.map((f) => (f.geometry as { type: string }).type);
    expect(kinds(1)).toEqual(["Point"]);
    expect(kinds(2)).toEqual(["Point", "Point", "LineString"]);
    expect(kinds(3)).toEqual(["Point", "Point", "Point", "LineString", "Polygon"]);
  });
});
