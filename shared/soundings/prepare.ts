import type { Crs } from "../crs";
import { workLimitBounds, type ProjectedMultiPolygon } from "../grid/work-limit";
import type { EngineSettings } from "../pipeline";
import { prepareWorkLimit, soundingsOutsideWorkLimit } from "../qa/outside";
import { surveyQa, type SurveyQa } from "../qa/survey-qa";
import type { SurveyOrder } from "../qa/tvu";
import { convertLength, unitLabel, type LengthUnit } from "../units";
import type { ColumnMappingChoice } from "./column-guess";
import { findCoordinateMistake } from "./coordinate-mistakes";
import { binMedians, findDepthUnitMistake, type DepthUnitMistake } from "./depth-unit-mistakes";
import { soundingElevations } from "./elevations";
import type { ParsedSoundings, SoundingField } from "./parse-csv";
import { checkPlausibleRanges, checkRows, plausibleProjectBounds, ruleOf, type LonLatBounds, type RowProblem } from "./row-checks";
import type { FileShape } from "./sniff";

/**
 * A parsed sounding file → everything that is wrong with it before anything is stored, and the
 * soundings ready to store: the parser's row rules (zod), depth range, exact duplicates,
 * coordinate mistakes, soundings outside the work limit, the same file imported before, the
 * depth-unit check against earlier surveys, and the QA figures. With the technician's choices
 * applied it yields the soundings in the project's CRS and length unit, with their elevations.
 *
 * Pure: typed arrays and plain records in (what the caller read from the file and the database),
 * a preview and typed arrays out. The caller reads the file and the project once and calls this
 * once (app/lib/import/analyse.server.ts).
 */

/** What the technician says about the file (a subset of the import options). */
export interface SoundingImportOptions {
  /** "baseline", "progress" or "closeout": only a baseline is expected to carry probe depths. */
  kind: string;
  /** The CRS the file's coordinates were declared in (an EPSG code). */
  crs: string;
  /** The length unit of the file's depths and elevations. */
  lengthUnit: LengthUnit;
  fileHasElevations: boolean;
  /** Null only for a file of elevations. */
  waterSurfaceElevation: number | null;
  surveyOrder: SurveyOrder;
}

/** Choices made on the preview. */
export interface SoundingChoices {
  excludeRows: number[];
  excludeErrorRows: boolean;
  outside?: "keep" | "drop";
  acceptSameFile: boolean;
  acceptDepthUnit?: boolean;
}

export interface PrepareOptions extends SoundingImportOptions {
  choices: SoundingChoices;
  /** How the file is written (its header row, delimiter, first rows). */
  shape: FileShape;
  /** The column mapping the file was read with. */
  mapping: ColumnMappingChoice;
  /** Easting/northing were guessed from longitude/latitude headers. */
  lonLatHeaders: boolean;
  /**
   * The declared CRS, resolved by the caller (the EPSG registry is the server's), or why it could
   * not be; the project's own CRS when `crs` names it (see sameCrsCode).
   */
  declaredCrs: Crs | { problem: string };
}

/** The project as the soundings are checked against it. */
export interface SoundingGeometry {
  crsCode: string;
  crs: Crs;
  /** The project CRS's area of use (degrees); a sounding far outside it is a row error. Unknown: null or absent. */
  areaOfUse?: LonLatBounds | null;
  lengthUnit: LengthUnit;
  workLimit: ProjectedMultiPolygon | null;
  settings: Pick<EngineSettings, "cellSize" | "originX" | "originY" | "rotationDegrees">;
}

/** What the project's earlier surveys say about this file. */
export interface EarlierSurveys {
  /** Surveys stored from a file with the same content (SHA-256), oldest first. */
  sameFile: Array<{ surveyId: number; surveyedOn: string; kind: string; status: string }>;
  /**
   * Median bottom elevation (project unit) per square bin of the project's cell size from the grid
   * origin (binKey), from the active surveys; empty before the first survey.
   */
  bottomBins: ReadonlyMap<string, number>;
}

export interface SoundingPlot {
  bounds: { minX: number; minY: number; maxX: number; maxY: number };
  workLimit: Array<Array<[number, number]>>;
  /** A thinned sample (at most 4,000) of the soundings, project coordinates. */
  points: Array<[number, number]>;
}

export interface ImportPreview {
  shape: FileShape;
  mapping: ColumnMappingChoice;
  /** Easting/northing were guessed from longitude/latitude headers. */
  lonLatHeaders: boolean;
  rowCount: number;
  /** Rows that pass every row rule. */
  validRowCount: number;
  /** Soundings that would be stored with the current choices. */
  storedCount: number;
  /** Row problems (first 1,000); `problemCount` counts them all. */
  problems: RowProblem[];
  problemCount: number;
  problemRows: number;
  /** Problems with the file as a whole (missing columns, a wrong CRS): fix and upload again, or change the choices. */
  fileProblems: string[];
  warnings: string[];
  outside: { count: number; rows: number[]; points: Array<[number, number]> };
  duplicates: number;
  sameFile: EarlierSurveys["sameFile"];
  qa: SurveyQa | null;
  /** The depths look like another unit than declared, against the project's earlier surveys; the technician must confirm or fix. */
  depthUnit: Pick<DepthUnitMistake, "kind" | "factor" | "typicalRatio" | "cellsCompared" | "message"> | null;
  /** What stops the commit right now, in plain words; empty when it may go ahead. */
  blockers: string[];
  plot: SoundingPlot | null;
}

export interface PreparedSoundings {
  sourceRow: Uint32Array;
  easting: Float64Array;
  northing: Float64Array;
  depth: Float64Array;
  probe: Float64Array | null;
  elevation: Float64Array;
  refusalElevation: Float64Array | null;
  time: string[] | null;
  pointId: string[] | null;
}

export interface Analysis {
  preview: ImportPreview;
  /** Null when a file problem stops the import. */
  prepared: PreparedSoundings | null;
}

const PREVIEW_PROBLEMS = 1000;


/** The file is declared in the project's own CRS: its coordinates are used as they are. */
export function sameCrsCode(declared: string, project: string): boolean {
  return declared.trim().toUpperCase() === project.trim().toUpperCase();
}

function scaled(values: Float64Array, factor: number): Float64Array {
  if (factor === 1) return values;
  const out = new Float64Array(values.length);
  for (let index = 0; index < values.length; index++) out[index] = values[index] * factor;
  return out;
}

export function prepareSoundings(parsed: ParsedSoundings, options: PrepareOptions, geometry: SoundingGeometry, earlier: EarlierSurveys): Analysis {
  const { choices, shape, mapping } = options;
  const header = (field: SoundingField, fallback: string) => mapping[field] ?? fallback;

  const fileProblems: string[] = [];
  const warnings: string[] = [];
  const problems: RowProblem[] = [];
  for (const error of parsed.errors) {
    if (error.row === 1 && (shape.hasHeader || error.message.startsWith("the header"))) fileProblems.push(`${error.column ? `${error.column}: ` : ""}${error.message}`);
    else problems.push({ row: error.row, column: error.column, value: error.value, rule: ruleOf(error.message), message: error.message });
  }
  if (parsed.rowCount === 0 && fileProblems.length === 0) fileProblems.push("The file has no data rows.");

  // Units: depths, probes and elevations from the file's unit into the project's.
  const lengthFactor = convertLength(1, options.lengthUnit, geometry.lengthUnit);
  const depth = scaled(parsed.depth, lengthFactor);
  const probe = parsed.probe ? scaled(parsed.probe, lengthFactor) : null;
  const fileElevation = options.fileHasElevations && parsed.elevation ? scaled(parsed.elevation, lengthFactor) : null;
  if (options.fileHasElevations && !parsed.elevation) fileProblems.push('The upload says the file has elevations, but no column is mapped to elevation.');

  // Coordinates: from the file's CRS into the project's.
  let declaredIsGeographic = false;
  let easting = parsed.easting;
  let northing = parsed.northing;
  try {
    const declared = options.declaredCrs;
    if ("problem" in declared) throw new Error(declared.problem);
    declaredIsGeographic = declared.isGeographic;
    if (!sameCrsCode(options.crs, geometry.crsCode)) {
      easting = new Float64Array(parsed.easting.length);
      northing = new Float64Array(parsed.northing.length);
      for (let index = 0; index < easting.length; index++) {
        const [lon, lat] = declared.toLonLat(parsed.easting[index], parsed.northing[index]);
        [easting[index], northing[index]] = geometry.crs.fromLonLat(lon, lat);
      }
    }
  } catch (error) {
    fileProblems.push((error as Error).message);
  }

  const limitBounds = geometry.workLimit ? workLimitBounds(geometry.workLimit) : null;
  if (limitBounds && parsed.easting.length > 0) {
    const mistake = findCoordinateMistake({
      fileEasting: parsed.easting,
      fileNorthing: parsed.northing,
      projectEasting: easting,
      projectNorthing: northing,
      declaredCrs: options.crs,
      declaredIsGeographic,
      workLimit: limitBounds,
      projectUnitWord: unitLabel(geometry.lengthUnit, "length-long"),
    });
    if (mistake) fileProblems.push(mistake.message);
  }

  const rowChecks = checkRows({
    sourceRow: parsed.sourceRow, easting: parsed.easting, northing: parsed.northing, depth, probe,
    elevation: fileElevation, time: parsed.time, id: parsed.id,
    depthHeader: header("depth", "depth"), probeHeader: header("probe", "probe"), unit: geometry.lengthUnit,
  });
  problems.push(...rowChecks.problems);
  problems.push(...checkPlausibleRanges({
    sourceRow: parsed.sourceRow, fileEasting: parsed.easting, fileNorthing: parsed.northing, projectEasting: easting, projectNorthing: northing,
    depth, probe, elevation: fileElevation,
    eastingHeader: header("easting", "easting"), northingHeader: header("northing", "northing"), depthHeader: header("depth", "depth"),
    probeHeader: header("probe", "probe"), elevationHeader: header("elevation", "elevation"),
    projectBounds: plausibleProjectBounds(geometry.areaOfUse, (lon, lat) => geometry.crs.fromLonLat(lon, lat)), projectCrs: geometry.crsCode,
  }));
  problems.sort((a, b) => a.row - b.row);
  const problemRowSet = new Set(problems.map((problem) => problem.row));

  const count = parsed.sourceRow.length;
  const { elevation, refusalElevation: refusal } = soundingElevations({ depth, probe, elevation: fileElevation }, options.waterSurfaceElevation);
  for (let index = 0; index < count; index++) {
    if (!Number.isFinite(elevation[index])) {
      const row = parsed.sourceRow[index];
      problems.push({ row, column: header("depth", "depth"), value: "", rule: "required", message: "has neither a depth (with the water-surface elevation) nor an elevation" });
      problemRowSet.add(row);
    }
  }
  if (options.kind === "baseline" && !probe) warnings.push("A baseline normally carries probe depths to refusal; this file has no probe column, so planned volumes cannot be computed from it.");

  // Outside the work limit.
  let outsideIndices = new Uint32Array(0);
  if (geometry.workLimit && count > 0) {
    outsideIndices = soundingsOutsideWorkLimit(easting, northing, prepareWorkLimit(geometry.workLimit));
  }
  const outsideSet = new Set<number>(outsideIndices);

  const depthUnit = fileProblems.length === 0 && count > 0 ? checkDepthUnit(geometry, options, earlier.bottomBins, easting, northing, depth, elevation, fileElevation !== null) : null;
  const sameFile = earlier.sameFile;

  // Keep mask with the choices applied.
  const excluded = new Set(choices.excludeRows);
  const keep = new Uint8Array(count);
  let stored = 0;
  for (let index = 0; index < count; index++) {
    const row = parsed.sourceRow[index];
    if (excluded.has(row)) continue;
    if (choices.excludeErrorRows && problemRowSet.has(row)) continue;
    if (!Number.isFinite(elevation[index])) continue;
    if (choices.outside === "drop" && outsideSet.has(index)) continue;
    keep[index] = 1;
    stored++;
  }

  const blockers: string[] = [];
  if (fileProblems.length > 0) blockers.push("Fix the problems with the file as a whole first (see above).");
  const unexcludedProblemRows = [...problemRowSet].filter((row) => !excluded.has(row) && !choices.excludeErrorRows);
  // Rows the engine rejected never reach `keep`, so only an explicit exclusion clears them.
  if (unexcludedProblemRows.length > 0) blockers.push(`${unexcludedProblemRows.length} row${unexcludedProblemRows.length === 1 ? " has" : "s have"} problems: fix the file, or leave those rows out.`);
  if (outsideIndices.length > 0 && choices.outside === undefined) blockers.push(`${outsideIndices.length} sounding${outsideIndices.length === 1 ? " lies" : "s lie"} outside the work limit: choose to keep or drop them.`);
  if (sameFile.length > 0 && !choices.acceptSameFile) blockers.push(`This same file was imported before (survey ${sameFile.map((survey) => `#${survey.surveyId}`).join(", ")}): confirm that it should be imported again.`);
  if (depthUnit && !choices.acceptDepthUnit) blockers.push("The depths may be in another unit than declared (see the note on depth units): fix the unit and check again, or confirm that they are right.");
  if (stored === 0 && fileProblems.length === 0) blockers.push("No soundings would be stored.");

  if (outsideIndices.length > 0) warnings.push(`${outsideIndices.length} sounding${outsideIndices.length === 1 ? " lies" : "s lie"} outside the work limit${choices.outside ? ` and will be ${choices.outside === "keep" ? "kept" : "dropped"}` : ""}.`);
  if (sameFile.length > 0) warnings.push(`The same file (identical content) was imported before as survey ${sameFile.map((survey) => `#${survey.surveyId} (${survey.kind}, ${survey.surveyedOn}, ${survey.status})`).join(", ")}.`);
  if (depthUnit) warnings.push(depthUnit.message);
  if (lengthFactor !== 1) warnings.push(`Depths are converted from ${unitLabel(options.lengthUnit, "length-long")} to the project's ${unitLabel(geometry.lengthUnit, "length-long")}.`);

  // When every sounding is kept (the usual case) the columns are used as they are: a copy of a
  // 1,000,000-row file's seven columns would hold another 50 MB through the commit.
  const pick = <T extends Float64Array>(values: T): Float64Array => {
    if (stored === count) return values;
    const out = new Float64Array(stored);
    let next = 0;
    for (let index = 0; index < count; index++) if (keep[index]) out[next++] = values[index];
    return out;
  };
  const pickStrings = (values: string[] | null) => (values && stored < count ? values.filter((_, index) => keep[index] === 1) : values);
  const sourceRow = stored === count ? parsed.sourceRow : new Uint32Array(stored);
  if (stored < count) {
    let next = 0;
    for (let index = 0; index < count; index++) if (keep[index]) sourceRow[next++] = parsed.sourceRow[index];
  }
  const prepared: PreparedSoundings = {
    sourceRow,
    easting: pick(easting),
    northing: pick(northing),
    depth: pick(depth),
    probe: probe ? pick(probe) : null,
    elevation: pick(elevation),
    refusalElevation: refusal ? pick(refusal) : null,
    time: pickStrings(parsed.time),
    pointId: pickStrings(parsed.id),
  };

  const qa = fileProblems.length === 0
    ? surveyQa({
        easting: prepared.easting, northing: prepared.northing, depth: prepared.depth, elevation: prepared.elevation, sourceRow: prepared.sourceRow,
        workLimit: geometry.workLimit,
        grid: { cellSize: geometry.settings.cellSize, originX: geometry.settings.originX ?? 0, originY: geometry.settings.originY ?? 0, rotationDegrees: geometry.settings.rotationDegrees ?? 0 },
        unit: geometry.lengthUnit,
        order: options.surveyOrder,
      })
    : null;
  if (qa && qa.spikes.count > 0) warnings.push(`${qa.spikes.count} sounding${qa.spikes.count === 1 ? " stands" : "s stand"} out from neighbours by more than the ${options.surveyOrder} order's allowance (spikes).`);
  if (qa && qa.crossings.withinAllowanceShare !== null && qa.crossings.withinAllowanceShare < 0.95) {
    warnings.push(`Only ${(qa.crossings.withinAllowanceShare * 100).toFixed(0)} % of crossing-line differences are within the IHO S-44 ${options.surveyOrder} allowance (95 % expected).`);
  }

  const outsideRows = Array.from(outsideIndices.slice(0, 500), (index) => parsed.sourceRow[index]);
  const outsidePoints = Array.from(outsideIndices.slice(0, 500), (index) => [easting[index], northing[index]] as [number, number]);
  const preview: ImportPreview = {
    shape,
    mapping,
    lonLatHeaders: options.lonLatHeaders,
    rowCount: parsed.rowCount,
    validRowCount: parsed.rowCount - problemRowSet.size,
    storedCount: stored,
    problems: problems.slice(0, PREVIEW_PROBLEMS),
    problemCount: problems.length,
    problemRows: problemRowSet.size,
    fileProblems,
    warnings,
    outside: { count: outsideIndices.length, rows: outsideRows, points: outsidePoints },
    duplicates: rowChecks.duplicateRows,
    sameFile,
    qa,
    depthUnit: depthUnit ? { kind: depthUnit.kind, factor: depthUnit.factor, typicalRatio: depthUnit.typicalRatio, cellsCompared: depthUnit.cellsCompared, message: depthUnit.message } : null,
    blockers,
    plot: fileProblems.length === 0 ? soundingPlot(geometry, easting, northing) : null,
  };
  return { preview, prepared: fileProblems.length === 0 ? prepared : null };
}

/**
 * Depths (or the file's bottom elevations) against the project's earlier surveys over the same
 * ground, binned by the project's cell size: a unit mistake scales every bin alike.
 */
function checkDepthUnit(
  geometry: SoundingGeometry, options: SoundingImportOptions, previous: ReadonlyMap<string, number>,
  easting: Float64Array, northing: Float64Array, depth: Float64Array, elevation: Float64Array, fileHasElevations: boolean,
): DepthUnitMistake | null {
  const wse = options.waterSurfaceElevation;
  if (!fileHasElevations && wse === null) return null;
  if (previous.size === 0) return null;
  const size = geometry.settings.cellSize;
  const origin = { x: geometry.settings.originX ?? 0, y: geometry.settings.originY ?? 0 };
  const measure = fileHasElevations ? "elevation" : "depth";
  const given = binMedians(easting, northing, fileHasElevations ? elevation : depth, size, origin);
  const expected = fileHasElevations ? previous : new Map([...previous].map(([key, bottom]) => [key, (wse as number) - bottom]));
  return findDepthUnitMistake({ measure, given, expected, declaredUnit: options.lengthUnit, projectUnit: geometry.lengthUnit });
}

function soundingPlot(geometry: SoundingGeometry, easting: Float64Array, northing: Float64Array): SoundingPlot {
  const step = Math.max(1, Math.ceil(easting.length / 4000));
  const points: Array<[number, number]> = [];
  for (let index = 0; index < easting.length; index += step) points.push([easting[index], northing[index]]);
  return plotOf(points, geometry.workLimit);
}

/** A plot of sample points (project coordinates) with the work limit's rings, framed around both. */
export function plotOf(points: Array<[number, number]>, workLimit: ProjectedMultiPolygon | null): SoundingPlot {
  const rings = (workLimit ?? []).flatMap((polygon) => polygon.map((ring) => ring.map(([x, y]) => [x, y] as [number, number])));
  const bounds = { minX: Infinity, minY: Infinity, maxX: -Infinity, maxY: -Infinity };
  for (const [x, y] of [...points, ...rings.flat()]) {
    bounds.minX = Math.min(bounds.minX, x);
    bounds.minY = Math.min(bounds.minY, y);
    bounds.maxX = Math.max(bounds.maxX, x);
    bounds.maxY = Math.max(bounds.maxY, y);
  }
  return { bounds, workLimit: rings, points };
}
