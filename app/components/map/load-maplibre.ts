type MapLibre = typeof import("maplibre-gl");

let loading: Promise<MapLibre> | null = null;

/**
 * MapLibre for the page's maps (the coverage map, the settings' small maps, the zone editor):
 * imported once per page, in the browser only, with its worker file's URL set. A failed import is
 * forgotten, so the next map asks again.
 */
export function loadMapLibre(): Promise<MapLibre> {
  loading ??= Promise.all([import("maplibre-gl"), import("maplibre-gl/dist/maplibre-gl-worker.mjs?url")])
    .then(([maplibre, worker]) => {
      maplibre.setWorkerUrl(worker.default);
      return maplibre;
    })
    .catch((error: unknown) => {
      loading = null;
      throw error;
    });
  return loading;
}

/**
 * The shipped Roboto Mono the maps' labels are drawn from (the offline style has no glyphs URL):
 * the regular weight only, the one MapLibre draws a `text-font` of "Roboto Mono" in. The medium
 * weight is the page's own (headings, buttons); waiting for it here held a first visit's map back
 * until that file came, asked for only then, as nothing on screen had used it yet.
 */
export function loadMapFonts(): Promise<unknown> {
  return document.fonts.load('400 13px "Roboto Mono"').catch(() => undefined);
}
