import type { FeatureCollection } from "geojson";
import type { GeoJSONSource, ImageSource, Map as MapLibreMap, StyleSpecification } from "maplibre-gl";
import { useEffect, useRef, useState } from "react";
import "maplibre-gl/dist/maplibre-gl.css";
import { buildCellFeatures, buildCellLabelPoints, type CellsData } from "./cell-features";
import { QUICK_LOOK_FROM_CELLS, cellImageCorners, cellIndexAtLonLat, inLimitCellCount, paintCellImage } from "./cell-image";
import type { LonLatWorkLimit } from "./clip-cells";
import { PLANNED_PATTERN, bandColour, cellColour, fillColour, plannedPatternPixels, type BandBounds, type MapView } from "./paint";
import type { LayerKey } from "./view-url";
import { MONITORING_CLICK_LAYERS, MONITORING_LAYERS, type MonitoringKey } from "./monitoring";
import { takeEarlyRead } from "./early-reads";
import { mapStyleUrl } from "./map-urls";
import { holdFramesUntilComplete } from "./hold-frames";
import { skipSkyWhileFlat } from "./sky-pass";
import { addLabels, splitLabels, type HeldLabel } from "./labels-after-first-frame";
import { loadMapFonts, loadMapLibre } from "./load-maplibre";

export type { LayerKey };
export const LAYER_GROUPS: Record<LayerKey, string[]> = {
  cells: ["cells-fill", "cells-grid", "cells-held-fill", "cells-held", "cells-assigned-fill", "cells-assigned", "cells-selected"],
  bands: ["bands-fill"],
  zones: ["zones-casing", "zones-outline"],
  workLimit: ["work-limit-outline", "work-limit-water"],
  shoreline: ["shoreline-water", "shoreline-edge"],
  labels: ["zone-labels", "cell-labels"],
  monitoring: MONITORING_LAYERS,
  // The geotextile tubes on the laydown area and their names (map-style.server.ts).
  tubes: ["tubes", "tubes-near-capacity", "tube-labels"],
};

interface Props {
  projectId: number;
  lengthUnit: CellsData["lengthUnit"];
  data: CellsData | null;
  view: MapView;
  layers: Record<LayerKey, boolean>;
  zoneFilter: number | null;
  selected: ReadonlySet<number>;
  assigned: ReadonlySet<number>;
  /** Cells under a stop-work hold, drawn as "held" with no details. */
  held: ReadonlySet<number>;
  bands: { surface: "remaining" | "depth"; collection: FeatureCollection } | null;
  flyTo: { lonLat: [number, number]; serial: number } | null;
  /** A click or tap on a cell: its grid index, Shift held, and the point tapped (lon/lat). */
  onCellClick: (index: number, extend: boolean, lonLat: [number, number]) => void;
  onBoxSelect: (indices: number[]) => void;
  onPointer: (lonLat: [number, number] | null) => void;
  onBearing: (bearing: number) => void;
  /** Changes when the manager uploads, replaces or removes the shoreline: the map re-reads it. */
  shorelineStamp?: string;
  /** Changes when the zones change (a zone made of selected cells): the map re-reads their outlines. */
  zonesStamp?: string;
  /** The work limit (lon/lat): cells along it are drawn clipped to it. */
  workLimit?: LonLatWorkLimit | null;
  /** The project's extent (west-south, east-north): framed at once, before the cells arrive. */
  extent?: [[number, number], [number, number]] | null;
  /** Where to open instead of the extent (a view sent as a link). */
  initialCamera?: { centre: [number, number]; zoom: number } | null;
  /** After every move: the centre and zoom, for the address. */
  onCamera?: (centre: [number, number], zoom: number) => void;
  /** Keyboard commands for the camera; a new serial runs it once. */
  cameraCommand?: { kind: "zoom-in" | "zoom-out" | "frame"; serial: number } | null;
  /** Set when the cells could not be read: said where the cells would be. */
  loadError?: string | null;
  /** Monitoring stations and recent sightings (lon/lat points, monitoring.tsx), and the one chosen. */
  monitoring?: { stations: FeatureCollection; sightings: FeatureCollection; chosen: MonitoringKey | null };
  /** A click on a station or sighting (instead of the cell under it). */
  onMonitoringClick?: (key: MonitoringKey) => void;
}

type CellFeature = ReturnType<typeof buildCellFeatures>["features"][number];

type MarkedSource = "cells-selected" | "cells-assigned" | "cells-held";

/**
 * The outlined cells' own source: only their features, so outlines cost nothing for the rest.
 * `filled` holds the sources that have features now: an empty source (as the style starts them)
 * is not emptied again, which would cost a round trip through the map's worker and a frame.
 */
function setMarkedCells(map: MapLibreMap, source: MarkedSource, ids: ReadonlySet<number>, byId: ReadonlyMap<number, CellFeature>, filled: Set<MarkedSource>) {
  const features: CellFeature[] = [];
  for (const id of ids) {
    const feature = byId.get(id);
    if (feature) features.push(feature);
  }
  if (features.length === 0 && !filled.has(source)) return;
  if (features.length > 0) filled.add(source);
  else filled.delete(source);
  (map.getSource(source) as GeoJSONSource | undefined)?.setData({ type: "FeatureCollection", features } as never);
}

const QUICK_LOOK = "cells-quick-look";

// Asked for as soon as this module runs in the browser (with the route's modules, before the page
// is hydrated), so the download and compilation of MapLibre overlap the page's own start; its
// worker is started once it is in (prewarm), so the worker's own script is loaded and compiled
// while the page hydrates, not after the map is made.
if (typeof window !== "undefined") void loadMapLibre().then((maplibre) => maplibre.prewarm()).catch(() => undefined);

/** The style's cells source: what the page passed it at creation, so it is not set again. */
interface InlinedCells {
  data: CellsData;
  collection: ReturnType<typeof buildCellFeatures>;
}

/** The cell labels' minzoom in the style, less a little: their points are made on the way there. */
const LABELS_FROM_ZOOM = 18;

/** How long the map, once MapLibre and its style are in, waits for the cells' first read before it is made without them. */
const CELLS_WAIT_MS = 1500;

/** How long a new map holds its partial frames back for its first complete one, at most. */
const FRAMES_HELD_AT_MOST_MS = 1000;

/** Room kept free around the framed project: the north arrow at top left and, on a wide map, the legend at bottom right. */
function framePadding(element: HTMLElement) {
  return element.clientWidth >= 700 ? { top: 40, bottom: 40, left: 70, right: 270 } : { top: 40, bottom: 40, left: 30, right: 30 };
}

/** Gives the browser its turn (input, frames) between two parts of long work; scheduler.yield where the browser has it. */
function yieldToPage(): Promise<void> {
  const scheduler = (globalThis as { scheduler?: { yield?: () => Promise<void> } }).scheduler;
  return scheduler?.yield ? scheduler.yield() : new Promise((resolve) => setTimeout(resolve, 0));
}

/** Shows (or repaints) a large grid's cells as one image, a pixel per cell, under the cell shapes. */
function showQuickLook(map: MapLibreMap, data: CellsData, view: MapView, zone: number | null) {
  const image = paintCellImage(data, cellColour(view, data), zone);
  const canvas = document.createElement("canvas");
  canvas.width = image.width;
  canvas.height = image.height;
  canvas.getContext("2d")!.putImageData(new ImageData(image.pixels as Uint8ClampedArray<ArrayBuffer>, image.width, image.height), 0, 0);
  const url = canvas.toDataURL("image/png");
  const coordinates = cellImageCorners(data) as [[number, number], [number, number], [number, number], [number, number]];
  const source = map.getSource(QUICK_LOOK) as ImageSource | undefined;
  if (source) {
    source.updateImage({ url, coordinates });
    return;
  }
  map.addSource(QUICK_LOOK, { type: "image", url, coordinates });
  map.addLayer({ id: QUICK_LOOK, type: "raster", source: QUICK_LOOK, paint: { "raster-resampling": "nearest", "raster-fade-duration": 0 } }, "cells-fill");
}

function removeQuickLook(map: MapLibreMap) {
  if (map.getLayer(QUICK_LOOK)) map.removeLayer(QUICK_LOOK);
  if (map.getSource(QUICK_LOOK)) map.removeSource(QUICK_LOOK);
}

/** Calls `drawn` once a frame with the loaded quick look has been rendered. */
function afterQuickLookDrawn(map: MapLibreMap, drawn: () => void) {
  const check = () => {
    if (!map.getSource(QUICK_LOOK)) return;
    if (!map.isSourceLoaded(QUICK_LOOK)) {
      map.once("sourcedata", check);
      return;
    }
    map.once("render", drawn);
    map.triggerRepaint();
  };
  check();
}

/**
 * The MapLibre map over the offline style. MapLibre is loaded with a dynamic import inside the
 * effect (it never runs on the server) and its worker from the bundled worker file's URL.
 */
export function CoverageMap(props: Props) {
  const container = useRef<HTMLDivElement>(null);
  const mapRef = useRef<MapLibreMap | null>(null);
  const [ready, setReady] = useState(false);
  // The cells are on screen (as the quick look or as shapes): the loading notice goes.
  const [cellsShown, setCellsShown] = useState(false);
  const cellsById = useRef<ReadonlyMap<number, CellFeature>>(new Map());
  // A large grid shows the quick look until MapLibre has tiled and drawn the cell shapes once.
  const quickLook = useRef(false);
  // What the quick look shows now: view and zone filter, so it is repainted only when they change.
  const quickLookShows = useRef("");
  const shapesDrawn = useRef(false);
  const fitted = useRef(false);
  const inlined = useRef<InlinedCells | null>(null);
  const markedFilled = useRef(new Set<MarkedSource>());
  // The stations and sightings the style was made with (not set again after the load).
  const monitoringInStyle = useRef<Props["monitoring"] | null>(null);
  // The zone filter on the cell layers now (the style starts with none, or with the one it was made with).
  const appliedZoneFilter = useRef<number | null>(null);
  // The cells whose label points are still to be made: made once the map is near enough to show
  // labels, after the shapes are drawn (a bay's 100,000 points cost about 0.2 s and 15 MB to hand over).
  const labelsPending = useRef<ReturnType<typeof buildCellFeatures> | null>(null);
  const showLabelsIfNear = (map: MapLibreMap) => {
    const collection = labelsPending.current;
    if (!collection || !shapesDrawn.current || map.getZoom() < LABELS_FROM_ZOOM) return;
    labelsPending.current = null;
    // As objects, as the cells are (drawShapes says why not as a blob URL).
    (map.getSource("cell-label-points") as GeoJSONSource).setData(buildCellLabelPoints(collection));
  };
  const callbacks = useRef(props);
  callbacks.current = props;
  // Called once the cells' first read has ended (with cells or an error), while the map waits for it.
  const cellsSettled = useRef<(() => void) | null>(null);
  useEffect(() => {
    if (props.data || props.loadError) cellsSettled.current?.();
  });
  const box = useRef<HTMLDivElement>(null);

  useEffect(() => {
    let cancelled = false;
    let map: MapLibreMap | null = null;
    // The label layers, drawn from just after the first complete frame (labels-after-first-frame.ts).
    let heldLabels: HeldLabel[] = [];
    let removeWindowListeners = () => undefined as void;
    (async () => {
      const styleUrl = mapStyleUrl(window.location.origin, props.projectId);
      // The style is read beside MapLibre's import (not after it), and the fonts with both; on a
      // first visit its read was started before the page was hydrated (early-reads.ts).
      const styleRead = (takeEarlyRead(styleUrl) ?? fetch(styleUrl))
        .then((response) => (response.ok ? (response.json() as Promise<StyleSpecification>) : null))
        .catch(() => null);
      // Labels are drawn from the page's Roboto Mono (no glyphs URL): load it before the first label.
      // User timing marks (the browser's developer tools, the map bench): what the map waited for.
      const marked = <T,>(name: string, promise: Promise<T>) => promise.finally(() => performance.mark(`map: ${name}`));
      performance.mark("map: effect started");
      const [maplibre, style] = await Promise.all([marked("MapLibre in", loadMapLibre()), marked("style in", styleRead), marked("fonts in", loadMapFonts())]);
      // The cells' first read (the page's, started beside this one) is awaited a little, so a small
      // grid goes into the style and the first complete frame has it: arriving just after the map
      // was made, it would cost a second round through the map's worker and more frames. A read
      // slower than that (a large grid on a slow line) does not hold the shoreline and zones back.
      if (!callbacks.current.data && !callbacks.current.loadError) {
        await new Promise<void>((resolve) => {
          const timer = setTimeout(settle, CELLS_WAIT_MS);
          function settle() {
            clearTimeout(timer);
            cellsSettled.current = null;
            resolve();
          }
          cellsSettled.current = settle;
        });
        performance.mark("map: cells in (waited for)");
      }
      if (cancelled || !container.current) return;
      if (style) {
        // What the page shows goes into the style itself: the layers shown, the zone filter and,
        // once the cells are here, their colours. Each set after the load would make the map's
        // worker lay its source out again (a layout property, a filter, a data-driven colour).
        const cellsNow = callbacks.current.data;
        const { view: viewNow, zoneFilter: zoneNow, layers: layersNow } = callbacks.current;
        const cellLayers = new Set([...LAYER_GROUPS.cells, "cell-labels"]);
        const shown = new Map((Object.entries(LAYER_GROUPS) as Array<[LayerKey, string[]]>).flatMap(([key, ids]) => ids.map((id) => [id, layersNow[key]] as const)));
        for (const layer of style.layers) {
          if (layer.id === "cells-fill" && layer.type === "fill" && cellsNow) layer.paint = { ...layer.paint, "fill-color": fillColour(viewNow, cellsNow) as never };
          if (cellLayers.has(layer.id) && zoneNow !== null && !("filter" in layer)) (layer as { filter?: unknown }).filter = ["==", ["get", "z"], zoneNow];
          if (shown.has(layer.id)) layer.layout = { ...layer.layout, visibility: shown.get(layer.id) ? "visible" : "none" } as never;
        }
        appliedZoneFilter.current = zoneNow;
        // The labels go in just after the first complete frame: the cells are on screen sooner.
        const { first, labels } = splitLabels(style.layers);
        style.layers = first;
        heldLabels = labels;
        // A small grid whose cells are already here: they go into the style too, so the first
        // frame draws them, instead of a second round through the worker and more frames after
        // the load. A large grid keeps its quick look first (below).
        // (Only when the first frame is framed already: otherwise the cells frame it after the load.)
        const framedNow = Boolean(callbacks.current.initialCamera || callbacks.current.extent);
        if (framedNow && cellsNow && inLimitCellCount(cellsNow) < QUICK_LOOK_FROM_CELLS && style.sources.cells?.type === "geojson") {
          const collection = buildCellFeatures(cellsNow, callbacks.current.workLimit);
          style.sources.cells = { ...style.sources.cells, data: collection as never };
          inlined.current = { data: cellsNow, collection };
        }
        // The stations and sightings the page has now, the same way.
        const monitoringNow = callbacks.current.monitoring;
        if (monitoringNow && style.sources.stations?.type === "geojson" && style.sources.sightings?.type === "geojson") {
          style.sources.stations = { ...style.sources.stations, data: monitoringNow.stations as never };
          style.sources.sightings = { ...style.sources.sightings, data: monitoringNow.sightings as never };
          monitoringInStyle.current = monitoringNow;
        }
      }
      // The first frame already shows the project: the sent view, or the work limit's extent.
      const { initialCamera, extent } = callbacks.current;
      const camera = initialCamera
        ? { center: initialCamera.centre, zoom: initialCamera.zoom }
        : extent
          ? { bounds: extent, fitBoundsOptions: { padding: framePadding(container.current) } }
          : { center: [0, 0] as [number, number], zoom: 1 };
      fitted.current = Boolean(initialCamera || extent);
      map = new maplibre.Map({
        container: container.current,
        style: style ?? styleUrl,
        ...camera,
        attributionControl: false,
        boxZoom: false,
        // The page's own keys move between cells (the cell map's key handler); the map does not take focus.
        keyboard: false,
        canvasContextAttributes: { preserveDrawingBuffer: true },
      });
      // One complete first frame instead of one per source as its tiles arrive (hold-frames.ts).
      const framesHeld = holdFramesUntilComplete(map, FRAMES_HELD_AT_MOST_MS);
      // No sky pass over the whole canvas while the map is seen from above (sky-pass.ts).
      skipSkyWhileFlat(map);
      // A click on the map focuses the cell map around it, whose keys move between cells.
      map.getCanvas().removeAttribute("tabindex");
      // The planned cells' hatch, drawn when a tile first needs it, and answered within that tile's
      // request: MapLibre's missing-image event comes after the request has been answered without it.
      map.setMissingStyleImageResolver((id) => {
        if (id === PLANNED_PATTERN && map && !map.hasImage(PLANNED_PATTERN)) map.addImage(PLANNED_PATTERN, plannedPatternPixels());
      });
      map.on("moveend", () => {
        if (!map) return;
        showLabelsIfNear(map);
        const centre = map.getCenter();
        callbacks.current.onCamera?.([centre.lng, centre.lat], map.getZoom());
      });
      map.addControl(new maplibre.NavigationControl({ showCompass: true }), "top-right");
      map.addControl(new maplibre.ScaleControl({ unit: props.lengthUnit === "m" ? "metric" : "imperial", maxWidth: 120 }), "bottom-left");
      mapRef.current = map;
      // For the browser tests and for debugging from the console.
      (window as unknown as { firmsandMap?: MapLibreMap }).firmsandMap = map;
      map.on("load", () => {
        if (cancelled) return;
        performance.mark(`map: first complete frame (${framesHeld()} held before it)`);
        // The labels, now that the first complete frame is drawn (before the page's effects that
        // show, hide and filter them run).
        const labelled = map;
        if (heldLabels.length > 0 && labelled) {
          addLabels(labelled, heldLabels);
          // The first frame drawn with their tiles laid out again: the labels placed (they fade in from there).
          const placed = () => {
            if (!labelled.areTilesLoaded()) return;
            labelled.off("render", placed);
            performance.mark("map: labels placed");
          };
          labelled.on("render", placed);
        }
        // Cells that came with the style are on screen now: the map's load is its first complete frame.
        const inStyle = inlined.current;
        if (inStyle) {
          shapesDrawn.current = true;
          container.current?.setAttribute("data-cells-drawn", String(inStyle.collection.features.length));
          container.current?.setAttribute("data-cells-drawn-as", "shapes");
          setCellsShown(true);
        }
        setReady(true);
      });
      // A station or sighting drawn over a cell takes the click; the cell under it is not selected.
      const onPoint = (point: { x: number; y: number }) => map !== null && map.queryRenderedFeatures([point.x, point.y], { layers: MONITORING_CLICK_LAYERS.filter((id) => map!.getLayer(id)) }).length > 0;
      for (const layer of MONITORING_CLICK_LAYERS) {
        map.on("click", layer, (event) => {
          const key = event.features?.[0]?.properties?.key;
          if (typeof key === "string") callbacks.current.onMonitoringClick?.(key as MonitoringKey);
        });
        map.on("mouseenter", layer, () => map && (map.getCanvas().style.cursor = "pointer"));
        map.on("mouseleave", layer, () => map && (map.getCanvas().style.cursor = ""));
      }
      map.on("click", "cells-fill", (event) => {
        if (onPoint(event.point)) return;
        const id = event.features?.[0]?.id;
        if (typeof id === "number") callbacks.current.onCellClick(id, event.originalEvent.shiftKey, [event.lngLat.lng, event.lngLat.lat]);
      });
      // While the quick look stands in for the shapes, a click finds its cell from the grid.
      map.on("click", (event) => {
        const data = callbacks.current.data;
        if (!quickLook.current || !data || !map || onPoint(event.point) || map.queryRenderedFeatures(event.point, { layers: ["cells-fill"] }).length > 0) return;
        const index = cellIndexAtLonLat(data, event.lngLat.lng, event.lngLat.lat);
        if (index >= 0) callbacks.current.onCellClick(index, event.originalEvent.shiftKey, [event.lngLat.lng, event.lngLat.lat]);
      });
      map.on("mouseenter", "cells-fill", () => map && (map.getCanvas().style.cursor = "pointer"));
      map.on("mouseleave", "cells-fill", () => map && (map.getCanvas().style.cursor = ""));
      map.on("mousemove", (event) => callbacks.current.onPointer([event.lngLat.lng, event.lngLat.lat]));
      map.on("mouseout", () => callbacks.current.onPointer(null));
      map.on("rotate", () => map && callbacks.current.onBearing(map.getBearing()));

      // Shift + drag draws a selection box (box zoom is off for that reason).
      const canvas = map.getCanvasContainer();
      let start: { x: number; y: number } | null = null;
      const local = (event: MouseEvent) => {
        const rect = canvas.getBoundingClientRect();
        return { x: event.clientX - rect.left, y: event.clientY - rect.top };
      };
      canvas.addEventListener("mousedown", (event) => {
        if (!event.shiftKey || event.button !== 0 || !map) return;
        start = local(event);
        map.dragPan.disable();
      });
      const onWindowMove = (event: MouseEvent) => {
        if (!start || !box.current) return;
        const point = local(event);
        Object.assign(box.current.style, {
          display: "block",
          left: `${Math.min(start.x, point.x)}px`, top: `${Math.min(start.y, point.y)}px`,
          width: `${Math.abs(point.x - start.x)}px`, height: `${Math.abs(point.y - start.y)}px`,
        });
      };
      const onWindowUp = (event: MouseEvent) => {
        if (!start || !map) return;
        const end = local(event);
        const from = start;
        start = null;
        map.dragPan.enable();
        if (box.current) box.current.style.display = "none";
        if (Math.abs(end.x - from.x) < 4 && Math.abs(end.y - from.y) < 4) return; // a shift-click, handled by the click event
        const features = map.queryRenderedFeatures([[Math.min(from.x, end.x), Math.min(from.y, end.y)], [Math.max(from.x, end.x), Math.max(from.y, end.y)]], { layers: ["cells-fill"] });
        callbacks.current.onBoxSelect([...new Set(features.map((feature) => feature.id).filter((id): id is number => typeof id === "number"))]);
      };
      window.addEventListener("mousemove", onWindowMove);
      window.addEventListener("mouseup", onWindowUp);
      removeWindowListeners = () => {
        window.removeEventListener("mousemove", onWindowMove);
        window.removeEventListener("mouseup", onWindowUp);
      };
    })();
    return () => {
      cancelled = true;
      // A map taken down while it waits for the cells stops waiting (and, cancelled, makes nothing).
      cellsSettled.current?.();
      removeWindowListeners();
      map?.remove();
      mapRef.current = null;
    };
    // The map is made once per project.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [props.projectId]);

  const { data, view, layers, zoneFilter, selected, assigned, held, bands, flyTo, shorelineStamp, zonesStamp } = props;

  // The style is read once; a new shoreline or new zones only swap those sources' data.
  const drawnStamps = useRef({ shoreline: shorelineStamp, zones: zonesStamp });
  useEffect(() => {
    const map = mapRef.current;
    if (!ready || !map) return;
    const stale = (["shoreline", "zones"] as const).filter((source) => drawnStamps.current[source] !== (source === "shoreline" ? shorelineStamp : zonesStamp));
    if (stale.length === 0) return;
    drawnStamps.current = { shoreline: shorelineStamp, zones: zonesStamp };
    let cancelled = false;
    fetch(mapStyleUrl(window.location.origin, props.projectId), { cache: "no-store" })
      .then((response) => response.json())
      .then((style: { sources: Record<"shoreline" | "zones", { data: FeatureCollection }> }) => {
        if (cancelled) return;
        for (const source of stale) (map.getSource(source) as GeoJSONSource | undefined)?.setData(style.sources[source].data);
      })
      .catch(() => undefined);
    return () => {
      cancelled = true;
    };
  }, [ready, shorelineStamp, zonesStamp, props.projectId]);

  useEffect(() => {
    const map = mapRef.current;
    if (!ready || !map || !data) return;
    const element = container.current;
    let cancelled = false;
    const fit = (points: Iterable<number[]>) => {
      if (fitted.current) return;
      let west = Infinity, south = Infinity, east = -Infinity, north = -Infinity;
      for (const [lon, lat] of points) {
        west = Math.min(west, lon); east = Math.max(east, lon); south = Math.min(south, lat); north = Math.max(north, lat);
      }
      if (!Number.isFinite(west)) return;
      map.fitBounds([[west, south], [east, north]], { padding: 30, animate: false });
      fitted.current = true;
    };
    const drawShapes = async () => {
      if (cancelled) return;
      // The cells the style was made with are drawn already; any later read is set here.
      const inStyle = inlined.current?.data === data ? inlined.current.collection : null;
      inlined.current = null;
      const collection = inStyle ?? buildCellFeatures(data, callbacks.current.workLimit);
      labelsPending.current = collection;
      cellsById.current = new Map(collection.features.map((feature) => [feature.id as number, feature]));
      setMarkedCells(map, "cells-selected", callbacks.current.selected, cellsById.current, markedFilled.current);
      setMarkedCells(map, "cells-assigned", callbacks.current.assigned, cellsById.current, markedFilled.current);
      setMarkedCells(map, "cells-held", callbacks.current.held, cellsById.current, markedFilled.current);
      fit((function* () {
        for (const feature of collection.features) yield* feature.geometry.type === "Polygon" ? feature.geometry.coordinates[0] : feature.geometry.coordinates.flatMap((polygon) => polygon[0]);
      })());
      if (inStyle) {
        // Drawn with the map's first frame (its load, above).
        showLabelsIfNear(map);
        return;
      }
      // Handed to MapLibre's worker as objects, after the page has had its turn (building the shapes
      // and handing them over are two tasks, not one). A blob URL of their JSON text, read by the
      // worker, cost more with MapLibre 6: its worker sends data it read from a URL back to the page,
      // where a bay's 100,000 features were rebuilt on the page's thread (1–2 s) and drawn about 2 s later.
      await yieldToPage();
      if (cancelled) return;
      (map.getSource("cells") as GeoJSONSource).setData(collection);
      map.once("idle", () => {
        shapesDrawn.current = true;
        if (quickLook.current) {
          quickLook.current = false;
          removeQuickLook(map);
        }
        element?.setAttribute("data-cells-drawn", String(collection.features.length));
        element?.setAttribute("data-cells-drawn-as", "shapes");
        setCellsShown(true);
        showLabelsIfNear(map);
      });
    };
    const cellCount = inLimitCellCount(data);
    if (!shapesDrawn.current && cellCount >= QUICK_LOOK_FROM_CELLS) {
      // A large grid: the quick look first, and the shapes (seconds of tiling in MapLibre's
      // worker) only once it is on screen, so building them does not hold up its first frame.
      quickLook.current = true;
      const { view: shownView, zoneFilter: shownZone } = callbacks.current;
      quickLookShows.current = `${shownView}|${shownZone}`;
      showQuickLook(map, data, shownView, shownZone);
      fit(cellImageCorners(data));
      afterQuickLookDrawn(map, () => {
        if (cancelled) return;
        element?.setAttribute("data-cells-drawn", String(cellCount));
        element?.setAttribute("data-cells-drawn-as", "quick look");
        setCellsShown(true);
        setTimeout(() => void drawShapes(), 0);
      });
    } else void drawShapes();
    return () => {
      cancelled = true;
    };
  }, [ready, data]);

  useEffect(() => {
    const map = mapRef.current;
    if (!ready || !map || !data) return;
    map.setPaintProperty("cells-fill", "fill-color", fillColour(view, data) as never);
  }, [ready, data, view]);

  useEffect(() => {
    const map = mapRef.current;
    if (!ready || !map || !data || !quickLook.current || quickLookShows.current === `${view}|${zoneFilter}`) return;
    quickLookShows.current = `${view}|${zoneFilter}`;
    showQuickLook(map, data, view, zoneFilter);
  }, [ready, data, view, zoneFilter]);

  useEffect(() => {
    const map = mapRef.current;
    if (!ready || !map) return;
    for (const [key, ids] of Object.entries(LAYER_GROUPS) as Array<[LayerKey, string[]]>) {
      for (const id of key === "cells" && map.getLayer(QUICK_LOOK) ? [...ids, QUICK_LOOK] : ids) map.setLayoutProperty(id, "visibility", layers[key] ? "visible" : "none");
    }
  }, [ready, layers]);

  useEffect(() => {
    const map = mapRef.current;
    if (!ready || !map) return;
    // A filter set again, even the same, makes the map's worker lay the cells out again.
    if (appliedZoneFilter.current === zoneFilter) return;
    appliedZoneFilter.current = zoneFilter;
    const filter = zoneFilter === null ? null : ["==", ["get", "z"], zoneFilter];
    for (const id of LAYER_GROUPS.cells.concat("cell-labels")) map.setFilter(id, filter as never);
  }, [ready, zoneFilter]);

  useEffect(() => {
    const map = mapRef.current;
    if (!ready || !map || !data) return;
    setMarkedCells(map, "cells-selected", selected, cellsById.current, markedFilled.current);
  }, [ready, data, selected]);

  useEffect(() => {
    const map = mapRef.current;
    if (!ready || !map || !data) return;
    setMarkedCells(map, "cells-assigned", assigned, cellsById.current, markedFilled.current);
  }, [ready, data, assigned]);

  useEffect(() => {
    const map = mapRef.current;
    if (!ready || !map || !data) return;
    setMarkedCells(map, "cells-held", held, cellsById.current, markedFilled.current);
  }, [ready, data, held]);

  useEffect(() => {
    const map = mapRef.current;
    if (!ready || !map || !bands) return;
    (map.getSource("bands") as GeoJSONSource).setData(bands.collection as never);
    const bounds = bands.collection.features.map((feature) => (feature.properties ?? { lower: null, upper: null }) as BandBounds);
    map.setPaintProperty("bands-fill", "fill-color", bandColour(bands.surface, bounds) as never);
  }, [ready, bands]);

  useEffect(() => {
    const map = mapRef.current;
    if (!ready || !map || !flyTo) return;
    map.easeTo({ center: flyTo.lonLat, zoom: Math.max(map.getZoom(), 19), duration: 300 });
  }, [ready, flyTo]);

  const { monitoring } = props;
  useEffect(() => {
    const map = mapRef.current;
    if (!ready || !map || !monitoring) return;
    const inStyle = monitoringInStyle.current;
    monitoringInStyle.current = null;
    if (inStyle?.stations === monitoring.stations && inStyle.sightings === monitoring.sightings) {
      container.current?.setAttribute("data-monitoring-drawn", String(monitoring.stations.features.length + monitoring.sightings.features.length));
      return;
    }
    (map.getSource("stations") as GeoJSONSource | undefined)?.setData(monitoring.stations as never);
    (map.getSource("sightings") as GeoJSONSource | undefined)?.setData(monitoring.sightings as never);
    container.current?.setAttribute("data-monitoring-drawn", String(monitoring.stations.features.length + monitoring.sightings.features.length));
  }, [ready, monitoring?.stations, monitoring?.sightings]);

  const chosenPoint = monitoring?.chosen ?? "";
  useEffect(() => {
    const map = mapRef.current;
    if (!ready || !map) return;
    for (const id of ["stations-chosen", "sightings-chosen"]) if (map.getLayer(id)) map.setFilter(id, ["==", ["get", "key"], chosenPoint] as never);
  }, [ready, chosenPoint]);

  const { cameraCommand, extent, loadError } = props;
  useEffect(() => {
    const map = mapRef.current;
    if (!ready || !map || !cameraCommand) return;
    if (cameraCommand.kind === "zoom-in") map.zoomIn({ duration: 200 });
    else if (cameraCommand.kind === "zoom-out") map.zoomOut({ duration: 200 });
    else if (extent && container.current) map.fitBounds(extent, { padding: framePadding(container.current), duration: 300 });
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [ready, cameraCommand]);

  return (
    <div className="relative h-full w-full overflow-hidden">
      {/* MapLibre's stylesheet sets its container to position: relative, overriding a Tailwind
          "absolute inset-0" and collapsing it to no height: size it by the parent instead. */}
      <div ref={container} className="h-full w-full" data-testid="coverage-map" data-map-ready={ready ? "yes" : "no"} />
      <div ref={box} className="pointer-events-none absolute hidden border-2 border-dashed border-[#d4145a] bg-[#d4145a]/10" />
      {cellsShown && !loadError ? null : (
        <div className="pointer-events-none absolute inset-x-0 top-14 flex justify-center">
          <p data-testid="cells-loading" aria-live="polite" className={`pointer-events-auto rounded border bg-panel/95 px-4 py-3 text-sm shadow ${loadError ? "border-danger text-danger" : "border-line"}`}>
            {loadError ? `The cells could not be shown: ${loadError}. They are read again every 30 seconds and when you come back to this page.` : (
              <>
                <span aria-hidden className="mr-2 inline-block h-3 w-3 animate-spin rounded-full border-2 border-lagoon border-t-transparent align-middle" />
                Loading cells…
              </>
            )}
          </p>
        </div>
      )}
    </div>
  );
}
