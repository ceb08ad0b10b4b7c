import { describe, expect, it } from "vitest";
import { DEFAULT_LAYERS, mapViewSearch, type MapViewState } from "./view-url";
import { parseMapView } from "./view-url.server";

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
    expect(search).toBe("?c=-82.174075,28.954920&z=19.25&view=thickness&layers=cells,bands,zones,workLimit,shoreline,-labels,monitoring,tubes&bands=depth&zone=3&cells=AC4,AC5,-B-2&date=2026-12-04");
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

  it("a link without a layer list opens with the default layers, tubes and stations included (invariant)", () => {
    expect(parseMapView(new URLSearchParams("c=-82.1,28.9&z=18&view=removed")).layers).toEqual(DEFAULT_LAYERS);
    expect(DEFAULT_LAYERS.tubes && DEFAULT_LAYERS.monitoring).toBe(true);
  });

  it("every layer off is stated layer by layer and reads back as itself (invariant)", () => {
    const none = { ...plain, layers: { cells: false, bands: false, zones: false, workLimit: false, shoreline: false, labels: false, monitoring: false, tubes: false } };
    expect(mapViewSearch(none)).toBe("?layers=-cells,-bands,-zones,-workLimit,-shoreline,-labels,-monitoring,-tubes");
    expect(parseMapView(new URLSearchParams(mapViewSearch(none)))).toEqual(none);
  });

  it("a link made before the tubes switch (only the layers shown, no tubes) opens with the tubes shown; the layers it could name keep its choice (regression: such links hid the tubes)", () => {
    // As the address was written between the stations layer and the tubes switch: bands on, labels off.
    const before = parseMapView(new URLSearchParams("layers=cells,bands,zones,workLimit,shoreline,monitoring"));
    expect(before.layers).toEqual({ cells: true, bands: true, zones: true, workLimit: true, shoreline: true, labels: false, monitoring: true, tubes: true });
    // From the first layer switch, before the stations layer too: both later layers at their defaults.
    const first = parseMapView(new URLSearchParams("layers=zones,workLimit"));
    expect(first.layers).toEqual({ cells: false, bands: false, zones: true, workLimit: true, shoreline: false, labels: false, monitoring: true, tubes: true });
    // An old link with every layer of its time off.
    expect(parseMapView(new URLSearchParams("layers=")).layers).toEqual({ cells: false, bands: false, zones: false, workLimit: false, shoreline: false, labels: false, monitoring: true, tubes: true });
  });

  it("a link made now that hides the tubes keeps them hidden (negative control for the rule above)", () => {
    const hidden = { ...plain, layers: { ...DEFAULT_LAYERS, tubes: false } };
    expect(mapViewSearch(hidden)).toBe("?layers=cells,-bands,zones,workLimit,shoreline,labels,monitoring,-tubes");
    expect(parseMapView(new URLSearchParams(mapViewSearch(hidden))).layers.tubes).toBe(false);
  });

  it("an unknown layer name or a bare '-' makes the whole list unreadable, and the defaults are used (practice: hand-edited links)", () => {
    expect(parseMapView(new URLSearchParams("layers=cells,-tiles")).layers).toEqual(DEFAULT_LAYERS);
    expect(parseMapView(new URLSearchParams("layers=cells,-")).layers).toEqual(DEFAULT_LAYERS);
  });
});
