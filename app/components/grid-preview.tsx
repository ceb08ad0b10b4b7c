import type { GeoJSONSource, ImageSource, Map as MapLibreMap } from "maplibre-gl";
import { useEffect, useId, useMemo, useState } from "react";
import { createCrs } from "../../shared/crs";
import { cellsInFrame, layPreviewGrid, zoomForCellPixels, type PreviewGrid } from "../../shared/grid/grid-preview";
import type { Position, ProjectedMultiPolygon } from "../../shared/grid/work-limit";
import { METRES_PER_UNIT, unitLabel, type LengthUnit } from "../../shared/units";
import { buildCellFeatures, buildCellLabelPoints, type CellsData } from "./map/cell-features";
import { cellImageCorners, paintCellImage } from "./map/cell-image";
import type { LonLatWorkLimit } from "./map/clip-cells";
import { extentOfPolygons, useOfflineMap } from "./map/offline-map";
import { polygonsOf, type LonLatPolygons } from "./work-limit-outline";

/** The grid as typed in the form (blank: the saved value is kept, as saving would keep it). */
export interface TypedGrid {
  cellSize: string;
  rotationDegrees: string;
  originX: string;
  originY: string;
  rasterResolution: string;
}

export interface SavedGrid {
  cellSize: number;
  rotationDegrees: number;
  originX: number;
  originY: number;
  rasterResolution: number;
}

/** At most this many cell shapes (and labels) are drawn at once; past it the page says so. */
export const PREVIEW_MAX_DRAWN_CELLS = 3_000;
/** A cell label (four or five mono characters at 10 px) needs the cell this wide on screen to be read. */
const LABEL_PIXELS = 32;
/** Cell outlines are drawn from this many pixels a cell; below it they would fill the cell. */
const OUTLINE_PIXELS = 5;
const LARGE_GRID_CELLS = 200_000;
const PREVIEW_FILL = "#5fa8b5";
const QUICK_LOOK = "grid-preview-quick-look";

const figure = (value: number) => value.toLocaleString("en-US");

function numberOr(text: string, fallback: number): number {
  if (text.trim() === "") return fallback;
  const value = Number(text);
  return Number.isFinite(value) ? value : Number.NaN;
}

/** The settings as the save would read them, or what is wrong with them. */
function settingsFrom(typed: TypedGrid, saved: SavedGrid): { ok: true; value: SavedGrid } | { ok: false; message: string } {
  const cellSize = numberOr(typed.cellSize, Number.NaN);
  if (!(cellSize > 0)) return { ok: false, message: "Enter a cell size above 0 to see the grid." };
  const value = {
    cellSize,
    rotationDegrees: numberOr(typed.rotationDegrees, saved.rotationDegrees),
    originX: numberOr(typed.originX, saved.originX),
    originY: numberOr(typed.originY, saved.originY),
    rasterResolution: numberOr(typed.rasterResolution, saved.rasterResolution),
  };
  if (![value.rotationDegrees, value.originX, value.originY].every(Number.isFinite)) return { ok: false, message: "Rotation and origin must be numbers." };
  if (!(value.rasterResolution > 0)) return { ok: false, message: "Enter a raster resolution above 0 to see which cells lie inside the work limit." };
  return { ok: true, value };
}

/** What the cells-fill layer draws over the preview: a cell inside the limit, status code 0. */
function previewData(preview: PreviewGrid, crsDefinition: string): CellsData | null {
  if (!preview.inLimit) return null;
  const count = preview.cells;
  const status = new Int8Array(count);
  for (let index = 0; index < count; index++) status[index] = preview.inLimit[index] === 1 ? 0 : -1;
  return {
    grid: preview.grid, crs: { code: "", definition: crsDefinition }, status, remainingThickness: [], removedVolume: new Float32Array(count), zone: new Int8Array(count).fill(-1),
  } as unknown as CellsData;
}

interface Drawn {
  /** Cell shapes drawn now. */
  shapes: number;
  /** In-limit cells in the view, when that is more than are drawn. */
  inView: number | null;
  zoom: number;
  labelZoom: number;
}

/**
 * The grid preview beside the Grid settings: the cells of the grid as typed (before it is saved)
 * drawn on the project's map, clipped along the work limit as the map page draws them, with their
 * labels once they are large enough on screen to read. Which cells lie inside the work limit is
 * decided by the engine's own rule (shared/grid/grid-preview.ts). A large grid is shown whole as
 * an image (a pixel a cell, as the map page's quick look) and in shapes only where the view holds
 * at most PREVIEW_MAX_DRAWN_CELLS of them, which the page says.
 */
export function GridPreview({ projectId, lengthUnit, crsDefinition, workLimit, typed, saved, title }: {
  projectId: number;
  lengthUnit: LengthUnit;
  crsDefinition: string;
  workLimit: LonLatPolygons;
  typed: TypedGrid;
  saved: SavedGrid;
  title: string;
}) {
  const crs = useMemo(() => createCrs(crsDefinition), [crsDefinition]);
  const limit = useMemo<ProjectedMultiPolygon>(() => polygonsOf(workLimit).map((rings) => rings.map((ring) => ring.map(([lon, lat]) => crs.fromLonLat(lon, lat) as Position))), [workLimit, crs]);
  const extent = useMemo(() => extentOfPolygons(polygonsOf(workLimit)), [workLimit]);
  const latitude = extent ? (extent[0][1] + extent[1][1]) / 2 : 0;
  const statusId = useId();
  const { container, map, ready } = useOfflineMap(projectId, extent, { lengthUnit, ariaLabel: `${title}: arrow keys pan, + and − zoom`, describedBy: statusId });

  // Laid out a moment after the typing stops, not on every key.
  const [preview, setPreview] = useState<{ grid: PreviewGrid; data: CellsData | null } | { error: string } | null>(null);
  const key = JSON.stringify(typed);
  useEffect(() => {
    const timer = window.setTimeout(() => {
      const settings = settingsFrom(typed, saved);
      if (!settings.ok) {
        setPreview({ error: settings.message });
        return;
      }
      const grid = layPreviewGrid(limit, settings.value);
      setPreview({ grid, data: previewData(grid, crsDefinition) });
    }, 250);
    return () => window.clearTimeout(timer);
    // `key` stands for the typed values.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [key, limit, saved, crsDefinition]);

  const [drawn, setDrawn] = useState<Drawn | null>(null);
  useEffect(() => {
    if (!ready || !map || !preview || "error" in preview) return;
    const { grid, data } = preview;
    const cellMetres = grid.grid.cellSize * METRES_PER_UNIT[lengthUnit];
    // Cells too small to label before the closest zoom are labelled there, where the labels fit (MapLibre drops those that would overlap).
    const labelZoom = Math.min(zoomForCellPixels(cellMetres, latitude, LABEL_PIXELS), map.getMaxZoom());
    // The style's cell layers, as the map page has them, shown for a grid not yet saved.
    map.setPaintProperty("cells-fill", "fill-color", PREVIEW_FILL);
    map.setPaintProperty("cells-fill", "fill-opacity", 0.45);
    map.setPaintProperty("cells-grid", "line-color", "#0d4650");
    map.setPaintProperty("cells-grid", "line-opacity", 0.7);
    map.setLayerZoomRange("cells-grid", Math.max(0, zoomForCellPixels(cellMetres, latitude, OUTLINE_PIXELS)), 24);
    map.setLayerZoomRange("cell-labels", Math.max(0, labelZoom), 24);
    map.setLayoutProperty("cell-labels", "visibility", "visible");

    // The whole grid as an image when it is too many cells to draw as shapes at once.
    const large = data !== null && (grid.inLimitCount ?? 0) > PREVIEW_MAX_DRAWN_CELLS && grid.grid.cols <= 8192 && grid.grid.rows <= 8192;
    if (map.getLayer(QUICK_LOOK)) map.removeLayer(QUICK_LOOK);
    if (map.getSource(QUICK_LOOK)) map.removeSource(QUICK_LOOK);
    if (large && data) {
      const image = paintCellImage(data, () => PREVIEW_FILL);
      const canvas = document.createElement("canvas");
      canvas.width = image.width;
      canvas.height = image.height;
      canvas.getContext("2d")!.putImageData(new ImageData(image.pixels as Uint8ClampedArray<ArrayBuffer>, image.width, image.height), 0, 0);
      const coordinates = cellImageCorners(data) as [[number, number], [number, number], [number, number], [number, number]];
      map.addSource(QUICK_LOOK, { type: "image", url: canvas.toDataURL("image/png"), coordinates });
      map.addLayer({ id: QUICK_LOOK, type: "raster", source: QUICK_LOOK, paint: { "raster-resampling": "nearest", "raster-fade-duration": 0, "raster-opacity": 0.6 } }, "cells-fill");
    }

    const draw = () => {
      let indices: number[] = [];
      let inView: number | null = null;
      if (data && grid.inLimit) {
        if ((grid.inLimitCount ?? 0) <= PREVIEW_MAX_DRAWN_CELLS) {
          for (let index = 0; index < grid.inLimit.length; index++) if (grid.inLimit[index] === 1) indices.push(index);
        } else {
          const canvas = map.getCanvas();
          const corners = [[0, 0], [canvas.clientWidth, 0], [canvas.clientWidth, canvas.clientHeight], [0, canvas.clientHeight]]
            .map(([x, y]) => map.unproject([x, y]))
            .map((lngLat) => crs.fromLonLat(lngLat.lng, lngLat.lat) as Position);
          const found = cellsInFrame(grid, corners, PREVIEW_MAX_DRAWN_CELLS);
          if (found.total <= PREVIEW_MAX_DRAWN_CELLS) indices = found.indices;
          else inView = found.total;
        }
      }
      // The image stands in only while the view holds too many cells for shapes (it is not clipped along the limit).
      if (map.getLayer(QUICK_LOOK)) map.setLayoutProperty(QUICK_LOOK, "visibility", inView !== null ? "visible" : "none");
      const features = data ? buildCellFeatures(data, workLimit as unknown as LonLatWorkLimit, indices) : { type: "FeatureCollection" as const, features: [] };
      (map.getSource("cells") as GeoJSONSource | undefined)?.setData(features as never);
      (map.getSource("cell-label-points") as GeoJSONSource | undefined)?.setData(buildCellLabelPoints(features) as never);
      setDrawn({ shapes: features.features.length, inView, zoom: map.getZoom(), labelZoom });
    };
    draw();
    const onZoom = () => setDrawn((current) => (current ? { ...current, zoom: map.getZoom() } : current));
    // A large grid's shapes follow the view; a small one's are all drawn once.
    const byView = (grid.inLimitCount ?? 0) > PREVIEW_MAX_DRAWN_CELLS;
    if (byView) map.on("moveend", draw);
    map.on("zoomend", onZoom);
    return () => {
      map.off("moveend", draw);
      map.off("zoomend", onZoom);
    };
  }, [ready, map, preview, crs, workLimit, latitude, lengthUnit]);

  const laid = preview && !("error" in preview) ? preview.grid : null;
  const area = unitLabel(lengthUnit);
  return (
    <div className="space-y-2" data-testid="grid-preview">
      <div className="relative">
        <div
          ref={container} className="h-72 w-full overflow-hidden rounded border border-line sm:h-96"
          data-testid="grid-preview-map" data-ready={ready ? "" : undefined} data-drawn={drawn?.shapes ?? 0}
        />
      </div>
      <div id={statusId} className="space-y-1 text-sm" aria-live="polite">
        {preview === null ? <p className="text-muted">Laying out the grid…</p> : null}
        {preview && "error" in preview ? <p className="text-danger" data-testid="grid-preview-count">{preview.error}</p> : null}
        {laid ? (
          <>
            <p data-testid="grid-preview-count">
              {title}: <span className="figures">{figure(laid.cells)}</span> cells
              (<span className="figures">{figure(laid.grid.cols)}</span> columns × <span className="figures">{figure(laid.grid.rows)}</span> rows of <span className="figures">{figure(laid.grid.cellSize)}</span> {area})
              {laid.inLimitCount !== null ? <>, <span className="figures">{figure(laid.inLimitCount)}</span> of them inside the work limit{laid.exact ? "" : ` (counted on a ${figure(laid.rasterSpacing)} ${area} raster, coarser than the grid's: a sliver cell along the limit may be missed)`}</> : null}.
            </p>
            {laid.cells > LARGE_GRID_CELLS ? (
              <p className="text-danger" data-testid="grid-preview-large">
                More than {figure(LARGE_GRID_CELLS)} cells: the map and every recompute slow down with the count, so saving asks you to confirm it.
              </p>
            ) : null}
            {laid.inLimit === null ? <p className="text-muted" data-testid="grid-preview-too-fine">Too many cells or raster nodes to lay out in the browser: the count above is the grid's frame, and the cells are not drawn.</p> : null}
            {drawn && drawn.inView !== null ? (
              <p data-testid="grid-preview-capped">
                Shown as an image: <span className="figures">{figure(drawn.inView)}</span> cells in view, more than the <span className="figures">{figure(PREVIEW_MAX_DRAWN_CELLS)}</span> drawn as shapes at once. Zoom in to see cells and their labels.
              </p>
            ) : null}
            {drawn && drawn.inView === null && drawn.shapes > 0 ? (
              <p className="text-muted" data-testid="grid-preview-labels">
                <span className="figures">{figure(drawn.shapes)}</span> cells drawn{drawn.zoom + 0.01 < drawn.labelZoom ? "; zoom in to read their labels (too small to read at this scale)." : ", labelled."}
              </p>
            ) : null}
          </>
        ) : null}
      </div>
    </div>
  );
}
