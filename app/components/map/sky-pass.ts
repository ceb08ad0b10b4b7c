import type { Map as MapLibreMap } from "maplibre-gl";

/** The painter's draw functions, one per kind of pass (MapLibre's own field, not its documented API). */
type Painter = { drawFunctions?: { sky?: (...args: unknown[]) => unknown } };

/**
 * The pitch from which the sky pass is drawn again. With MapLibre's default field of view
 * (about 37°) the horizon of a flat map comes into view only from about 72° of pitch; below 50°
 * it is far above the top of the canvas.
 */
export const SKY_FROM_PITCH = 50;

/**
 * Leaves MapLibre's sky pass out while the map is flat or nearly so.
 *
 * MapLibre 6 draws its sky at every frame, first, over the whole canvas, whether or not the style
 * has a sky; below the horizon it paints nothing. On Firmsand's maps, seen from above, the pass
 * only costs: a GPU program compiled for the first frame and a pass over every pixel at each
 * frame, which a browser drawing without a GPU pays on the same cores that lay out the tiles.
 * Tilted to SKY_FROM_PITCH or more, the sky is drawn as before.
 *
 * It wraps the painter's sky function, which MapLibre keeps in a field of its painter. Should a
 * MapLibre release rename it, nothing is left out and the map draws as before.
 */
export function skipSkyWhileFlat(map: Pick<MapLibreMap, "getPitch">): boolean {
  const functions = (map as unknown as { painter?: Painter }).painter?.drawFunctions;
  const sky = functions?.sky;
  if (!functions || typeof sky !== "function") return false;
  functions.sky = function (this: unknown, ...args: unknown[]) {
    if (map.getPitch() < SKY_FROM_PITCH) return undefined;
    return sky.apply(this, args);
  };
  return true;
}
