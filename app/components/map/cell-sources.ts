/**
 * The cell sources of the map's offline style (built by app/models/map-style.server.ts, filled by
 * the page). Kept here, browser-safe, so their tiling can be tested without a database.
 */
const emptyCollection = { type: "FeatureCollection", features: [] } as const;

export const CELL_SOURCES = {
  // A small tile buffer (in pixels of a 512 px tile): MapLibre cuts each cell at the tile edges,
  // and with no buffer the cut lies on the tile edge itself, where the grid-line layer drew it as
  // a line through the middle of a column. A few pixels put the cut outside what the tile shows.
  cells: { type: "geojson", data: emptyCollection, buffer: 4 },
  // One point per cell for its label (buildCellLabelPoints): a point falls in one tile, so each
  // label is placed once.
  "cell-label-points": { type: "geojson", data: emptyCollection },
} as const;

/** MapLibre's tile extent and tile size for GeoJSON sources: a buffer of 1 px is EXTENT / TILE_SIZE units. */
export const TILE_EXTENT = 8192;
export const TILE_SIZE = 512;
