import { WORK_LIMIT } from "../../sample-data/scenario";

/**
 * The shoreline the map test uploads to the demo project and removes again: the work limit's
 * bounding box grown by 0.001° (about 100 m). Browser test files run side by side, so a test that
 * reads the demo's public page meanwhile may see it there (a shoreline is public geography).
 */
export function demoShoreline(): { type: "Polygon"; coordinates: Array<Array<[number, number]>> } {
  const vertices = WORK_LIMIT.coordinates.flat();
  const lons = vertices.map(([lon]) => lon);
  const lats = vertices.map(([, lat]) => lat);
  const [west, east, south, north] = [Math.min(...lons) - 0.001, Math.max(...lons) + 0.001, Math.min(...lats) - 0.001, Math.max(...lats) + 0.001];
  return { type: "Polygon", coordinates: [[[west, south], [east, south], [east, north], [west, north], [west, south]]] };
}
