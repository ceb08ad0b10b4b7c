import type { Map as MapLibreMap } from "maplibre-gl";
import { useEffect, useRef, useState } from "react";
import "maplibre-gl/dist/maplibre-gl.css";
import { loadMapFonts, loadMapLibre } from "./load-maplibre";
import { mapStyleUrl } from "./map-urls";

export type LonLatBounds = [[number, number], [number, number]];

/**
 * A MapLibre map over the project's offline style (`/projects/<id>/map/style.json`: the work
 * limit, zones, shoreline and the cell sources and layers the map page fills), for the small maps
 * beside the settings: the grid preview and the zones read from a file. MapLibre is loaded inside
 * the effect (never on the server); the map frames `extent` and keeps it framed when its box
 * changes until someone moves it. `ready` turns true once the style is loaded.
 */
export function useOfflineMap(projectId: number, extent: LonLatBounds | null, options: { lengthUnit: string; ariaLabel: string; describedBy?: string }) {
  const container = useRef<HTMLDivElement>(null);
  const [map, setMap] = useState<MapLibreMap | null>(null);
  const [ready, setReady] = useState(false);
  useEffect(() => {
    let cancelled = false;
    let created: MapLibreMap | null = null;
    (async () => {
      const [maplibre] = await Promise.all([loadMapLibre(), loadMapFonts()]);
      if (cancelled || !container.current) return;
      created = new maplibre.Map({
        container: container.current,
        style: mapStyleUrl(window.location.origin, projectId),
        ...(extent ? { bounds: extent, fitBoundsOptions: { padding: 24 } } : { center: [0, 0] as [number, number], zoom: 1 }),
        attributionControl: false,
        canvasContextAttributes: { preserveDrawingBuffer: true },
      });
      const canvas = created.getCanvas();
      canvas.setAttribute("aria-label", options.ariaLabel);
      if (options.describedBy) canvas.setAttribute("aria-describedby", options.describedBy);
      created.addControl(new maplibre.NavigationControl({ showCompass: false }), "top-right");
      created.addControl(new maplibre.ScaleControl({ unit: options.lengthUnit === "m" ? "metric" : "imperial", maxWidth: 100 }), "bottom-left");
      let moved = false;
      created.on("movestart", (event) => { if ((event as { originalEvent?: Event }).originalEvent) moved = true; });
      created.on("resize", () => {
        if (!moved && extent && created) created.fitBounds(extent, { padding: 24, animate: false });
      });
      created.on("load", () => {
        if (!cancelled) setReady(true);
      });
      setMap(created);
    })();
    return () => {
      cancelled = true;
      created?.remove();
      setMap(null);
      setReady(false);
    };
    // One map per project: the extent frames it when it is made.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [projectId]);
  return { container, map, ready };
}

/** The west-south and east-north corners of lon/lat polygons; null when there are none. */
export function extentOfPolygons(polygons: Iterable<ReadonlyArray<ReadonlyArray<ReadonlyArray<number>>>>): LonLatBounds | null {
  let west = Infinity, south = Infinity, east = -Infinity, north = -Infinity;
  for (const polygon of polygons) {
    for (const [lon, lat] of polygon[0] ?? []) {
      west = Math.min(west, lon); east = Math.max(east, lon);
      south = Math.min(south, lat); north = Math.max(north, lat);
    }
  }
  return Number.isFinite(west) ? [[west, south], [east, north]] : null;
}
