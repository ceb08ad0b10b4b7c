import { Shoreline, Zone } from "~/lib/db.server";
import { STATUS_COLOURS, WATER_COLOUR, WORK_LIMIT_COLOUR } from "../../shared/palette";
import { CELL_SOURCES } from "~/components/map/cell-sources";
import { MARK_STYLES, PLANNED_PATTERN, TUBE_COLOURS, sharedProgramColour } from "~/components/map/paint";
import { findProject } from "~/lib/auth/project-view.server";
import { createCrs } from "../../shared/crs";
import { tubeEnds } from "../../shared/dewatering/tubes";
import { resolveCrsDefinition } from "~/lib/geo/epsg.server";
import { listTubes } from "./dewatering.server";
import type { ProjectView } from "~/lib/auth/project-view.server";

/**
 * The map's offline style: no tiles, no CDN, no glyphs URL. Everything drawn comes from the
 * project's own data (work limit, zones, optional shoreline) and from layers the page fills
 * (cells, bands). Labels use the shipped Roboto Mono through the page's CSS font: MapLibre 5.11+
 * draws text locally from the family named in `text-font` when the style has no `glyphs`.
 */
export const MAP_FONT = "Roboto Mono";

const emptyCollection = { type: "FeatureCollection", features: [] } as const;

function parse(json: string | null | undefined): unknown {
  return json ? JSON.parse(json) : null;
}

export async function buildMapStyle(project: ProjectView) {
  const row = await findProject(project.id);
  const workLimit = parse(row?.workLimitGeoJson);
  const zones = await Zone.findAll({ where: { projectId: project.id }, order: [["sortOrder", "ASC"], ["id", "ASC"]] });
  const shoreline = await Shoreline.findOne({ where: { projectId: project.id } });
  // The geotextile tubes placed on the laydown area, each a line of its length along its bearing (red when near capacity).
  const tubes = (await listTubes(project)).tubes.filter((tube) => tube.position !== null && tube.status !== "hauled");
  const crs = tubes.length > 0 && row ? createCrs(resolveCrsDefinition(row.crs).definition) : null;
  const tubeFeatures = crs
    ? tubes.map((tube) => ({
        type: "Feature", properties: { name: tube.name, status: tube.status, nearCapacity: tube.nearCapacity },
        geometry: { type: "LineString", coordinates: tubeEnds(tube.position!, tube.length, tube.bearingDegrees).map(([x, y]) => crs.toLonLat(x, y)) },
      }))
    : [];
  const zoneFeatures = zones.map((zone, index) => ({ type: "Feature", id: index, properties: { name: zone.name, zone: index, colour: zone.colour }, geometry: JSON.parse(zone.polygonGeoJson) }));
  const textFont = [MAP_FONT];
  return {
    version: 8,
    name: `Firmsand offline map: ${project.name}`,
    metadata: { "firmsand:offline": true },
    sources: {
      "work-limit": { type: "geojson", data: workLimit ? { type: "Feature", properties: {}, geometry: workLimit } : emptyCollection },
      zones: { type: "geojson", data: { type: "FeatureCollection", features: zoneFeatures } },
      shoreline: { type: "geojson", data: shoreline ? JSON.parse(shoreline.geoJson) : emptyCollection },
      ...CELL_SOURCES,
      // The few selected and assigned cells, outlined from sources of their own: an outline layer
      // over all 100,000 cells of a bay (even at width 0) doubled each frame and the tiling work.
      "cells-selected": { type: "geojson", data: emptyCollection },
      "cells-assigned": { type: "geojson", data: emptyCollection },
      // Cells under a stop-work hold: "held", nothing more (no find, no category).
      "cells-held": { type: "geojson", data: emptyCollection },
      bands: { type: "geojson", data: emptyCollection },
      tubes: { type: "geojson", data: { type: "FeatureCollection", features: tubeFeatures } },
      // Monitoring stations and recent wildlife sightings: the page fills them (map-monitoring.server.ts).
      stations: { type: "geojson", data: emptyCollection },
      sightings: { type: "geojson", data: emptyCollection },
    },
    layers: [
      // No background layer: the land is each map's CSS background under its canvas (app.css,
      // LAND_COLOUR). A background layer is a GPU program compiled for the first frame and a pass
      // over every pixel at every frame, which a browser without a GPU pays on the cores that lay
      // the tiles out (the demo's cells reached the screen 0.05–0.09 s sooner without it).
      // The water and held fills: no antialiasing (a line is drawn over each edge) and a colour that
      // shares the cells' program (sharedProgramColour); each program compiled costs the first frame.
      { id: "shoreline-water", type: "fill", source: "shoreline", paint: { "fill-color": sharedProgramColour(WATER_COLOUR), "fill-antialias": false } },
      { id: "shoreline-edge", type: "line", source: "shoreline", paint: { "line-color": "#7d9ba5", "line-width": 1 } },
      { id: "work-limit-water", type: "fill", source: "work-limit", paint: { "fill-color": sharedProgramColour(WATER_COLOUR), "fill-antialias": false } },
      {
        id: "cells-fill", type: "fill", source: "cells",
        // Without antialiasing: adjoining squares need no smoothed edges, and it costs the most per frame.
        paint: { "fill-color": STATUS_COLOURS["no-data"], "fill-opacity": 1, "fill-antialias": false },
      },
      { id: "cells-grid", type: "line", source: "cells", minzoom: 17, paint: { "line-color": "#ffffff", "line-width": 0.5, "line-opacity": 0.6 } },
      { id: "bands-fill", type: "fill", source: "bands", layout: { visibility: "none" }, paint: { "fill-color": "#999999", "fill-opacity": 0.75 } },
      // Each zone in its own colour (shared/zone-colours.ts), dashed over a white casing: the casing
      // keeps the outline readable on every cell colour, from the palest to umber and navy. Where a
      // zone runs along the work limit, its dashes lie on the limit's wider red line, so both show.
      { id: "zones-casing", type: "line", source: "zones", paint: { "line-color": "#ffffff", "line-width": 4.5, "line-opacity": 0.85 } },
      { id: "work-limit-outline", type: "line", source: "work-limit", paint: { "line-color": WORK_LIMIT_COLOUR, "line-width": 3.5 } },
      { id: "zones-outline", type: "line", source: "zones", paint: { "line-color": ["get", "colour"], "line-width": 2, "line-dasharray": [3, 1.5] } },
      // Two layers of one colour each (not one coloured per tube): they share the program of the other lines.
      { id: "tubes", type: "line", source: "tubes", filter: ["!", ["get", "nearCapacity"]], layout: { "line-cap": "round" }, paint: { "line-color": TUBE_COLOURS.normal, "line-width": 7 } },
      { id: "tubes-near-capacity", type: "line", source: "tubes", filter: ["get", "nearCapacity"], layout: { "line-cap": "round" }, paint: { "line-color": TUBE_COLOURS.nearCapacity, "line-width": 7 } },
      {
        id: "tube-labels", type: "symbol", source: "tubes",
        layout: { "text-field": ["get", "name"], "text-font": textFont, "text-size": 12, "symbol-placement": "line-center", "text-allow-overlap": true, "text-ignore-placement": true },
        paint: { "text-color": sharedProgramColour("#2b2416"), "text-halo-color": "#ffffff", "text-halo-width": 2 },
      },
      { id: "cells-held-fill", type: "fill", source: "cells-held", paint: { "fill-color": sharedProgramColour(MARK_STYLES.held.fill), "fill-antialias": false } },
      { id: "cells-held", type: "line", source: "cells-held", paint: { "line-color": MARK_STYLES.held.line, "line-width": 2 } },
      // Planned cells: a hatch over the cell's own colour (the page adds the pattern image) and a
      // solid outline, so they stand out on every status colour and the status still reads.
      { id: "cells-assigned-fill", type: "fill", source: "cells-assigned", paint: { "fill-pattern": PLANNED_PATTERN } },
      { id: "cells-assigned", type: "line", source: "cells-assigned", paint: { "line-color": MARK_STYLES.planned.line, "line-width": 2.5 } },
      { id: "cells-selected", type: "line", source: "cells-selected", paint: { "line-color": MARK_STYLES.selected.line, "line-width": 3 } },
      // Over the cells and their marks: a station or sighting stays visible and clickable on any cell.
      {
        id: "sightings-points", type: "circle", source: "sightings",
        paint: { "circle-radius": 6, "circle-color": ["get", "colour"], "circle-stroke-color": "#1d2528", "circle-stroke-width": 1.5 },
      },
      {
        id: "stations-points", type: "circle", source: "stations",
        paint: { "circle-radius": 7, "circle-color": ["get", "colour"], "circle-stroke-color": "#ffffff", "circle-stroke-width": 2.5 },
      },
      // The chosen station or sighting: a ring in the selection's colour (the page sets the filter).
      ...(["stations", "sightings"] as const).map((source) => ({
        id: `${source}-chosen`, type: "circle", source, filter: ["==", ["get", "key"], ""],
        paint: { "circle-radius": 12, "circle-opacity": 0, "circle-stroke-color": MARK_STYLES.selected.line, "circle-stroke-width": 3 },
      })),
      {
        id: "cell-labels", type: "symbol", source: "cell-label-points", minzoom: 19,
        layout: { "text-field": ["get", "label"], "text-font": textFont, "text-size": 10, "text-allow-overlap": false },
        paint: { "text-color": "#1d2528", "text-halo-color": "#ffffff", "text-halo-width": 1.2 },
      },
      {
        id: "zone-labels", type: "symbol", source: "zones",
        layout: { "text-field": ["get", "name"], "text-font": textFont, "text-size": 13, "text-allow-overlap": true, "text-ignore-placement": true },
        paint: { "text-color": ["get", "colour"], "text-halo-color": "#ffffff", "text-halo-width": 2 },
      },
      {
        id: "stations-labels", type: "symbol", source: "stations",
        layout: { "text-field": ["get", "name"], "text-font": textFont, "text-size": 12, "text-anchor": "left", "text-offset": [1, 0], "text-optional": true },
        paint: { "text-color": sharedProgramColour("#1d2528"), "text-halo-color": "#ffffff", "text-halo-width": 2 },
      },
      {
        id: "sightings-labels", type: "symbol", source: "sightings",
        layout: { "text-field": ["get", "label"], "text-font": textFont, "text-size": 12, "text-anchor": "left", "text-offset": [1, 0], "text-optional": true, "text-max-width": 24 },
        paint: { "text-color": sharedProgramColour("#5a2a00"), "text-halo-color": "#ffffff", "text-halo-width": 2 },
      },
    ],
  };
}
