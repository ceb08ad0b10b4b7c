import { createHash } from "node:crypto";
import { readFileSync, readdirSync } from "node:fs";
import { join } from "node:path";
import * as turf from "@turf/turf";
import type { Feature, MultiPolygon, Polygon } from "geojson";
import { Geodesic, PolygonArea } from "geographiclib-geodesic";
import { describe, expect, it } from "vitest";
import { DEFAULT_OUT_DIR, DEFAULT_SEED, buildDemoSurveys, demoFiles } from "./generate";
import { gridOriginFt, outlineInLonLat } from "./print-geometry";
import { demoProjection } from "./projection";
import { GRID, PROJECT, SURVEYS, WORK_LIMIT, ZONES } from "./scenario";

// NIST: 1 acre = 43,560 ft² (international foot) = 4,046.8564224 m² exactly.
const SQUARE_METRES_PER_ACRE = 4046.8564224;
// NIST, 85 FR 62698 (2020): US survey foot = 1200/3937 m.
const METRES_PER_US_FOOT = 1200 / 3937;

const sha256 = (text: string) => createHash("sha256").update(text).digest("hex");
const demo = buildDemoSurveys(DEFAULT_SEED);
const files = demoFiles(DEFAULT_SEED);
const projection = demoProjection(PROJECT.crs);
const workLimit = turf.polygon(WORK_LIMIT.coordinates);

function parseCsv(text: string): { header: string[]; rows: string[][] } {
  const [headerLine, ...lines] = text.trimEnd().split("\n");
  return { header: headerLine.split(","), rows: lines.map((line) => line.split(",")) };
}

describe("determinism", () => {
  it("gives the same bytes for the same seed and different bytes for another (computed)", () => {
    const again = demoFiles(DEFAULT_SEED);
    expect([...again.keys()]).toEqual([...files.keys()]);
    for (const [name, text] of files) expect(sha256(again.get(name)!), name).toBe(sha256(text));
    const other = demoFiles(DEFAULT_SEED + 1);
    expect(sha256(other.get("baseline-2026-09-08.csv")!)).not.toBe(sha256(files.get("baseline-2026-09-08.csv")!));
  });

  it("matches the committed files in sample-data/demo byte for byte (computed: regenerate with npm run sample-data)", () => {
    const committed = readdirSync(DEFAULT_OUT_DIR).sort();
    expect(committed).toEqual([...files.keys()].sort());
    for (const [name, text] of files) {
      expect(sha256(readFileSync(join(DEFAULT_OUT_DIR, name), "utf8")), name).toBe(sha256(text));
    }
  });
});

describe("scenario geometry", () => {
  it("is the printed outline design and its grid origin (computed)", () => {
    const printed = outlineInLonLat();
    expect(printed.workLimit).toEqual(WORK_LIMIT.coordinates[0]);
    expect(printed.zones.map((zone) => zone.ring)).toEqual(ZONES.map((zone) => zone.polygon.coordinates[0]));
    const origin = gridOriginFt(WORK_LIMIT.coordinates[0]);
    expect(origin).toEqual({ originEastingFt: GRID.originEastingFt, originNorthingFt: GRID.originNorthingFt });
    // The origin is the south-west corner floored to 10 ft, so it lies within 10 ft of every bound.
    const projected = WORK_LIMIT.coordinates[0].map(([lon, lat]) => projection.toProjected(lon, lat));
    const minEasting = Math.min(...projected.map((point) => point[0]));
    const minNorthing = Math.min(...projected.map((point) => point[1]));
    expect(minEasting - GRID.originEastingFt).toBeGreaterThanOrEqual(0);
    expect(minEasting - GRID.originEastingFt).toBeLessThan(10);
    expect(minNorthing - GRID.originNorthingFt).toBeGreaterThanOrEqual(0);
    expect(minNorthing - GRID.originNorthingFt).toBeLessThan(10);
  });

  it("lies inside the area of use of EPSG:2237 (published: EPSG registry bounding box 26.27–29.6 N, 83.34–81.13 W)", () => {
    for (const [lon, lat] of WORK_LIMIT.coordinates[0]) {
      expect(lat).toBeGreaterThan(26.27);
      expect(lat).toBeLessThan(29.6);
      expect(lon).toBeGreaterThan(-83.34);
      expect(lon).toBeLessThan(-81.13);
    }
  });

  it("is a simple counter-clockwise ring of 20–40 vertices (published: RFC 7946 §3.1.6 winding)", () => {
    const ring = WORK_LIMIT.coordinates[0];
    expect(ring[0]).toEqual(ring[ring.length - 1]);
    expect(ring.length - 1).toBeGreaterThanOrEqual(20);
    expect(ring.length - 1).toBeLessThanOrEqual(40);
    expect(turf.booleanClockwise(turf.lineString(ring))).toBe(false);
    expect(turf.kinks(workLimit).features).toHaveLength(0);
    for (const zone of ZONES) {
      expect(turf.booleanClockwise(turf.lineString(zone.polygon.coordinates[0])), zone.name).toBe(false);
      expect(turf.kinks(turf.polygon(zone.polygon.coordinates)).features, zone.name).toHaveLength(0);
    }
  });

  it("covers about 2 acres (computed: NIST acre; reference library geographiclib within 0.5 %)", () => {
    const areaM2 = turf.area(workLimit);
    const acres = areaM2 / SQUARE_METRES_PER_ACRE;
    expect(acres).toBeGreaterThan(1.8);
    expect(acres).toBeLessThan(2.3);
    const polygon = new PolygonArea.PolygonArea(Geodesic.WGS84, false);
    for (const [lon, lat] of WORK_LIMIT.coordinates[0].slice(0, -1)) polygon.AddPoint(lat, lon);
    const geodesicAreaM2 = Math.abs(polygon.Compute(false, true).area!);
    expect(Math.abs(areaM2 - geodesicAreaM2) / geodesicAreaM2).toBeLessThan(0.005);
  });

  it("has zones that tile the work limit: union within 0.5 % of its area, overlaps only slivers (computed)", () => {
    const zones = ZONES.map((zone) => turf.polygon(zone.polygon.coordinates, { name: zone.name }));
    const union = turf.union(turf.featureCollection(zones)) as Feature<Polygon | MultiPolygon>;
    const limitAreaM2 = turf.area(workLimit);
    expect(Math.abs(turf.area(union) - limitAreaM2) / limitAreaM2).toBeLessThan(0.005);
    const summedAreaM2 = zones.reduce((sum, zone) => sum + turf.area(zone), 0);
    expect(Math.abs(summedAreaM2 - limitAreaM2) / limitAreaM2).toBeLessThan(0.005);
    for (let first = 0; first < zones.length; first++) {
      for (let second = first + 1; second < zones.length; second++) {
        const overlap = turf.intersect(turf.featureCollection([zones[first], zones[second]]));
        // A sliver: under 1 ft² (0.093 m²) of shared area along a cut.
        expect(overlap ? turf.area(overlap) : 0).toBeLessThan(0.1);
      }
    }
  });
});

describe("sounding files", () => {
  it("keep every sounding inside the work limit except the three documented ones in progress 2 (computed)", () => {
    const outside: string[] = [];
    for (const { survey, soundings } of demo.surveys) {
      const zones = ZONES.filter((zone) => survey.zones.includes(zone.name)).map((zone) =>
        turf.polygon(zone.polygon.coordinates),
      );
      for (let index = 0; index < soundings.pointIds.length; index++) {
        const [lon, lat] = projection.toLonLat(soundings.easting[index], soundings.northing[index]);
        const point = turf.point([lon, lat]);
        if (!turf.booleanPointInPolygon(point, workLimit)) {
          outside.push(soundings.pointIds[index]);
          // "Just outside": within 15 ft of the limit's edge.
          const distanceM = turf.pointToLineDistance(point, turf.polygonToLine(workLimit) as Feature<never>, {
            units: "meters",
          });
          expect(distanceM / METRES_PER_US_FOOT).toBeLessThan(15);
          continue;
        }
        // A pass sounds only the zones it covered.
        expect(zones.some((zone) => turf.booleanPointInPolygon(point, zone)), soundings.pointIds[index]).toBe(true);
      }
    }
    expect(outside).toHaveLength(3);
    expect(outside.every((id) => id.startsWith("P2-"))).toBe(true);
    expect(outside).toEqual(demo.outsidePointIds);
    const manifest = JSON.parse(files.get("manifest.json")!) as { outsidePointIds: string[] };
    expect(manifest.outsidePointIds).toEqual(outside);
  });

  it("have the documented columns, two decimals and local times with the right offset (published: tz database, America/New_York)", () => {
    for (const survey of SURVEYS) {
      const text = files.get(survey.fileName)!;
      expect(Buffer.byteLength(text)).toBeLessThan(1.5e6);
      const { header, rows } = parseCsv(text);
      expect(header).toEqual(
        survey.kind === "baseline"
          ? ["point_id", "easting", "northing", "depth", "probe", "time"]
          : ["point_id", "easting", "northing", "depth", "time"],
      );
      const offset = new Intl.DateTimeFormat("en-US", { timeZone: PROJECT.timeZone, timeZoneName: "longOffset" })
        .formatToParts(new Date(`${survey.surveyedOn}T12:00:00Z`))
        .find((part) => part.type === "timeZoneName")!.value;
      expect(offset).toBe(`GMT${survey.utcOffset}`);
      let previous = -Infinity;
      for (const row of rows) {
        expect(row).toHaveLength(header.length);
        for (const value of row.slice(1, -1)) expect(value).toMatch(/^\d+\.\d{2}$/);
        const time = row[row.length - 1];
        expect(time.startsWith(`${survey.surveyedOn}T`)).toBe(true);
        expect(time.endsWith(survey.utcOffset)).toBe(true);
        const instant = Date.parse(time);
        expect(instant).toBeGreaterThanOrEqual(previous);
        previous = instant;
      }
    }
  });

  it("give a baseline of 8,000–15,000 rod-and-probe soundings with probe at or below depth (practice: refusal lies under the muck)", () => {
    const { rows } = parseCsv(files.get("baseline-2026-09-08.csv")!);
    expect(rows.length).toBeGreaterThanOrEqual(8000);
    expect(rows.length).toBeLessThanOrEqual(15000);
    for (const row of rows) {
      const depth = Number(row[3]);
      const probe = Number(row[4]);
      expect(probe, row[0]).toBeGreaterThanOrEqual(depth);
      // Muck 0.5–4 ft thick, each reading within ±0.1 ft (the scenario's design).
      expect(probe - depth).toBeGreaterThanOrEqual(0.3 - 1e-9);
      expect(probe - depth).toBeLessThanOrEqual(4.2 + 1e-9);
    }
  });

  it("tell the removal story: closeout within tolerance of firm sand, progress 3 partly untouched (computed from the synthetic truth)", () => {
    const remainingFt = (key: string) => {
      const { survey, soundings } = demo.surveys.find((entry) => entry.survey.key === key)!;
      return Array.from(soundings.depthFt, (depth, index) => {
        const easting = soundings.easting[index];
        const northing = soundings.northing[index];
        const remaining = survey.waterSurfaceElevationFt - depth - demo.firmElevationFt(easting, northing);
        return { remaining, baseline: demo.baselineMuckThicknessFt(easting, northing) };
      });
    };
    for (const { remaining } of remainingFt("closeout")) expect(remaining).toBeLessThanOrEqual(GRID.toleranceFt);
    const lowerRun = remainingFt("progress-3");
    const untouched = lowerRun.filter((point) => point.remaining > point.baseline - 0.15).length;
    const done = lowerRun.filter((point) => point.remaining <= GRID.toleranceFt).length;
    expect(untouched / lowerRun.length).toBeGreaterThan(0.15);
    expect(done / lowerRun.length).toBeGreaterThan(0.15);
    const ventBasin = remainingFt("progress-1");
    const atFirm = ventBasin.filter((point) => point.remaining <= GRID.toleranceFt).length;
    expect(atFirm / ventBasin.length).toBeGreaterThan(0.6);
    expect(atFirm / ventBasin.length).toBeLessThan(0.95);
  });
});
