import type { LayerSpecification } from "maplibre-gl";
import { describe, expect, it } from "vitest";
import { addLabels, splitLabels } from "./labels-after-first-frame";

const fill = (id: string) => ({ id, type: "fill", source: "s" }) as LayerSpecification;
const line = (id: string) => ({ id, type: "line", source: "s" }) as LayerSpecification;
const label = (id: string) => ({ id, type: "symbol", source: "s", layout: { "text-field": "x" } }) as LayerSpecification;

/** A map's layer list as MapLibre keeps it: addLayer puts a layer under `beforeId`, or on top. */
function fakeMap(ids: string[]) {
  const order = [...ids];
  return {
    order,
    getLayer: (id: string) => (order.includes(id) ? { id } : undefined),
    addLayer(layer: LayerSpecification, beforeId?: string) {
      if (beforeId === undefined) order.push(layer.id);
      else order.splice(order.indexOf(beforeId), 0, layer.id);
      return this;
    },
  };
}

describe("labels after the first frame", () => {
  // The map style's own shape (app/models/map-style.server.ts): a label layer between line layers,
  // and label layers after the last of the others, two of them in a row.
  const style = [fill("water"), line("tubes"), label("tube-labels"), line("held"), fill("cells-marked"), label("zone-labels"), label("station-labels")];

  it("keeps every layer but the labels for the first frame, in their order", () => {
    const { first, labels } = splitLabels(style);
    expect(first.map((layer) => layer.id)).toEqual(["water", "tubes", "held", "cells-marked"]);
    expect(labels).toEqual([
      { layer: style[2], beforeId: "held" },
      { layer: style[5] },
      { layer: style[6] },
    ]);
  });

  it("puts each label back where the style had it", () => {
    const { first, labels } = splitLabels(style);
    const map = fakeMap(first.map((layer) => layer.id));
    addLabels(map, labels);
    expect(map.order).toEqual(style.map((layer) => layer.id));
  });

  it("puts two labels in a row back in their order, and a label over a missing layer on top", () => {
    const layers = [fill("cells"), label("a"), label("b"), line("outline"), label("c"), line("gone")];
    const { first, labels } = splitLabels(layers);
    const map = fakeMap(first.map((layer) => layer.id).filter((id) => id !== "gone"));
    addLabels(map, labels);
    expect(map.order).toEqual(["cells", "a", "b", "outline", "c"]);
  });

  it("adds a label only once, and nothing for a style without labels", () => {
    const { first, labels } = splitLabels(style);
    const map = fakeMap(first.map((layer) => layer.id));
    addLabels(map, labels);
    addLabels(map, labels);
    expect(map.order).toEqual(style.map((layer) => layer.id));
    expect(splitLabels([fill("cells"), line("outline")]).labels).toEqual([]);
  });
});
