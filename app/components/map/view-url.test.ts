import { describe, expect, it } from "vitest";
import { DEFAULT_LAYERS, mapViewSearch, parseMapView, type MapViewState } from "./view-url";

const plain: MapViewState = { centre: null, zoom: null, view: "status", layers: { ...DEFAULT_LAYERS }, bandSurface: "remaining", zoneId: null, cells: [], planDate: null };

describe("the map's view in its address", () => {
  it("a plain view keeps a plain address, and reads back as itself (invariant)", () => {
    expect(mapViewSearch(plain)).toBe("");
    expect(parseMapView(new URLSearchParams(""))).toEqual(plain);
  });

  it("every part survives the round trip (invariant)", () => {
    const view: MapViewState = {
      centre: [-82.174075, 28.95492], zoom: 19.25, view: "thickness", layers: { ...DEFAULT_LAYERS, bands: true, labels: false },
      bandSurface: "depth", zoneId: 3, cells: ["AC4", "AC5", "-B-2"], planDate: "2026-12-04",
    };
    const search = mapViewSearch(view);
    expect(search).toBe("?c=-82.174075,28.954920&z=19.25&view=thickness&layers=cells,bands,zones,workLimit,shoreline,monitoring,tubes&bands=depth&zone=3&cells=AC4,AC5,-B-2&date=2026-12-04");
    expect(parseMapView(new URLSearchParams(search))).toEqual(view);
  });

  it("a link with bad parts opens with the good ones kept and the bad ones at their defaults (practice: hand-edited links)", () => {
    const read = parseMapView(new URLSearchParams("c=500,20&z=19&view=heat&layers=cells,tiles&zone=-1&cells=ac4,<script>&date=2026-13-45"));
    expect(read).toEqual(plain);
    const partly = parseMapView(new URLSearchParams("c=-82.1,28.9&z=18&view=removed&cells=ac4, ad5"));
    expect(partly).toMatchObject({ centre: [-82.1, 28.9], zoom: 18, view: "removed", cells: ["AC4", "AD5"] });
  });

  it("a centre without a zoom (or the reverse) is no camera at all: the map frames the project instead (practice)", () => {
    expect(parseMapView(new URLSearchParams("c=-82.1,28.9"))).toMatchObject({ centre: null, zoom: null });
    expect(parseMapView(new URLSearchParams("z=18"))).toMatchObject({ centre: null, zoom: null });
  });

  it("an empty layer list means every layer off (invariant)", () => {
    const none = { ...plain, layers: { cells: false, bands: false, zones: false, workLimit: false, shoreline: false, labels: false, monitoring: false, tubes: false } };
    expect(mapViewSearch(none)).toBe("?layers=");
    expect(parseMapView(new URLSearchParams("layers="))).toEqual(none);
  });
});
