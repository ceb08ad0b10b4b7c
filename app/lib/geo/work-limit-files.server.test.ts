import shpwrite from "@mapbox/shp-write";
import { Geodesic } from "geographiclib-geodesic";
import { describe, expect, it } from "vitest";
import { createCrs } from "../../../shared/crs";
import { parseWorkLimitGeoJson } from "../../../shared/grid/work-limit-geojson";
import { ValidationError } from "~/lib/errors";
import { resolveCrsDefinition } from "./epsg.server";
import { readWorkLimitFile } from "./work-limit-files.server";

// Every form a work limit may come in gives the same outline and area: a fictional lagoon outline
// with a hole (an island), written as GeoJSON (projected and lon/lat), KML, a zipped shapefile
// with its .prj, DXF closed polylines and a CSV of vertices, all read into the one GeoJSON check.
// The area is checked against geographiclib-geodesic (Karney's ellipsoidal polygon area, the
// reference library) to 0.1 %, the tolerance the project-setup issue sets.

const crs = createCrs(resolveCrsDefinition("EPSG:32617").definition); // WGS 84 / UTM zone 17N, metres
// ESRI WKT of EPSG:32617 as GIS software writes it into a .prj (published parameters, EPSG registry).
const UTM_17N_PRJ =
  'PROJCS["WGS_1984_UTM_Zone_17N",GEOGCS["GCS_WGS_1984",DATUM["D_WGS_1984",SPHEROID["WGS_1984",6378137.0,298.257223563]],PRIMEM["Greenwich",0.0],UNIT["Degree",0.0174532925199433]],PROJECTION["Transverse_Mercator"],PARAMETER["False_Easting",500000.0],PARAMETER["False_Northing",0.0],PARAMETER["Central_Meridian",-81.0],PARAMETER["Scale_Factor",0.9996],PARAMETER["Latitude_Of_Origin",0.0],UNIT["Meter",1.0]]';

type Position = [number, number];
// An irregular outline of about 24 ha and a 60 × 40 m island, in UTM metres (counter-clockwise outline).
const OUTLINE: Position[] = [[402_000, 3_201_000], [402_600, 3_200_950], [402_700, 3_201_300], [402_450, 3_201_500], [402_050, 3_201_420], [402_000, 3_201_000]];
const ISLAND: Position[] = [[402_300, 3_201_200], [402_300, 3_201_240], [402_360, 3_201_240], [402_360, 3_201_200], [402_300, 3_201_200]];
const lonLat = (ring: Position[]) => ring.map(([x, y]) => crs.toLonLat(x, y) as Position);

function geodesicAreaM2(ring: Position[]): number {
  const polygon = Geodesic.WGS84.Polygon(false);
  for (const [lon, lat] of ring.slice(0, -1)) polygon.AddPoint(lat, lon);
  return Math.abs(polygon.Compute(false, true).area ?? Number.NaN);
}
const REFERENCE_M2 = geodesicAreaM2(lonLat(OUTLINE)) - geodesicAreaM2(lonLat(ISLAND));

const bytes = (text: string) => new TextEncoder().encode(text);
const kmlRing = (ring: Position[]) => lonLat(ring).map(([lon, lat]) => `${lon},${lat},0`).join(" ");
const dxfPolyline = (ring: Position[], closedFlag: boolean) =>
  ["0", "LWPOLYLINE", "8", "LIMIT", "90", String(ring.length - 1), "70", closedFlag ? "1" : "0", ...ring.slice(0, -1).flatMap(([x, y]) => ["10", String(x), "20", String(y)])].join("\n");
const dxf = (...entities: string[]) => ["0", "SECTION", "2", "ENTITIES", ...entities, "0", "ENDSEC", "0", "EOF"].join("\n");

async function files(): Promise<Array<[string, string, Uint8Array]>> {
  const projected = { type: "Polygon", coordinates: [OUTLINE, ISLAND] };
  const shapefile = await shpwrite.zip(
    { type: "FeatureCollection", features: [{ type: "Feature", properties: { name: "limit" }, geometry: projected }] } as never,
    { outputType: "nodebuffer", compression: "STORE", prj: UTM_17N_PRJ, types: { polygon: "limit" } } as never,
  ) as unknown as Buffer;
  return [
    ["GeoJSON", "limit.geojson", bytes(JSON.stringify({ type: "Feature", properties: {}, geometry: projected }))],
    ["GeoJSON", "limit-lonlat.json", bytes(JSON.stringify({ type: "Polygon", coordinates: [lonLat(OUTLINE), lonLat(ISLAND)] }))],
    ["KML", "limit.kml", bytes(`<?xml version="1.0" encoding="UTF-8"?><kml xmlns="http://www.opengis.net/kml/2.2"><Document><Placemark><name>Pin</name><Point><coordinates>-81.9,28.9,0</coordinates></Point></Placemark><Placemark><name>Work limit</name><Polygon><outerBoundaryIs><LinearRing><coordinates>${kmlRing(OUTLINE)}</coordinates></LinearRing></outerBoundaryIs><innerBoundaryIs><LinearRing><coordinates>${kmlRing(ISLAND)}</coordinates></LinearRing></innerBoundaryIs></Polygon></Placemark></Document></kml>`)],
    ["zipped shapefile", "limit.zip", new Uint8Array(shapefile)],
    ["DXF", "limit.dxf", bytes(dxf(dxfPolyline(ISLAND, true), dxfPolyline(OUTLINE, true), dxfPolyline([[0, 0], [1, 1], [0, 0]], false)))],
    ["CSV", "limit.csv", bytes(["polygon,ring,Easting (m),Northing (m)", ...OUTLINE.slice(0, -1).map(([x, y]) => `1,1,${x},${y}`), ...ISLAND.slice(0, -1).map(([x, y]) => `1,2,${x},${y}`)].join("\n"))],
  ];
}

describe("work-limit files", () => {
  it("read in each format to the same area, within 0.1 % of geographiclib-geodesic", async () => {
    expect(REFERENCE_M2).toBeGreaterThan(200_000);
    for (const [format, name, content] of await files()) {
      const file = await readWorkLimitFile(name, content);
      expect(file.format, name).toBe(format);
      const parsed = parseWorkLimitGeoJson(file.geoJson, crs);
      if (!parsed.ok) throw new Error(`${name}: ${JSON.stringify(parsed.problems)}`);
      expect(Math.abs(parsed.area / REFERENCE_M2 - 1), name).toBeLessThan(0.001);
      expect(parsed.projected[0].length, `${name} keeps the island as a hole`).toBe(2);
    }
  });

  it("says what it left out and how it read the rings", async () => {
    const all = await files();
    const kml = await readWorkLimitFile("limit.kml", all.find(([, name]) => name === "limit.kml")![2]);
    expect(kml.note).toBe("1 point or line feature beside the polygons left out.");
    const drawing = await readWorkLimitFile("limit.dxf", all.find(([, name]) => name === "limit.dxf")![2]);
    expect(drawing.note).toContain("2 closed polylines read as 1 outline with 1 hole (a polyline inside another); 1 open polyline left out");
  });

  const refusal = async (name: string, text: string | Uint8Array) => {
    try {
      await readWorkLimitFile(name, typeof text === "string" ? bytes(text) : text);
    } catch (error) {
      expect(error).toBeInstanceOf(ValidationError);
      return (error as ValidationError).details[0];
    }
    throw new Error(`${name} was read`);
  };

  it("refuses what it cannot read, naming the file and, where it can, the row", async () => {
    expect(await refusal("empty.geojson", "")).toMatchObject({ field: "workLimit", message: "empty.geojson is empty (0 bytes)." });
    expect((await refusal("bad.geojson", "{ not json")).message).toBe("bad.geojson is not a GeoJSON file (it does not read as JSON).");
    expect((await refusal("pins.kml", '<kml xmlns="http://www.opengis.net/kml/2.2"><Placemark><Point><coordinates>-81,28</coordinates></Point></Placemark></kml>')).message).toMatch(/^pins\.kml holds no polygon \(1 placemarks that are points or lines\)/);
    expect((await refusal("open.dxf", dxf(dxfPolyline(OUTLINE, false)))).message).toMatch(/^open\.dxf has no closed polyline \(1 polylines, none with its closed flag/);
    expect((await refusal("limit.csv", "Easting,Northing\n402000,3201000\n402600,abc\n")).message).toBe('limit.csv row 3: northing "abc" is not a number.');
    expect((await refusal("limit.csv", "a,b\n1,2\n")).message).toMatch(/needs a header row naming the x and y columns/);
    expect((await refusal("broken.zip", new Uint8Array([0x50, 0x4b, 3, 4, 0, 0]))).message).toMatch(/^broken\.zip is not a zipped shapefile Firmsand can read/);
    expect((await refusal("limit.pdf", "%PDF-1.7")).message).toMatch(/is not a form Firmsand reads for a work limit/);
  });
});
