/**
 * Which of a project's surveys its figures, map surfaces and end-area check rest on: the surveys
 * "in force". Pure: it looks only at each survey's kind, date and id, so a caller can choose
 * before it reads any soundings.
 */
export const SURVEY_KINDS = ["baseline", "progress", "closeout"] as const;
export type SurveyKind = (typeof SURVEY_KINDS)[number];

/** What the choice needs of a survey (a database row, or the soundings the engine is given). */
export interface DatedSurvey {
  id: number;
  kind: SurveyKind;
  /** Local survey date, YYYY-MM-DD (so text order is date order). */
  surveyedOn: string;
}

export interface SurveysInForce<Survey extends DatedSurvey> {
  /** The newest active baseline: the muck top, firm sand from its probe, and what removal is measured from. */
  baseline: Survey;
  /** Every active progress and closeout survey, oldest first: the order their bottoms are stacked in. */
  later: Survey[];
}

/** Survey date, then id: of two surveys of one date, the one uploaded later counts as newer. */
export function byDateThenId(a: DatedSurvey, b: DatedSurvey): number {
  return a.surveyedOn < b.surveyedOn ? -1 : a.surveyedOn > b.surveyedOn ? 1 : a.id - b.id;
}

/**
 * The surveys in force among a project's active surveys (given in any order): the newest baseline
 * by date then id, and every progress and closeout survey by date then id. A newer baseline
 * supersedes an older one (re-surveyed before a new contract), whose soundings then take no part.
 * Progress surveys are not compared with the baseline's date: each is stacked on the baseline in
 * date order, as the figures have always been. Null when there is no active baseline.
 */
export function selectSurveysInForce<Survey extends DatedSurvey>(active: readonly Survey[]): SurveysInForce<Survey> | null {
  const ordered = [...active].sort(byDateThenId);
  const baseline = ordered.filter((survey) => survey.kind === "baseline").at(-1);
  if (baseline === undefined) return null;
  return { baseline, later: ordered.filter((survey) => survey.kind !== "baseline") };
}

/** The surveys in force oldest first, baseline first. */
export function surveysInForceList<Survey extends DatedSurvey>(inForce: SurveysInForce<Survey>): Survey[] {
  return [inForce.baseline, ...inForce.later];
}
