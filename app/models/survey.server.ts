import type { CellStatus } from "../../shared/cell-status";
import type { FigureTotals } from "../../shared/volumes/figure-totals";
import { CellResult, Project, Sounding, Survey, SurveySnapshot, User, getSequelize, type SurveyKind, type SurveyStatus } from "~/lib/db.server";
import type { ProjectView } from "~/lib/auth/project-view.server";
import { AUDIT_ACTIONS, recordAudit } from "~/lib/audit/audit.server";
import type { VerticalBias } from "../../shared/qa/vertical-bias";

/** Surveys of a project as the pages and the API show them; every query is scoped by the project. */
export interface SurveyListItem {
  id: number;
  kind: SurveyKind;
  surveyedOn: string;
  uploadedBy: string | null;
  uploadedAt: string;
  rowCount: number;
  soundingCount: number;
  /** Share (0–1) of the work limit's cells with soundings of this survey. */
  coverage: number | null;
  status: SurveyStatus;
  fileName: string;
}

export interface SurveyDetails extends SurveyListItem {
  timeZone: string;
  waterSurfaceElevation: number | null;
  fileHasElevations: boolean;
  datum: string;
  crs: string;
  lengthUnit: string;
  contentSha256: string;
  retractedReason: string | null;
  retractedBy: string | null;
  retractedAt: string | null;
  qa: Record<string, unknown>;
  /** The most the survey's vertical reference may be off (95 %), as entered; null when none is recorded. */
  verticalBias: VerticalBias | null;
}

/** A survey row's recorded vertical-reference bias, or null (the three columns are set together). */
export function verticalBiasOf(survey: Pick<Survey, "verticalBiasValue" | "verticalBiasUnit" | "verticalBiasSource">): VerticalBias | null {
  if (survey.verticalBiasValue === null || survey.verticalBiasValue === undefined || !survey.verticalBiasUnit) return null;
  return { value: survey.verticalBiasValue, unit: survey.verticalBiasUnit, source: survey.verticalBiasSource ?? "" };
}

const withUsers = [
  { model: User, as: "uploadedBy", attributes: ["name"] },
  { model: User, as: "retractedBy", attributes: ["name"] },
];

function presentListItem(survey: Survey): SurveyListItem {
  return {
    id: survey.id,
    kind: survey.kind,
    surveyedOn: survey.surveyedOn,
    uploadedBy: survey.uploadedBy?.name ?? null,
    uploadedAt: survey.createdAt.toISOString(),
    rowCount: survey.rowCount,
    soundingCount: survey.soundingCount,
    coverage: survey.coverage,
    status: survey.status,
    fileName: survey.fileName,
  };
}

function presentDetails(survey: Survey): SurveyDetails {
  return {
    ...presentListItem(survey),
    timeZone: survey.timeZone,
    waterSurfaceElevation: survey.waterSurfaceElevation,
    fileHasElevations: survey.fileHasElevations,
    datum: survey.datum,
    crs: survey.crs,
    lengthUnit: survey.lengthUnit,
    contentSha256: survey.contentSha256,
    retractedReason: survey.retractedReason ?? null,
    retractedBy: survey.retractedBy?.name ?? null,
    retractedAt: survey.retractedAt ? survey.retractedAt.toISOString() : null,
    qa: survey.qa,
    verticalBias: verticalBiasOf(survey),
  };
}

/**
 * Records (or, with null, clears) a survey's vertical-reference bias, audited with what it was.
 * Stored figures do not change (the bias only widens a pay period's ± band, computed on request);
 * a period's report signed before keeps the band it was issued with. Null when there is no such survey.
 */
export async function setSurveyVerticalBias(project: ProjectView, input: { surveyId: number; userId: number; ip: string | null; bias: VerticalBias | null }): Promise<VerticalBias | null | undefined> {
  return getSequelize().transaction(async (transaction) => {
    // The project's row first, then the survey's, as every survey change takes them (an import's
    // commit, a retraction): taken the other way, its audit record (whose key names the project)
    // waited for the project while such a change waited for the survey, and one was refused.
    await Project.findByPk(project.id, { attributes: ["id"], transaction, lock: transaction.LOCK.UPDATE });
    const survey = await Survey.findOne({ where: { id: input.surveyId, projectId: project.id }, transaction, lock: transaction.LOCK.UPDATE });
    if (!survey) return undefined;
    const before = verticalBiasOf(survey);
    survey.verticalBiasValue = input.bias?.value ?? null;
    survey.verticalBiasUnit = input.bias?.unit ?? null;
    survey.verticalBiasSource = input.bias?.source ?? null;
    await survey.save({ transaction });
    await recordAudit(
      { action: AUDIT_ACTIONS.surveyBiasSet, projectId: project.id, userId: input.userId, ip: input.ip, detail: { surveyId: survey.id, surveyedOn: survey.surveyedOn, before, after: input.bias } },
      transaction,
    );
    return input.bias;
  });
}

export async function listSurveys(project: ProjectView): Promise<SurveyListItem[]> {
  const surveys = await Survey.findAll({ where: { projectId: project.id }, include: withUsers, order: [["surveyedOn", "DESC"], ["id", "DESC"]] });
  return surveys.map(presentListItem);
}

export async function getSurveyDetails(project: ProjectView, surveyId: number): Promise<SurveyDetails | null> {
  const survey = await Survey.findOne({ where: { id: surveyId, projectId: project.id }, include: withUsers });
  return survey ? presentDetails(survey) : null;
}

export interface SoundingRow {
  sourceRow: number;
  pointId: string | null;
  easting: number;
  northing: number;
  depth: number | null;
  probe: number | null;
  elevation: number;
  refusalElevation: number | null;
  time: string | null;
}

export const SOUNDING_PAGE_SIZE = 100;

export async function listSoundings(project: ProjectView, surveyId: number, page: number) {
  const survey = await Survey.findOne({ where: { id: surveyId, projectId: project.id }, attributes: ["id", "soundingCount"] });
  if (!survey) return null;
  const rows = await Sounding.findAll({
    where: { surveyId: survey.id },
    order: [["sourceRow", "ASC"], ["id", "ASC"]],
    limit: SOUNDING_PAGE_SIZE,
    offset: (page - 1) * SOUNDING_PAGE_SIZE,
    raw: true,
  });
  const soundings: SoundingRow[] = rows.map((row) => ({
    sourceRow: row.sourceRow, pointId: row.pointId, easting: row.easting, northing: row.northing, depth: row.depth,
    probe: row.probe, elevation: row.elevation, refusalElevation: row.refusalElevation, time: row.time,
  }));
  return { soundings, page, pageCount: Math.max(1, Math.ceil(survey.soundingCount / SOUNDING_PAGE_SIZE)), total: survey.soundingCount };
}

/** A thinned sample of a survey's soundings (every n-th, at most `limit`) for the small map. */
export async function sampleSoundingPositions(project: ProjectView, surveyId: number, limit = 4000): Promise<Array<[number, number]>> {
  const survey = await Survey.findOne({ where: { id: surveyId, projectId: project.id }, attributes: ["id", "soundingCount"] });
  if (!survey) return [];
  const step = Math.max(1, Math.ceil(survey.soundingCount / limit));
  const rows = await Sounding.findAll({ where: { surveyId: survey.id }, attributes: ["id", "easting", "northing"], order: [["id", "ASC"]], raw: true });
  const points: Array<[number, number]> = [];
  for (let index = 0; index < rows.length; index += step) points.push([rows[index].easting, rows[index].northing]);
  return points;
}

export interface ProjectStatistics {
  totals: FigureTotals | null;
  asOf: string | null;
  statusCounts: Partial<Record<CellStatus, number>>;
  history: Array<{ surveyedOn: string; totals: FigureTotals }>;
}

export async function getProjectStatistics(project: ProjectView): Promise<ProjectStatistics> {
  const snapshots = await SurveySnapshot.findAll({ where: { projectId: project.id }, attributes: ["surveyedOn", "totals"], order: [["surveyedOn", "ASC"]] });
  const history = snapshots.map((snapshot) => ({ surveyedOn: snapshot.surveyedOn, totals: snapshot.totals }));
  const cells = await CellResult.findAll({ where: { projectId: project.id }, attributes: ["status"], raw: true });
  const statusCounts: Partial<Record<CellStatus, number>> = {};
  for (const cell of cells) statusCounts[cell.status] = (statusCounts[cell.status] ?? 0) + 1;
  const latest = history[history.length - 1] ?? null;
  return { totals: latest?.totals ?? null, asOf: latest?.surveyedOn ?? null, statusCounts, history };
}
