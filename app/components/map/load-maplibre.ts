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

/** The shipped Roboto Mono the maps' labels are drawn from (the offline style has no glyphs URL). */
export function loadMapFonts(): Promise<unknown> {
  return Promise.all([document.fonts.load('13px "Roboto Mono"'), document.fonts.load('500 13px "Roboto Mono"')]).catch(() => undefined);
}
