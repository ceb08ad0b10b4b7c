import type { LayerSpecification } from "maplibre-gl";

/** A label layer kept out of the map's first frame, and the layer it goes under (none: on top). */
export interface HeldLabel {
  layer: LayerSpecification;
  beforeId?: string;
}

/**
 * Splits a style's label layers (MapLibre's symbol layers) from the rest, so that the map's first
 * complete frame is drawn without them and they are added just after it (`addLabels`), each back
 * in its place in the drawing order.
 *
 * Labels are the dearest part of a first frame in a browser without a GPU: the page draws each
 * glyph of the shipped font on its main thread, the map's worker waits for those glyphs before it
 * lays out each tile that has labels, the labels are placed again at every held frame, and their
 * GPU program is compiled for that frame. Without them the demo's cells reach the screen about
 * 0.1 s sooner; the labels are placed about 0.2 s after the cells (some 0.05 s after the frame
 * that used to bring both) and fade in as MapLibre fades in any new label. The map bench prints
 * both (`npm run bench -- --only map-demo`: "map: labels placed").
 */
export function splitLabels(layers: readonly LayerSpecification[]): { first: LayerSpecification[]; labels: HeldLabel[] } {
  const first: LayerSpecification[] = [];
  const labels: HeldLabel[] = [];
  layers.forEach((layer, index) => {
    if (layer.type !== "symbol") {
      first.push(layer);
      return;
    }
    const before = layers.slice(index + 1).find((next) => next.type !== "symbol");
    labels.push(before ? { layer, beforeId: before.id } : { layer });
  });
  return { first, labels };
}

/** What addLabels asks of a map (MapLibre's Map has both). */
interface LayerList {
  addLayer(layer: LayerSpecification, beforeId?: string): unknown;
  getLayer(id: string): unknown;
}

/** Adds the held label layers back, in their order, each under the layer it was under in the style. */
export function addLabels(map: LayerList, labels: readonly HeldLabel[]): void {
  for (const { layer, beforeId } of labels) {
    if (map.getLayer(layer.id)) continue;
    map.addLayer(layer, beforeId !== undefined && map.getLayer(beforeId) ? beforeId : undefined);
  }
}
