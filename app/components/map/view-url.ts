import type { MapView } from "./paint";

/**
 * The map's view in its address, so a supervisor can send a link to what they see: centre, zoom,
 * coloured view, layers, band surface, zone, selected cells and the plan date shown. Every part is
 * optional and read on its own: a link with one bad part still opens the map, with the rest kept.
 * The address is read on the server, by the map page's loader (view-url.server.ts); the browser
 * only writes it, so the page's scripts carry no schema library.
 */
export type LayerKey = "cells" | "bands" | "zones" | "workLimit" | "shoreline" | "labels" | "monitoring" | "tubes";
export const LAYER_KEYS: readonly LayerKey[] = ["cells", "bands", "zones", "workLimit", "shoreline", "labels", "monitoring", "tubes"];
export const DEFAULT_LAYERS: Readonly<Record<LayerKey, boolean>> = { cells: true, bands: false, zones: true, workLimit: true, shoreline: true, labels: true, monitoring: true, tubes: true };

export interface MapViewState {
  /** Longitude, latitude of the map's centre; with `zoom`, or neither. */
  centre: [number, number] | null;
  zoom: number | null;
  view: MapView;
  layers: Record<LayerKey, boolean>;
  bandSurface: "remaining" | "depth";
  /** The zone's id (not its place in the list: zones may be reordered between sending and opening). */
  zoneId: number | null;
  /** Selected cells by label, as the crews write them. */
  cells: string[];
  /** The plan date whose cells are shown as planned (YYYY-MM-DD); null for tomorrow. */
  planDate: string | null;
}

/** The search part for a view; defaults are left out so a plain view keeps a plain address. */
export function mapViewSearch(state: MapViewState): string {
  const params = new URLSearchParams();
  if (state.centre && state.zoom !== null) {
    params.set("c", `${state.centre[0].toFixed(6)},${state.centre[1].toFixed(6)}`);
    params.set("z", state.zoom.toFixed(2));
  }
  if (state.view !== "status") params.set("view", state.view);
  if (LAYER_KEYS.some((key) => state.layers[key] !== DEFAULT_LAYERS[key])) params.set("layers", LAYER_KEYS.map((key) => (state.layers[key] ? key : `-${key}`)).join(","));
  if (state.layers.bands && state.bandSurface !== "remaining") params.set("bands", state.bandSurface);
  if (state.zoneId !== null) params.set("zone", String(state.zoneId));
  if (state.cells.length > 0) params.set("cells", state.cells.join(","));
  if (state.planDate) params.set("date", state.planDate);
  const text = params.toString().replaceAll("%2C", ",");
  return text ? `?${text}` : "";
}
