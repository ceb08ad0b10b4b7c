import { readFileSync } from "node:fs";
import { createRequire } from "node:module";
import proj4 from "proj4";

/**
 * Projected ↔ lon/lat converter for the demo's CRS, from the proj4 definition that the
 * maintained EPSG index on npm (epsg-index) carries, never typed by hand.
 */
export interface DemoProjection {
  toProjected(lon: number, lat: number): [number, number];
  toLonLat(easting: number, northing: number): [number, number];
}

const require = createRequire(import.meta.url);

export function epsgProj4Definition(crs: string): string {
  const code = /^EPSG:(\d+)$/i.exec(crs)?.[1];
  if (!code) throw new Error(`Not an EPSG code: ${crs}`);
  const file = require.resolve(`epsg-index/s/${code}.json`);
  const entry = JSON.parse(readFileSync(file, "utf8")) as { proj4?: string };
  if (!entry.proj4) throw new Error(`epsg-index has no proj4 definition for ${crs}`);
  return entry.proj4;
}

export function demoProjection(crs: string): DemoProjection {
  const converter = proj4("+proj=longlat +datum=WGS84 +no_defs", epsgProj4Definition(crs));
  return {
    toProjected(lon, lat) {
      const [easting, northing] = converter.forward([lon, lat]);
      return [easting, northing];
    },
    toLonLat(easting, northing) {
      const [lon, lat] = converter.inverse([easting, northing]);
      return [lon, lat];
    },
  };
}
