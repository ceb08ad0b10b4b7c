import type { DatedSurvey, SurveysInForce } from "../../../shared/surveys-in-force";
import type { SurveyWork } from "./survey-work";

/**
 * A project's active surveys as the engine takes them, and the work each one gives the engine
 * (survey-work.ts): one item per survey, so the pool can spread them over its threads.
 */
export interface ComputationSurvey extends DatedSurvey {
  easting: Float64Array;
  northing: Float64Array;
  /** Bottom elevation (project length unit and datum). */
  elevation: Float64Array;
  /** Refusal elevation from the probe; NaN where a row has none; null without a probe column. */
  refusalElevation: Float64Array | null;
}

export interface SurveyWorkPlan {
  /** The baseline in force first (its rasters: muck top, firm sand), then the later surveys in force, then the surveys only counted. */
  work: SurveyWork[];
  /** Survey id of each work item. */
  surveyIds: number[];
  /** Work items of the progress and closeout surveys in force, oldest first. */
  progress: number[];
}

/**
 * The engine's work for a project: the surveys in force triangulated and sampled, and every
 * active survey counted per cell, the superseded baselines too (the cell inspector's sounding
 * count is of all active surveys). Looks at no sounding: the request thread plans, the threads work.
 */
export function planSurveyWork(active: readonly ComputationSurvey[], inForce: SurveysInForce<ComputationSurvey>): SurveyWorkPlan {
  const { baseline } = inForce;
  const work: SurveyWork[] = [{ easting: baseline.easting, northing: baseline.northing, elevation: baseline.elevation, refusalElevation: baseline.refusalElevation, count: true }];
  const surveyIds = [baseline.id];
  const progress = inForce.later.map((survey) => {
    work.push({ easting: survey.easting, northing: survey.northing, elevation: survey.elevation, count: true });
    surveyIds.push(survey.id);
    return work.length - 1;
  });
  const inForceIds = new Set(surveyIds);
  for (const survey of active) {
    if (inForceIds.has(survey.id)) continue;
    work.push({ easting: survey.easting, northing: survey.northing, elevation: null, count: true });
    surveyIds.push(survey.id);
  }
  return { work, surveyIds, progress };
}
