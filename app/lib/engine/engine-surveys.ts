import { firmSharesBaselinePositions, type SurveyPoints } from "../../../shared/pipeline";
import type { DatedSurvey, SurveysInForce } from "../../../shared/surveys-in-force";
import type { SurveyWork } from "./survey-work";

/**
 * A project's active surveys as the engine takes them, and the work each one gives the engine
 * (survey-work.ts): its soundings triangulated and sampled once onto the project's raster (in its
 * own thread where there are several), and counted per cell. Pure: typed arrays in, typed arrays out.
 */
export interface ComputationSurvey extends DatedSurvey {
  easting: Float64Array;
  northing: Float64Array;
  /** Bottom elevation (project length unit and datum). */
  elevation: Float64Array;
  /** Refusal elevation from the probe; NaN where a row has none; null without a probe column. */
  refusalElevation: Float64Array | null;
}

/**
 * Firm-sand points from the baseline's probe: the baseline's own arrays when every row has a
 * probe (one triangulation then serves both surfaces), else the rows with one.
 */
export function firmPoints(baseline: ComputationSurvey): SurveyPoints {
  const refusal = baseline.refusalElevation;
  if (refusal === null) throw new Error("the active baseline has no probe column, so there is no firm-sand surface to measure to");
  let finite = 0;
  for (let index = 0; index < refusal.length; index++) if (Number.isFinite(refusal[index])) finite++;
  if (finite === refusal.length) return { easting: baseline.easting, northing: baseline.northing, elevation: refusal };
  const easting = new Float64Array(finite);
  const northing = new Float64Array(finite);
  const elevation = new Float64Array(finite);
  let next = 0;
  for (let index = 0; index < refusal.length; index++) {
    if (!Number.isFinite(refusal[index])) continue;
    easting[next] = baseline.easting[index];
    northing[next] = baseline.northing[index];
    elevation[next] = refusal[index];
    next++;
  }
  return { easting, northing, elevation };
}

/** Where each surface of the engine comes from in a plan's work list. */
export interface SurveyWorkPlan {
  work: SurveyWork[];
  /** Survey id of each work item; null for the baseline's separate firm-sand points. */
  surveyIds: Array<number | null>;
  muckTop: { work: number; layer: number };
  firm: { work: number; layer: number };
  /** Work items of the progress and closeout surveys in force, oldest first. */
  progress: number[];
}

/**
 * The engine's work for a project: the surveys in force triangulated and sampled (the baseline's
 * probe on its own triangles when it shares the baseline's positions), and every active survey
 * counted per cell, the superseded baselines too (the cell inspector's sounding count is of all
 * active surveys).
 */
export function planSurveyWork(active: readonly ComputationSurvey[], inForce: SurveysInForce<ComputationSurvey>): SurveyWorkPlan {
  const { baseline } = inForce;
  const firm = firmPoints(baseline);
  const shared = firmSharesBaselinePositions({ baseline, firm, progress: [] });
  const work: SurveyWork[] = [{ easting: baseline.easting, northing: baseline.northing, layers: shared ? [baseline.elevation, firm.elevation] : [baseline.elevation], count: true }];
  const surveyIds: Array<number | null> = [baseline.id];
  let firmAt = { work: 0, layer: 1 };
  if (!shared) {
    firmAt = { work: work.length, layer: 0 };
    work.push({ easting: firm.easting, northing: firm.northing, layers: [firm.elevation], count: false });
    surveyIds.push(null);
  }
  const progress = inForce.later.map((survey) => {
    work.push({ easting: survey.easting, northing: survey.northing, layers: [survey.elevation], count: true });
    surveyIds.push(survey.id);
    return work.length - 1;
  });
  const inForceIds = new Set([baseline.id, ...inForce.later.map((survey) => survey.id)]);
  for (const survey of active) {
    if (inForceIds.has(survey.id)) continue;
    work.push({ easting: survey.easting, northing: survey.northing, layers: [], count: true });
    surveyIds.push(survey.id);
  }
  return { work, surveyIds, muckTop: { work: 0, layer: 0 }, firm: firmAt, progress };
}
