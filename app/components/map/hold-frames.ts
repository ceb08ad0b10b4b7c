import type { Map as MapLibreMap } from "maplibre-gl";

/** The painter's draw, the one part of a MapLibre frame held back (MapLibre's own field, not its documented API). */
type Painter = { render: (...args: unknown[]) => unknown };

/**
 * Holds a new map's drawing back until its first complete frame (the style and every source's
 * tiles in, as for MapLibre's `load`), or until `longestMs` has passed, whichever comes first.
 *
 * MapLibre draws a frame each time a source's tiles arrive: on a new page, five to ten partial
 * frames before the complete one. In a browser without a GPU each costs 40–180 ms to draw and
 * read back, on the same cores that lay the tiles out; and each new kind of layer drawn compiles
 * its GPU program then. Held, the map updates its sources and labels every frame as before but
 * draws once, with everything. The canvas stays the page's background until then.
 *
 * It wraps the painter's `render`, which MapLibre keeps as a field of the map. Should a MapLibre
 * release rename it, nothing is held and the map draws as before (the map's browser test says so).
 * Returns the number of frames held so far, for the user timing marks and the tests.
 */
export function holdFramesUntilComplete(map: MapLibreMap, longestMs: number): () => number {
  let held = 0;
  const painter = (map as unknown as { painter?: Painter }).painter;
  if (!painter || typeof painter.render !== "function") return () => held;
  const draw = painter.render;
  const until = performance.now() + longestMs;
  const release = () => {
    if (painter.render === hold) painter.render = draw;
  };
  function hold(this: Painter, ...args: unknown[]) {
    if (map.loaded() || performance.now() >= until) {
      release();
      return draw.apply(this, args);
    }
    held++;
    return undefined;
  }
  painter.render = hold;
  // A held frame asks for no next one: when the longest wait runs out, one is asked for.
  const timer = setTimeout(() => {
    release();
    if (held > 0) map.triggerRepaint();
  }, longestMs);
  map.once("remove", () => clearTimeout(timer));
  return () => held;
}
