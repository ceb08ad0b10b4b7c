import type { ProjectedMultiPolygon } from "../../../shared/grid/work-limit";
import {
  addSurfaceSummaries,
  clipToMask,
  computeVolumesFromRasters,
  layGridLines,
  prepareGrids,
  type EngineSettings,
  type GridLines,
  type ProgressCallback,
  type SampledSurveys,
} from "../../../shared/pipeline";
import { endAreaCheck, principalAxisLayout, type EndAreaCheck } from "../../../shared/progress/end-area-check";
import { selectSurveysInForce, type DatedSurvey, type SurveysInForce } from "../../../shared/surveys-in-force";
import type { RasterValues } from "../../../shared/surface/raster";
import type { LengthUnit } from "../../../shared/units";
import { planSurveyWork, type ComputationSurvey, type SurveyWorkPlan } from "./engine-surveys";
import { doSurveyWork, type SurveyWorkDone, type SurveyWorkSettings } from "./survey-work";
import { latestSurfaces, type ProjectSurfaces } from "./latest-surfaces";
import { computeProjectFigures, type ComputationZone, type ProjectFigures } from "./project-figures";

/**
 * A project's engine state, computed once per version of its surveys and read by everything that
 * needs the engine: the stored figures (a recompute), the map's surfaces and bands, the cell
 * inspector's depths and counts, and the end-area check. In two steps, so the surveys can be
 * triangulated in parallel threads: (1) each survey's work (survey-work.ts), (2) the state from
 * the sampled rasters, on grids laid once. Pure: typed arrays in, typed arrays out.
 */
export interface ProjectStateInput {
  /** Every active survey with its soundings (which are in force is chosen here). */
  surveys: ComputationSurvey[];
  workLimit: ProjectedMultiPolygon;
  zones: ComputationZone[];
  settings: EngineSettings;
  lengthUnit: LengthUnit;
  /** The newest water-surface elevation among the active surveys; null when none gave one. */
  waterSurfaceElevation: number | null;
  /** Also every survey date's figures (a recompute stores them); otherwise only the latest state. */
  withFigures: boolean;
}

export interface ProjectState {
  /** Null unless asked for (`withFigures`). */
  figures: ProjectFigures | null;
  surfaces: ProjectSurfaces;
  /** The removed volume by end areas beside the surface figure, in cubic project length units. */
  endArea: EndAreaCheck;
  periods: PeriodSurfaces;
}

/**
 * What a pay period between any two surveys in force is computed from (period-figures.ts), so a
 * request reads no soundings: the surveys in force, baseline first, and the later surveys' bottoms
 * clipped to the limit, oldest first (the baseline and firm sand are `surfaces.result.rasters`).
 */
export interface PeriodSurfaces {
  surveys: DatedSurvey[];
  progress: RasterValues[];
  /** Per survey in force (as `surveys`), its soundings per grid cell: what the removed volume's band averages over. */
  soundingsPerCell: Uint32Array[];
}

/** Step (1) for a project: the work of each survey, and the settings all of it shares. */
export interface ProjectWork {
  inForce: SurveysInForce<ComputationSurvey>;
  plan: SurveyWorkPlan;
  lines: GridLines;
  settings: SurveyWorkSettings;
}

/** Null when no baseline is in force. */
export function planProjectWork(input: ProjectStateInput): ProjectWork | null {
  const inForce = selectSurveysInForce(input.surveys);
  if (inForce === null) return null;
  const lines = layGridLines(input.workLimit, input.settings);
  const settings: SurveyWorkSettings = { maxEdge: input.settings.maxEdge, rasterGrid: lines.rasterGrid, precision: input.settings.rasterPrecision ?? "float64", cellGrid: lines.cellGrid };
  return { inForce, plan: planSurveyWork(input.surveys, inForce), lines, settings };
}

/** Step (2)'s input: everything but the soundings, which step (1) has turned into rasters and counts. */
export interface SampledProjectInput extends Omit<ProjectStateInput, "surveys"> {
  inForce: SurveysInForce<DatedSurvey>;
  lines: GridLines;
  /** Sampled without the mask; `progress` in the order of `inForce.later`. */
  sampled: SampledSurveys;
  /** Per grid cell, one array per active survey. */
  soundingsPerCell: Uint32Array[];
}

/** The sampled surfaces and counts out of step (1)'s results, in the plan's order. */
export function gatherSurveyWork(plan: SurveyWorkPlan, done: readonly SurveyWorkDone[]): Pick<SampledProjectInput, "sampled" | "soundingsPerCell"> {
  const surfaces = addSurfaceSummaries(done.flatMap((result) => (result.summary ? [result.summary] : [])));
  const [muckTop, firm] = done[0].rasters; // the baseline's work: its bottom, then firm sand
  return {
    sampled: { muckTop, firm, progress: plan.progress.map((work) => done[work].rasters[0]), surfaces },
    soundingsPerCell: done.flatMap((result) => (result.soundingsPerCell ? [result.soundingsPerCell] : [])),
  };
}

/** Step (2): grids laid once, the rasters clipped to the limit, the figures of each date when asked, the latest surfaces and the end-area check. */
export function computeStateFromRasters(input: SampledProjectInput, onProgress?: ProgressCallback): ProjectState {
  const grids = prepareGrids(input.workLimit, input.settings, onProgress, input.lines);
  const { muckTop, firm, progress, surfaces } = input.sampled;
  const sampled: SampledSurveys = { muckTop: clipToMask(muckTop, grids.mask), firm: clipToMask(firm, grids.mask), progress: progress.map((values) => clipToMask(values, grids.mask)), surfaces };
  let figures: ProjectFigures | null = null;
  let latest;
  if (input.withFigures) {
    ({ figures, latest } = computeProjectFigures({ inForce: input.inForce, grids, sampled, zones: input.zones, settings: input.settings, lengthUnit: input.lengthUnit }, onProgress));
  } else {
    latest = computeVolumesFromRasters(grids, sampled, input.settings);
  }
  // Sections one cell apart, sampled at the raster spacing: as fine as the surfaces themselves.
  const layout = principalAxisLayout(input.workLimit, input.settings.cellSize, input.settings.resolution);
  const endArea = endAreaCheck(latest.rasters.muckTop, latest.rasters.latestBottom, latest.totals.removedVolumeCubicLength, layout);
  const periods: PeriodSurfaces = { surveys: [input.inForce.baseline, ...input.inForce.later].map(({ id, kind, surveyedOn }) => ({ id, kind, surveyedOn })), progress: sampled.progress, soundingsPerCell: input.soundingsPerCell.slice(0, 1 + input.inForce.later.length) };
  return { figures, surfaces: latestSurfaces(latest, input.waterSurfaceElevation, input.soundingsPerCell), endArea, periods };
}

/** Both steps on this thread (the engine pool runs step (1) per survey in its threads). Null when no baseline is in force. */
export function computeProjectState(input: ProjectStateInput, onProgress?: ProgressCallback): ProjectState | null {
  const work = planProjectWork(input);
  if (work === null) return null;
  const done = work.plan.work.map((survey, index) => {
    const result = doSurveyWork(survey, work.settings);
    onProgress?.("triangulate", (index + 1) / work.plan.work.length);
    return result;
  });
  const { surveys: _surveys, ...rest } = input;
  return computeStateFromRasters({ ...rest, inForce: work.inForce, lines: work.lines, ...gatherSurveyWork(work.plan, done) }, onProgress);
}
