import { z } from "zod";
import { DEFAULT_LAYERS, LAYER_KEYS, type LayerKey, type MapViewState } from "./view-url";

/**
 * Reads the map's view from its address (view-url.ts writes it): in the map page's loader only.
 * Every part is optional and read on its own: a link with one bad part still opens the map, with
 * the rest kept.
 */

/**
 * The layers the map's first switch had. Links of that time list only the layers shown, so one of
 * these left out was hidden; a layer added since ("monitoring", "tubes", any later one) that a link
 * leaves out did not exist when the link was made, and opens at its default. Links made now state
 * every layer, the hidden ones as "-key", so nothing in them is guessed.
 */
const FIRST_LAYER_KEYS: readonly LayerKey[] = ["cells", "bands", "zones", "workLimit", "shoreline", "labels"];

const centreSchema = z
  .string()
  .transform((text) => text.split(",").map(Number))
  .pipe(z.tuple([z.number().min(-180).max(180), z.number().min(-85).max(85)]));
const zoomSchema = z.coerce.number().min(0).max(24);
const viewSchema = z.enum(["status", "thickness", "removed"]);
const layerKeySchema = z.enum(LAYER_KEYS as [LayerKey, ...LayerKey[]]);
const layersSchema = z
  .string()
  .transform((text) => (text === "" ? [] : text.split(",")))
  .pipe(z.array(z.string().transform((entry) => ({ shown: !entry.startsWith("-"), key: entry.replace(/^-/, "") })).pipe(z.object({ shown: z.boolean(), key: layerKeySchema }))))
  .transform((entries): Record<LayerKey, boolean> => {
    const stated = new Map(entries.map((entry) => [entry.key, entry.shown]));
    return Object.fromEntries(LAYER_KEYS.map((key) => [key, stated.get(key) ?? (FIRST_LAYER_KEYS.includes(key) ? false : DEFAULT_LAYERS[key])])) as Record<LayerKey, boolean>;
  });
const bandSurfaceSchema = z.enum(["remaining", "depth"]);
const zoneSchema = z.coerce.number().int().positive();
// Labels as the grid writes them: column letters and row number, either part with a leading "-".
const cellsSchema = z
  .string()
  .transform((text) => text.split(",").map((label) => label.trim().toUpperCase()).filter(Boolean))
  .pipe(z.array(z.string().regex(/^-?[A-Z]{1,4}-?\d{1,6}$/)).max(5000));
const dateSchema = z.string().regex(/^\d{4}-\d{2}-\d{2}$/).refine((text) => !Number.isNaN(Date.parse(`${text}T00:00:00Z`)));

function read<T>(params: URLSearchParams, key: string, schema: z.ZodType<T>): T | null {
  const value = params.get(key);
  if (value === null) return null;
  const parsed = schema.safeParse(value);
  return parsed.success ? parsed.data : null;
}

export function parseMapView(params: URLSearchParams): MapViewState {
  const centre = read(params, "c", centreSchema);
  const zoom = read(params, "z", zoomSchema);
  const layers = read(params, "layers", layersSchema);
  return {
    centre: centre && zoom !== null ? centre : null,
    zoom: centre && zoom !== null ? zoom : null,
    view: read(params, "view", viewSchema) ?? "status",
    layers: layers ?? { ...DEFAULT_LAYERS },
    bandSurface: read(params, "bands", bandSurfaceSchema) ?? "remaining",
    zoneId: read(params, "zone", zoneSchema),
    cells: read(params, "cells", cellsSchema) ?? [],
    planDate: read(params, "date", dateSchema),
  };
}
