import { describe, expect, it } from "vitest";
import { createCrs } from "../crs";
import type { ProjectedMultiPolygon } from "../grid/work-limit";
import { guessColumns } from "./column-guess";
import { binKey } from "./depth-unit-mistakes";
import { parseSoundingsCsv } from "./parse-csv";
import { plotOf, prepareSoundings, type EarlierSurveys, type PrepareOptions, type SoundingGeometry } from "./prepare";
import { sniffFileShape } from "./sniff";

// Hand-written files against a 100 × 100 square work limit; each expected figure is worked out
// in the comment beside it (closed form) or follows from the file as written.
const E0 = 500_000;
const N0 = 3_000_000;
const square: ProjectedMultiPolygon = [[[[E0, N0], [E0 + 100, N0], [E0 + 100, N0 + 100], [E0, N0 + 100], [E0, N0]]]];
const crs = createCrs("+proj=utm +zone=17 +datum=WGS84 +units=m +no_defs");

function geometryIn(lengthUnit: SoundingGeometry["lengthUnit"]): SoundingGeometry {
  return { crsCode: "EPSG:32617", crs, lengthUnit, workLimit: square, settings: { cellSize: 10, originX: E0, originY: N0, rotationDegrees: 0 } };
}

const noEarlier: EarlierSurveys = { sameFile: [], bottomBins: new Map() };

function prepare(text: string, extra: Partial<PrepareOptions> = {}, geometry = geometryIn("m"), earlier = noEarlier) {
  const shape = sniffFileShape(text);
  const mapping = guessColumns(shape.headers).mapping;
  const options: PrepareOptions = {
    kind: "progress", crs: "EPSG:32617", lengthUnit: geometry.lengthUnit, fileHasElevations: false, waterSurfaceElevation: 10, surveyOrder: "1a",
    choices: { excludeRows: [], excludeErrorRows: false, acceptSameFile: false },
    shape, mapping, lonLatHeaders: false, declaredCrs: crs,
    ...extra,
  };
  return prepareSoundings(parseSoundingsCsv(text, { columns: mapping }), options, geometry, earlier);
}

const at = (east: number, north: number) => `${E0 + east},${N0 + north}`;

describe("prepareSoundings", () => {
  it("stores elevation = water surface − depth and refusal = water surface − probe, in the project's CRS unchanged", () => {
    const { preview, prepared } = prepare(`x,y,depth,probe\n${at(5, 5)},3,5\n${at(15, 5)},4.5,6\n`);
    expect(preview.blockers).toEqual([]);
    expect(preview.storedCount).toBe(2);
    expect(Array.from(prepared!.elevation)).toEqual([7, 5.5]); // closed form: 10 − 3, 10 − 4.5
    expect(Array.from(prepared!.refusalElevation!)).toEqual([5, 4]); // closed form: 10 − 5, 10 − 6
    expect(Array.from(prepared!.easting)).toEqual([E0 + 5, E0 + 15]); // same CRS: coordinates as written
    expect(Array.from(prepared!.sourceRow)).toEqual([2, 3]); // spreadsheet rows (header = row 1)
  });

  it("converts depths from the file's feet into the project's metres before the elevation", () => {
    const { preview, prepared } = prepare(`x,y,depth\n${at(5, 5)},10\n`, { lengthUnit: "ft" });
    // published: 1 ft = 0.3048 m exactly (NIST SP 811), so 10 ft = 3.048 m and elevation = 10 − 3.048.
    expect(prepared!.depth[0]).toBeCloseTo(3.048, 12);
    expect(prepared!.elevation[0]).toBeCloseTo(6.952, 12);
    expect(preview.warnings).toContain("Depths are converted from international feet to the project's metres.");
  });

  it("takes a file of elevations without a water surface, refusal from each row's own surface", () => {
    const { preview, prepared } = prepare(`x,y,depth,probe,elevation\n${at(5, 5)},3,5,-10\n`, { fileHasElevations: true, waterSurfaceElevation: null });
    expect(preview.fileProblems).toEqual([]);
    expect(prepared!.elevation[0]).toBe(-10);
    expect(prepared!.refusalElevation![0]).toBe(-12); // closed form: −10 − (5 − 3)
  });

  it("a row with neither a usable depth nor an elevation is a problem and is never stored", () => {
    // The file gives only elevations, but the upload says it does not: no row has a bottom.
    const { preview } = prepare(`x,y,elevation\n${at(5, 5)},-10\n${at(15, 5)},-11\n`);
    expect(preview.problems.map((problem) => [problem.row, problem.rule])).toEqual([[2, "required"], [3, "required"]]);
    expect(preview.storedCount).toBe(0);
    expect(preview.blockers).toContain("No soundings would be stored.");
  });

  it("counts an exact repeat, blocks on it, and stores one row fewer once it is left out", () => {
    const text = `x,y,depth\n${at(5, 5)},3\n${at(15, 5)},4\n${at(5, 5)},3\n`;
    const flagged = prepare(text);
    expect(flagged.preview.duplicates).toBe(1);
    expect(flagged.preview.problems).toEqual([expect.objectContaining({ row: 4, rule: "duplicate row" })]);
    expect(flagged.preview.blockers).toContain("1 row has problems: fix the file, or leave those rows out.");
    const left = prepare(text, { choices: { excludeRows: [4], excludeErrorRows: false, acceptSameFile: false } });
    expect(left.preview.blockers).toEqual([]);
    expect(Array.from(left.prepared!.sourceRow)).toEqual([2, 3]); // 3 rows − 1 left out
  });

  it("finds the sounding outside the work limit, asks, then keeps or drops it", () => {
    const text = `x,y,depth\n${at(5, 5)},3\n${at(150, 5)},4\n${at(95, 95)},5\n`;
    const asked = prepare(text);
    expect(asked.preview.outside).toEqual({ count: 1, rows: [3], points: [[E0 + 150, N0 + 5]] });
    expect(asked.preview.blockers).toContain("1 sounding lies outside the work limit: choose to keep or drop them.");
    const choices = { excludeRows: [], excludeErrorRows: false, acceptSameFile: false };
    expect(prepare(text, { choices: { ...choices, outside: "keep" } }).prepared!.sourceRow.length).toBe(3);
    const dropped = prepare(text, { choices: { ...choices, outside: "drop" } });
    expect(Array.from(dropped.prepared!.sourceRow)).toEqual([2, 4]);
    expect(Array.from(dropped.prepared!.depth)).toEqual([3, 5]);
  });

  it("blocks a file imported before until confirmed", () => {
    const earlier: EarlierSurveys = { sameFile: [{ surveyId: 7, surveyedOn: "2026-05-01", kind: "progress", status: "active" }], bottomBins: new Map() };
    const text = `x,y,depth\n${at(5, 5)},3\n`;
    expect(prepare(text, {}, geometryIn("m"), earlier).preview.blockers).toEqual(["This same file was imported before (survey #7): confirm that it should be imported again."]);
    expect(prepare(text, { choices: { excludeRows: [], excludeErrorRows: false, acceptSameFile: true } }, geometryIn("m"), earlier).preview.blockers).toEqual([]);
  });

  it("says depths in metres declared as feet look like metres against the earlier bottom", () => {
    // Earlier surveys put the bottom at 10 − 10 = 0 ft in six cells, so the depth there is 10 ft;
    // the file writes 3.048 there: 10 ft in metres (published: 1 ft = 0.3048 m, NIST SP 811).
    const cells = [5, 15, 25, 35, 45, 55];
    const bottomBins = new Map(cells.map((east) => [binKey(E0 + east, N0 + 5, 10, E0, N0), 0]));
    const text = `x,y,depth\n${cells.map((east) => `${at(east, 5)},3.048`).join("\n")}\n`;
    const { preview } = prepare(text, {}, geometryIn("ft"), { sameFile: [], bottomBins });
    expect(preview.depthUnit).toMatchObject({ kind: "metres-as-feet", cellsCompared: 6 });
    expect(preview.depthUnit!.typicalRatio).toBeCloseTo(0.3048, 12); // closed form: 3.048 / 10
    expect(preview.blockers).toContain("The depths may be in another unit than declared (see the note on depth units): fix the unit and check again, or confirm that they are right.");
    // Negative control: the same cells sounded at 9 ft (a little fill) say nothing.
    const right = prepare(text.replaceAll(",3.048", ",9"), {}, geometryIn("ft"), { sameFile: [], bottomBins });
    expect(right.preview.depthUnit).toBeNull();
  });

  it("an unreadable declared CRS is a problem with the file: nothing is prepared", () => {
    const { preview, prepared } = prepare(`x,y,depth\n${at(5, 5)},3\n`, { crs: "EPSG:1", declaredCrs: { problem: "EPSG:1 is not known" } });
    expect(preview.fileProblems).toEqual(["EPSG:1 is not known"]);
    expect(preview.blockers).toEqual(["Fix the problems with the file as a whole first (see above)."]);
    expect(prepared).toBeNull();
    expect(preview.qa).toBeNull();
  });

  it("a row in degrees among projected coordinates is named as longitude/latitude, not as far away", () => {
    const { preview } = prepare(`x,y,depth\n${at(5, 5)},3\n-82.1754037,28.9549377,4\n${at(15, 5)},3\n`);
    expect(preview.problems).toEqual([expect.objectContaining({ row: 3, column: "x", rule: "coordinate system" })]);
    expect(preview.problems[0].message).toMatch(/^row 3 looks like longitude\/latitude \(-82\.1754037, 28\.9549377\), not project metres \(EPSG:32617\)/);
  });

  it("a header-only file is an error state, not a file whose every row passes", () => {
    const { preview, prepared } = prepare("x,y,depth\n");
    expect(preview.rowsChecked).toBe(false);
    expect(preview.validRowCount).toBe(0);
    expect(preview.fileProblems).toEqual(["The file has a header (x, y, depth) but no rows of soundings. Export the soundings again and choose the new file."]);
    expect(prepared).toBeNull();
  });

  it("a file that is not text says only that", () => {
    const { preview } = prepare("", { notText: "The file you chose, a.png, looks like a PNG image, not a CSV text file of soundings." });
    expect(preview.fileProblems).toEqual(["The file you chose, a.png, looks like a PNG image, not a CSV text file of soundings."]);
    expect(preview.shape.headers).toEqual([]);
    expect(preview.rowsChecked).toBe(false);
  });

  it("names a delimiter other than the comma, and a depth header whose unit disagrees", () => {
    const semicolons = prepare(`x;y;depth_ft\n${at(5, 5).replace(",", ";")};3\n`);
    expect(semicolons.preview.warnings).toContain("This file separates columns with semicolons (;); it was read that way.");
    // The project is in metres and so is the declared unit; the header says feet.
    expect(semicolons.preview.depthUnit?.message).toBe('The column "depth_ft" says international feet, but the file\'s depths were declared as metres (the project\'s unit). Choose international feet as the unit of depths in the file and upload again, or confirm that the values are metres whatever the header says.');
    expect(semicolons.preview.blockers).toContain("The depths may be in another unit than declared (see the note on depth units): fix the unit and check again, or confirm that they are right.");
  });
});

describe("plotOf", () => {
  it("frames the work limit with a tenth of its size around it, however far one point lies", () => {
    // closed form: the square is 100 wide, so the frame runs 10 beyond it on each side.
    const plot = plotOf([[E0 + 50, N0 + 50], [E0 + 1_000_000, N0 + 50]], square);
    expect(plot.bounds).toEqual({ minX: E0 - 10, minY: N0 - 10, maxX: E0 + 110, maxY: N0 + 110 });
  });

  it("without a work limit, frames the middle of the points", () => {
    const points = Array.from({ length: 200 }, (_, index) => [index, index] as [number, number]);
    points.push([1e7, 1e7]);
    const plot = plotOf(points, null);
    expect(plot.bounds.maxX).toBeLessThan(300); // the 99th percentile (199) plus a tenth of the span, not 10,000,000
  });
});
