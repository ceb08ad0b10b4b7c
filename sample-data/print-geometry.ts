/**
 * Prints the work limit and zones of outline.ts as lon/lat literals for scenario.ts
 * (`npx tsx sample-data/print-geometry.ts`). Run it only when the outline's design changes.
 */
import { designOutline } from "./outline";
import { demoProjection } from "./projection";
import { VENT_LON_LAT, PROJECT, ZONE_NAMES, type LonLat } from "./scenario";

const LON_LAT_DECIMALS = 7; // about 1 cm at this latitude

export function outlineInLonLat() {
  const projection = demoProjection(PROJECT.crs);
  const [ventEasting, ventNorthing] = projection.toProjected(VENT_LON_LAT[0], VENT_LON_LAT[1]);
  const toLonLat = (ring: [number, number][]): LonLat[] =>
    ring.map(([x, y]) =>
      projection
        .toLonLat(ventEasting + x, ventNorthing + y)
        .map((value) => Number(value.toFixed(LON_LAT_DECIMALS))) as [number, number],
    );
  const design = designOutline(ZONE_NAMES);
  return {
    workLimit: toLonLat(design.workLimit),
    zones: design.zones.map((zone) => ({ name: zone.name, ring: toLonLat(zone.ring) })),
  };
}

/** The grid origin: the work limit's projected bounding box's south-west corner, floored to 10 ft. */
export function gridOriginFt(workLimit: LonLat[]): { originEastingFt: number; originNorthingFt: number } {
  const projection = demoProjection(PROJECT.crs);
  let minEasting = Infinity;
  let minNorthing = Infinity;
  for (const [lon, lat] of workLimit) {
    const [easting, northing] = projection.toProjected(lon, lat);
    minEasting = Math.min(minEasting, easting);
    minNorthing = Math.min(minNorthing, northing);
  }
  return {
    originEastingFt: Math.floor(minEasting / 10) * 10,
    originNorthingFt: Math.floor(minNorthing / 10) * 10,
  };
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const { workLimit, zones } = outlineInLonLat();
  const format = (ring: LonLat[], indent: string) =>
    "[\n" + ring.map(([lon, lat]) => `${indent}  [${lon}, ${lat}],`).join("\n") + `\n${indent}]`;
  console.log(`/** Work limit: GeoJSON Polygon (lon/lat, exterior ring counter-clockwise per RFC 7946). */`);
  console.log(`export const WORK_LIMIT: { type: "Polygon"; coordinates: LonLat[][] } = {`);
  console.log(`  type: "Polygon",\n  coordinates: [${format(workLimit, "    ")}],\n};\n`);
  console.log(`/** Zones that tile the work limit (shared vertices along the cuts across the run). */`);
  console.log(`export const ZONES: { name: ZoneName; polygon: { type: "Polygon"; coordinates: LonLat[][] } }[] = [`);
  for (const zone of zones) {
    console.log(`  {\n    name: ${JSON.stringify(zone.name)},`);
    console.log(`    polygon: {\n      type: "Polygon",\n      coordinates: [${format(zone.ring, "        ")}],\n    },\n  },`);
  }
  console.log(`];\n`);
  const origin = gridOriginFt(workLimit);
  console.log(`// grid origin: ${origin.originEastingFt}, ${origin.originNorthingFt}`);
}
