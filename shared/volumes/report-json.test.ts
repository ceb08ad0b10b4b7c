import { describe, expect, it } from "vitest";
import { computeSurveyVolumes, type EngineSettings } from "../pipeline";
import { volumeReport, volumeReportJson, writeVolumeReportJson } from "./report";

// computed: the report written straight from the engine's arrays must be JSON.stringify of the
// object report, character for character (cells without data give null, cells outside the limit
// are left out, negative rows and columns are labelled as cellLabel labels them).

function survey(count: number, seed: number, depthAt: (x: number, y: number) => number, gapX?: [number, number]) {
  let state = seed;
  const random = () => ((state = (Math.imul(state, 1664525) + 1013904223) >>> 0) / 2 ** 32);
  const easting: number[] = [];
  const northing: number[] = [];
  const elevation: number[] = [];
  while (easting.length < count) {
    const x = random() * 200 - 40;
    const y = random() * 120 - 30;
    if (gapX && x > gapX[0] && x < gapX[1]) continue; // an unsurveyed strip: cells without data
    easting.push(x);
    northing.push(y);
    elevation.push(-depthAt(x, y));
  }
  return { easting: Float64Array.from(easting), northing: Float64Array.from(northing), elevation: Float64Array.from(elevation) };
}

describe("volumeReportJson", () => {
  for (const [unit, rotationDegrees] of [["us-ft", 0], ["m", 17]] as const) {
    it(`is JSON.stringify(volumeReport) exactly (${unit}, grid turned ${rotationDegrees}°)`, () => {
      const baseline = survey(3000, 7, (x, y) => 4 + 0.01 * x + 0.002 * y * y / 10, [40, 70]);
      const firm = { ...baseline, elevation: baseline.elevation.map((value, index) => value - 2 - 0.01 * baseline.northing[index]) };
      const after = survey(2500, 11, (x, y) => 4.8 + 0.01 * x + 0.002 * y * y / 10 - (x > 100 ? 1 : 0));
      const settings: EngineSettings = { cellSize: 10, resolution: 1, maxEdge: 25, tolerance: 0.25, firmShare: 0.95, minCoverage: 0.8, surveyNoise: 0.25, originX: 0, originY: 0, rotationDegrees };
      const result = computeSurveyVolumes({ baseline, progress: [after], firm }, null, settings);
      const expected = JSON.stringify(volumeReport(result, unit));
      expect(expected).toContain('"meanRemainingThickness":null');
      expect(expected).toMatch(/"label":"-/); // cells west or south of the origin
      expect(volumeReportJson(result, unit)).toBe(expected);
      const pieces: string[] = [];
      writeVolumeReportJson(result, unit, (piece) => pieces.push(piece));
      expect(pieces.join("")).toBe(expected);
    });
  }
});
