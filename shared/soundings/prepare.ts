import type { Crs } from "../crs";
import { workLimitBounds, type ProjectedMultiPolygon } from "../grid/work-limit";
import type { EngineSettings } from "../pipeline";
import { prepareWorkLimit, soundingsOutsideWorkLimit } from "../qa/outside";
import { surveyQa, type SurveyQa } from "../qa/survey-qa";
import type { SurveyOrder } from "../qa/tvu";
import { convertLength, unitLabel, type LengthUnit } from "../units";
import type { ColumnMappingChoice } from "./column-guess";
import { findCoordinateMistake } from "./coordinate-mistakes";
import { findBottomShift, type BottomShift } from "./bottom-shift";
import { headerUnit } from "./column-guess";
import { binMedians, findDepthUnitMistake, type DepthUnitMistake } from "./depth-unit-mistakes";
import { soundingElevations } from "./elevations";
import type { ParsedSoundings, SoundingField } from "./parse-csv";
import { checkPlausibleRanges, checkRows, plausibleProjectBounds, ruleOf, type LonLatBounds, type RowProblem } from "./row-checks";
import { delimiterName, type FileShape } from "./sniff";
import { checkTimes, surveyDateProblem } from "./time-checks";

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
  /** The survey date (YYYY-MM-DD); checked against today in the project's time zone. */
  surveyedOn?: string;
  /** The time zone the file's times are written in. */
  timeZone?: string;
  /** The vertical datum the upload names. */
  datum?: string;
}

/** Choices made on the preview. */
export interface SoundingChoices {
  excludeRows: number[];
  excludeErrorRows: boolean;
  outside?: "keep" | "drop";
  acceptSameFile: boolean;
  acceptDepthUnit?: boolean;
  /** Import even though the whole bottom moved against the earlier surveys by more than dredging could. */
  acceptBottomShift?: boolean;
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
  /** Fields the mapping took from the project's last accepted mapping. */
  rememberedFields?: SoundingField[];
  /** The file cannot be read as text at all (what it seems to be, in plain words): nothing else is said. */
  notText?: string;
  /** The project's time zone ("today" and "now" are the project's); UTC when absent. */
  projectTimeZone?: string;
  /** Now (ms since 1970), the caller's clock; the times are not checked against the future without it. */
  now?: number;
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
  /** Median firm-sand (refusal) elevation per bin, from the surveys that carried probe depths. */
  refusalBins?: ReadonlyMap<string, number>;
}

export interface SoundingPlot {
  /** The frame drawn: the work limit with a margin (or the bulk of the soundings without one); points beyond it are drawn at its edge and counted. */
  bounds: { minX: number; minY: number; maxX: number; maxY: number };
  workLimit: Array<Array<[number, number]>>;
  /** A thinned sample (at most 4,000) of the soundings, project coordinates. */
  points: Array<[number, number]>;
  /** Soundings standing out from their neighbours (spikes), with their spreadsheet rows. */
  spikes?: Array<{ row: number; at: [number, number] }>;
  /** Soundings outside the work limit, with their spreadsheet rows. */
  outside?: Array<{ row: number; at: [number, number] }>;
  /** Soundings of the whole file beyond the frame, per edge (every sounding counted, not only those drawn). */
  beyond?: { west: number; east: number; south: number; north: number };
}

export interface ImportPreview {
  shape: FileShape;
  mapping: ColumnMappingChoice;
  /** Easting/northing were guessed from longitude/latitude headers. */
  lonLatHeaders: boolean;
  /** Fields the mapping took from the project's last accepted mapping. */
  rememberedFields?: SoundingField[];
  rowCount: number;
  /** False when no row could be checked (an empty file, or a file problem that stops every row from being read). */
  rowsChecked?: boolean;
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
  depthUnit: (Omit<Pick<DepthUnitMistake, "kind" | "factor" | "typicalRatio" | "cellsCompared" | "message">, "kind"> & { kind: DepthUnitMistake["kind"] | "header" }) | null;
  /** The whole bottom moved against the earlier surveys by more than dredging could (a wrong water-surface elevation or datum); the technician must confirm or fix. */
  bottomShift?: Pick<BottomShift, "direction" | "medianShift" | "cellsCompared" | "likelyWaterSurface" | "message"> | null;
  /** The spike rule in the crew's words, with its unit ("more than 1.64 ftUS from the median of its neighbours within 2.5 ftUS"). */
  spikeRule?: string | null;
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

/** The unit a CRS's coordinates are in, from its proj4 or WKT definition; null when it does not say. */
export function crsUnit(crs: Crs): LengthUnit | "degrees" | null {
  if (crs.isGeographic) return "degrees";
  const definition = crs.definition;
  const units = /\+units=(us-ft|ft|m)\b/.exec(definition);
  if (units) return units[1] as LengthUnit;
  const toMeter = /\+to_meter=([\d.]+)/.exec(definition);
  if (toMeter) return Math.abs(Number(toMeter[1]) - 1200 / 3937) < 1e-9 ? "us-ft" : Math.abs(Number(toMeter[1]) - 0.3048) < 1e-9 ? "ft" : null;
  if (/UNIT\["US survey foot"/i.test(definition)) return "us-ft";
  if (/UNIT\["(foot|international foot)"/i.test(definition)) return "ft";
  if (/UNIT\["(metre|meter)"/i.test(definition)) return "m";
  return null;
}

const unitWord = (unit: LengthUnit | "degrees") => (unit === "degrees" ? "degrees" : unitLabel(unit, "length-long"));
const isFeet = (unit: LengthUnit | "degrees" | null) => unit === "ft" || unit === "us-ft";
const sameUnit = (a: LengthUnit | "degrees", b: LengthUnit | "degrees") => a === b || (isFeet(a) && isFeet(b));

/** A column whose header names a unit other than the one declared for it. */
export interface HeaderUnitNote {
  field: SoundingField;
  header: string;
  unit: LengthUnit | "degrees";
  /** Depths, probes or elevations: held for confirmation like the depth-unit check. */
  blocking: boolean;
  message: string;
}

/** Headers that carry a unit (`East_ft`, `Depth (m)`) against the units declared for the file. */
export function headerUnitNotes(mapping: ColumnMappingChoice, declared: { crsCode: string; crsUnit: LengthUnit | "degrees" | null; lengthUnit: LengthUnit; projectLengthUnit: LengthUnit }): HeaderUnitNote[] {
  const notes: HeaderUnitNote[] = [];
  for (const field of ["easting", "northing", "depth", "probe", "elevation"] as const) {
    const header = mapping[field];
    if (typeof header !== "string") continue;
    const unit = headerUnit(header);
    if (!unit) continue;
    if (field === "easting" || field === "northing") {
      if (!declared.crsUnit || sameUnit(unit, declared.crsUnit)) continue;
      notes.push({
        field, header, unit, blocking: false,
        message: `The column "${header}" says ${unitWord(unit)}, but the file's coordinates were declared as ${declared.crsCode}, which is in ${unitWord(declared.crsUnit)}. Choose the coordinate system the crew used on the upload form, or check the column.`,
      });
    } else if (!sameUnit(unit, declared.lengthUnit)) {
      const what = field === "depth" ? "depths" : field === "probe" ? "probe depths" : "elevations";
      notes.push({
        field, header, unit, blocking: unit !== "degrees",
        message: `The column "${header}" says ${unitWord(unit)}, but the file's ${what} were declared as ${unitWord(declared.lengthUnit)}${declared.lengthUnit === declared.projectLengthUnit ? " (the project's unit)" : ""}. Choose ${unitWord(unit)} as the unit of depths in the file and upload again, or confirm that the values are ${unitWord(declared.lengthUnit)} whatever the header says.`,
      });
    }
  }
  return notes;
}

/** The one message for a file that cannot be read as text: nothing else is said about it. */
function notTextAnalysis(options: PrepareOptions, message: string): Analysis {
  const shape: FileShape = { hasBom: false, delimiter: ",", decimalComma: false, hasHeader: false, headers: [], firstRows: [] };
  return {
    preview: {
      shape, mapping: {}, lonLatHeaders: false, rowCount: 0, rowsChecked: false, validRowCount: 0, storedCount: 0, problems: [], problemCount: 0, problemRows: 0,
      fileProblems: [message], warnings: [], outside: { count: 0, rows: [], points: [] }, duplicates: 0, sameFile: [], qa: null, depthUnit: null, bottomShift: null,
      blockers: ["Choose a CSV file of soundings instead."], plot: null,
    },
    prepared: null,
  };
}

export function prepareSoundings(parsed: ParsedSoundings, options: PrepareOptions, geometry: SoundingGeometry, earlier: EarlierSurveys): Analysis {
  if (options.notText) return notTextAnalysis(options, options.notText);
  const { choices, shape, mapping } = options;
  const header = (field: SoundingField, fallback: string) => mapping[field] ?? fallback;

  const fileProblems: string[] = [];
  const warnings: string[] = [];
  const problems: RowProblem[] = [];
  // A header that reads as one column, holding another delimiter: the rows do not agree on it.
  const lone = shape.headers.length === 1 ? shape.headers[0] : null;
  const seenDelimiter = lone ? ([";", "\t", "|", ","] as const).find((candidate) => lone.includes(candidate) && candidate !== shape.delimiter) : undefined;
  if (lone && seenDelimiter) {
    fileProblems.push(
      `The header row reads as one column ("${lone.length > 60 ? `${lone.slice(0, 60)}…` : lone}"): this file seems to separate columns with ${delimiterName(seenDelimiter)}, but its first rows do not all have as many of them as the header. ` +
      "Check that every row has the same number of columns (an extra or missing separator at the end of a line is the usual cause), or export the file again.",
    );
  }
  for (const error of parsed.errors) {
    if (error.row === 1 && (shape.hasHeader || error.message.startsWith("the header"))) {
      if (lone && seenDelimiter) continue; // a consequence of the delimiter, said above
      if (/file is empty/.test(error.message)) fileProblems.push("The file you chose is empty: it holds no header row and no soundings. Export the soundings again and choose the new file.");
      else fileProblems.push(`${error.column ? `${error.column}: ` : ""}${error.message}`);
    } else problems.push({ row: error.row, column: error.column, value: error.value, rule: ruleOf(error.message), message: error.message });
  }
  if (parsed.rowCount === 0 && fileProblems.length === 0) {
    fileProblems.push(`The file has a header (${shape.headers.slice(0, 6).join(", ")}${shape.headers.length > 6 ? ", …" : ""}) but no rows of soundings. Export the soundings again and choose the new file.`);
  }
  if (shape.delimiter !== ",") {
    warnings.push(`This file separates columns with ${delimiterName(shape.delimiter)}${shape.decimalComma ? " and writes decimals with a comma (3,81)" : ""}${shape.separatorLine ? `, as its first line ("sep=") says` : ""}; it was read that way.`);
  }
  const dateProblem = options.surveyedOn && options.now !== undefined ? surveyDateProblem(options.surveyedOn, options.projectTimeZone ?? "UTC", options.now) : null;
  if (dateProblem) fileProblems.push(dateProblem);

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

  const unitNotes = headerUnitNotes(mapping, {
    crsCode: options.crs,
    crsUnit: "problem" in options.declaredCrs ? null : crsUnit(options.declaredCrs),
    lengthUnit: options.lengthUnit,
    projectLengthUnit: geometry.lengthUnit,
  });
  for (const note of unitNotes) warnings.push(note.message);

  const limitBounds = geometry.workLimit ? workLimitBounds(geometry.workLimit) : null;
  let wholeFileLonLat = false;
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
    wholeFileLonLat = mistake?.kind === "lon-lat-as-projected";
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
  // A single point in degrees among projected coordinates: a GPS reading pasted into the file.
  if (!declaredIsGeographic && !wholeFileLonLat) {
    const projectWord = isFeet(geometry.lengthUnit) ? "feet" : "metres";
    const lonLatRows = new Set<number>();
    for (let index = 0; index < parsed.easting.length; index++) {
      const e = parsed.easting[index];
      const n = parsed.northing[index];
      if (!(Math.abs(e) <= 180 && Math.abs(n) <= 90) || (e === 0 && n === 0)) continue;
      const row = parsed.sourceRow[index];
      lonLatRows.add(row);
      problems.push({
        row, column: header("easting", "easting"), value: `${e}, ${n}`, rule: "coordinate system",
        message: `row ${row} looks like longitude/latitude (${e}, ${n}), not project ${projectWord} (${options.crs}): a GPS position in degrees was written where the file has ${options.crs} coordinates. Replace it with the ${options.crs} coordinates, or leave the row out`,
      });
    }
    if (lonLatRows.size > 0) {
      for (let index = problems.length - 1; index >= 0; index--) {
        if (problems[index].rule === "coordinate range" && lonLatRows.has(problems[index].row)) problems.splice(index, 1);
      }
    }
  }
  if (parsed.time && options.surveyedOn) {
    problems.push(...checkTimes({
      sourceRow: parsed.sourceRow, time: parsed.time, header: header("time", "time"),
      fileTimeZone: options.timeZone ?? options.projectTimeZone ?? "UTC", projectTimeZone: options.projectTimeZone ?? "UTC",
      surveyedOn: options.surveyedOn, now: options.now ?? null,
    }));
  }
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
  let bottomShift: BottomShift | null = null;
  if (!depthUnit && fileProblems.length === 0 && count > 0 && earlier.bottomBins.size > 0 && (fileElevation !== null || options.waterSurfaceElevation !== null)) {
    const origin = { x: geometry.settings.originX ?? 0, y: geometry.settings.originY ?? 0 };
    bottomShift = findBottomShift({
      given: binMedians(easting, northing, elevation, geometry.settings.cellSize, origin),
      previousBottom: earlier.bottomBins,
      previousRefusal: earlier.refusalBins ?? new Map(),
      unit: geometry.lengthUnit,
      measure: fileElevation !== null ? "elevation" : "depth",
      waterSurfaceElevation: options.waterSurfaceElevation,
      datum: options.datum ?? "the project's",
    });
  }
  const headerUnitHold = unitNotes.filter((note) => note.blocking);

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
  if ((depthUnit || headerUnitHold.length > 0) && !choices.acceptDepthUnit) blockers.push("The depths may be in another unit than declared (see the note on depth units): fix the unit and check again, or confirm that they are right.");
  if (bottomShift && !choices.acceptBottomShift) blockers.push(`The whole bottom ${bottomShift.direction === "down" ? "dropped" : "rose"} a median ${Math.abs(bottomShift.medianShift).toFixed(1)} ${unitLabel(geometry.lengthUnit)} against the earlier surveys (see the note on the bottom): correct the water-surface elevation or datum and check again, or confirm that it is right.`);
  if (stored === 0 && fileProblems.length === 0) blockers.push("No soundings would be stored.");

  if (outsideIndices.length > 0) warnings.push(`${outsideIndices.length} sounding${outsideIndices.length === 1 ? " lies" : "s lie"} outside the work limit${choices.outside ? ` and will be ${choices.outside === "keep" ? "kept" : "dropped"}` : ""}.`);
  if (sameFile.length > 0) warnings.push(`The same file (identical content) was imported before as survey ${sameFile.map((survey) => `#${survey.surveyId} (${survey.kind}, ${survey.surveyedOn}, ${survey.status})`).join(", ")}.`);
  if (depthUnit) warnings.push(depthUnit.message);
  if (bottomShift) warnings.push(bottomShift.message);
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
  const label = unitLabel(geometry.lengthUnit);
  const spikeRule = qa && Number.isFinite(qa.spikes.threshold)
    ? `more than ${qa.spikes.threshold.toFixed(2)} ${label} from the median of its neighbours within ${qa.spikes.radius.toFixed(1)} ${label} (the IHO S-44 order ${options.surveyOrder} allowance at the median depth)`
    : null;
  if (qa && qa.spikes.count > 0) {
    warnings.push(`${qa.spikes.count} sounding${qa.spikes.count === 1 ? " stands" : "s stand"} out as a spike: ${spikeRule} (rows ${qa.spikes.rows.slice(0, 12).join(", ")}${qa.spikes.count > 12 ? ", …" : ""}).`);
  }
  if (qa && qa.crossings.withinAllowanceShare !== null && qa.crossings.withinAllowanceShare < 0.95) {
    warnings.push(`Only ${(qa.crossings.withinAllowanceShare * 100).toFixed(0)} % of crossing-line differences are within the IHO S-44 ${options.surveyOrder} allowance (95 % expected).`);
  }

  const outsideRows = Array.from(outsideIndices.slice(0, 500), (index) => parsed.sourceRow[index]);
  const outsidePoints = Array.from(outsideIndices.slice(0, 500), (index) => [easting[index], northing[index]] as [number, number]);
  const rowsChecked = fileProblems.length === 0 && parsed.rowCount > 0;
  let plot: SoundingPlot | null = null;
  if (fileProblems.length === 0) {
    plot = soundingPlot(geometry, easting, northing);
    const spikeRows = new Set(qa?.spikes.rows ?? []);
    const spikes: NonNullable<SoundingPlot["spikes"]> = [];
    if (spikeRows.size > 0) {
      for (let index = 0; index < prepared.sourceRow.length; index++) {
        const row = prepared.sourceRow[index];
        if (spikeRows.has(row)) spikes.push({ row, at: [prepared.easting[index], prepared.northing[index]] });
      }
    }
    plot.spikes = spikes;
    plot.outside = outsideRows.map((row, index) => ({ row, at: outsidePoints[index] }));
  }
  const preview: ImportPreview = {
    shape,
    mapping,
    lonLatHeaders: options.lonLatHeaders,
    rememberedFields: options.rememberedFields ?? [],
    rowCount: parsed.rowCount,
    rowsChecked,
    validRowCount: rowsChecked ? Math.max(0, parsed.rowCount - problemRowSet.size) : 0,
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
    depthUnit: depthUnit
      ? { kind: depthUnit.kind, factor: depthUnit.factor, typicalRatio: depthUnit.typicalRatio, cellsCompared: depthUnit.cellsCompared, message: depthUnit.message }
      : headerUnitHold.length > 0
        ? { kind: "header", factor: 1, typicalRatio: 1, cellsCompared: 0, message: headerUnitHold.map((note) => note.message).join(" ") }
        : null,
    bottomShift: bottomShift ? { direction: bottomShift.direction, medianShift: bottomShift.medianShift, cellsCompared: bottomShift.cellsCompared, likelyWaterSurface: bottomShift.likelyWaterSurface, message: bottomShift.message } : null,
    spikeRule,
    blockers,
    plot,
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
  const plot = plotOf(points, geometry.workLimit);
  // Every sounding beyond the frame is counted, not only the sample drawn.
  const beyond = { west: 0, east: 0, south: 0, north: 0 };
  const { minX, minY, maxX, maxY } = plot.bounds;
  for (let index = 0; index < easting.length; index++) {
    const x = easting[index];
    const y = northing[index];
    if (!Number.isFinite(x) || !Number.isFinite(y)) continue;
    if (x < minX) beyond.west++;
    else if (x > maxX) beyond.east++;
    else if (y < minY) beyond.south++;
    else if (y > maxY) beyond.north++;
  }
  plot.beyond = beyond;
  return plot;
}

function quantile(sorted: number[], share: number): number {
  return sorted[Math.min(sorted.length - 1, Math.max(0, Math.round(share * (sorted.length - 1))))];
}

/**
 * A plot of sample points (project coordinates) with the work limit's rings. The frame is the work
 * limit with a margin of a tenth of its size, so one far-off point cannot shrink the limit to a dot;
 * without a work limit it is the middle 98 % of the points. Points beyond the frame are drawn at its
 * edge and counted there.
 */
export function plotOf(points: Array<[number, number]>, workLimit: ProjectedMultiPolygon | null): SoundingPlot {
  const rings = (workLimit ?? []).flatMap((polygon) => polygon.map((ring) => ring.map(([x, y]) => [x, y] as [number, number])));
  const bounds = { minX: Infinity, minY: Infinity, maxX: -Infinity, maxY: -Infinity };
  if (rings.length > 0) {
    for (const [x, y] of rings.flat()) {
      bounds.minX = Math.min(bounds.minX, x);
      bounds.minY = Math.min(bounds.minY, y);
      bounds.maxX = Math.max(bounds.maxX, x);
      bounds.maxY = Math.max(bounds.maxY, y);
    }
  } else if (points.length > 0) {
    const xs = points.map(([x]) => x).filter(Number.isFinite).sort((a, b) => a - b);
    const ys = points.map(([, y]) => y).filter(Number.isFinite).sort((a, b) => a - b);
    if (xs.length > 0 && ys.length > 0) {
      bounds.minX = quantile(xs, 0.01);
      bounds.maxX = quantile(xs, 0.99);
      bounds.minY = quantile(ys, 0.01);
      bounds.maxY = quantile(ys, 0.99);
    }
  }
  if (Number.isFinite(bounds.minX)) {
    const margin = Math.max(bounds.maxX - bounds.minX, bounds.maxY - bounds.minY, 1) * 0.1;
    bounds.minX -= margin;
    bounds.minY -= margin;
    bounds.maxX += margin;
    bounds.maxY += margin;
  }
  return { bounds, workLimit: rings, points };
}
