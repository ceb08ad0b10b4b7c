import { z } from "zod";
import { allowedTvu, surveyOrderSchema, type SurveyOrder } from "../../shared/qa/tvu";
import { unitLabel, type LengthUnit } from "../../shared/units";
import { PERIOD_VOLUME_KEYS, type PeriodVolumes } from "../../shared/volumes/period";
import { AUDIT_ACTIONS, recordAudit } from "~/lib/audit/audit.server";
import type { ProjectView } from "~/lib/auth/project-view.server";
import type { UserView } from "~/lib/auth/users.server";
import { PayPeriodReport, Survey, getSequelize, type PayPeriodSnapshot } from "~/lib/db.server";
import { getEngineState } from "~/lib/engine/engine-state.server";
import { computePeriodFigures, type PeriodFigures } from "~/lib/engine/period-figures";
import { monthName, monthPeriod, monthsWithPeriods } from "../../shared/volumes/named-period";
import { loadProjectGeometry } from "~/lib/engine/project-geometry.server";
import { NotFoundError, ValidationError } from "~/lib/errors";

/**
 * Pay periods: the figures between any two surveys in force (by default the baseline to the
 * latest, which are today's figures), computed from the project's engine state; and the reports
 * of periods the manager has signed, each kept as issued with later recomputes beside it.
 */

export interface PeriodSurvey {
  id: number;
  kind: string;
  surveyedOn: string;
  datum: string;
  fileName: string;
  contentSha256: string;
  /** IHO S-44 order the survey was checked against, and its allowed TVU at 95 % at the survey's median depth (project length unit). */
  order: SurveyOrder;
  tvu: number;
}

export interface PeriodSettings {
  /** Project length unit: how far below firm sand removal is still paid. */
  overDredgeAllowance: number;
  firmSandTolerance: number;
  cellSize: number;
  rasterResolution: number;
  maxEdge: number;
}

export interface PayPeriodView {
  /** The surveys in force, baseline first: the ends a period can have. */
  surveys: PeriodSurvey[];
  from: PeriodSurvey;
  to: PeriodSurvey;
  /** From the baseline to the latest survey in force: the project's figures as they stand. */
  whole: boolean;
  /** A named period's month ("2026-10") and its name ("October 2026"); null for a period given by its surveys. */
  month: { key: string; name: string } | null;
  /** The months that have a period of their own, newest first (for the month chooser). */
  months: Array<{ key: string; name: string }>;
  volumeLabel: string;
  lengthLabel: string;
  settings: PeriodSettings;
  method: string;
  /** How the removed volume's ± band was found, with the surveys' orders and TVU and the bias it leaves out. */
  uncertainty: string;
  figures: PeriodFigures;
}

/** The period's ends as the query string, the form or the API give them: survey ids as text; absent means the default. */
export interface PeriodQuery {
  from?: string | null;
  to?: string | null;
  /** A named period: a calendar month, "YYYY-MM" (shared/volumes/named-period.ts); not with from or to. */
  month?: string | null;
}

/** `?from=&to=` or `?month=` read as text: the model names a bad id or month (422), so a malformed value and an unknown one read alike. */
export const periodQuerySchema = z.object({ from: z.string().optional(), to: z.string().optional(), month: z.string().optional() });

function positionOf(surveys: readonly PeriodSurvey[], raw: string, field: "from" | "to"): number {
  const id = /^\d{1,10}$/.test(raw) ? Number(raw) : Number.NaN;
  const position = surveys.findIndex((survey) => survey.id === id);
  if (position < 0) {
    throw new ValidationError({ field, value: raw, message: `must be the id of one of this project's surveys in force (${surveys.map((survey) => survey.id).join(", ")})` });
  }
  return position;
}

/**
 * A survey's IHO S-44 order as its import recorded it (its QA), and the TVU allowed at its median
 * depth; the order's depth-independent part alone where the file gave elevations and no depths.
 */
function surveyTvu(qa: Record<string, unknown>, unit: LengthUnit): { order: SurveyOrder; tvu: number } {
  // Every import records its order; "1a" is the import form's default, for a row from before that.
  const order = surveyOrderSchema.catch("1a").parse(qa.order ?? qa.surveyOrder);
  const atMedian = typeof qa.allowanceAtMedianDepth === "number" && Number.isFinite(qa.allowanceAtMedianDepth) ? qa.allowanceAtMedianDepth : null;
  return { order, tvu: atMedian ?? allowedTvu(order, 0, unit) };
}

/** The band's method in words, with each survey's order and TVU and what a reference bias would add. */
function uncertaintyWords(surveys: readonly PeriodSurvey[], biasVolumePerUnit: number, length: string, volume: string): string {
  const tenth = (Math.round(biasVolumePerUnit * 0.1 * 10) / 10).toLocaleString("en-US");
  return (
    "± on removed: 95 % band from the surveys' vertical uncertainty (IHO S-44 ed. 6.0.0, table 1: TVU = √(a² + (b·d)²) for the survey's order at its median depth), " +
    "taken as each sounding's random error and averaged over the soundings of each cell (1/√n) that changed in the period, both ends and all cells added in quadrature. " +
    `Surveys: ${surveys.map((survey) => `#${survey.id} order ${survey.order}, TVU ${survey.tvu.toFixed(2)} ${length}`).join("; ")}. ` +
    `Not in the band: a systematic bias of the vertical reference (water level, datum) shifts a whole surface and does not average down; each 0.1 ${length} of it would move removed by about ${tenth} ${volume}.`
  );
}

/** How every survey becomes a volume, in words: the first sentence of the quantities' and the periods' methods. */
export function surfaceMethodWords(grid: { maxEdge: number; rasterResolution: number; cellSize: number }, length: string): string {
  return (
    `Surface to surface: each survey is a Delaunay triangulation of its soundings (no triangle edge longer than ${grid.maxEdge} ${length}), ` +
    `sampled on a ${grid.rasterResolution} ${length} raster inside the work limit and integrated over ${grid.cellSize} ${length} cells. `
  );
}

/** Text of the period method, with the settings in force. */
function periodMethod(project: ProjectView, settings: PeriodSettings, length: string, volume: string): string {
  return (
    surfaceMethodWords(settings, length) +
    "The bottom as of a survey takes, at each raster node, the newest survey in force up to it with data there, down to the baseline. " +
    "Removed = the bottom as of the first survey down to the bottom as of the second; paid = the part of it above the pay surface " +
    `(firm sand from the baseline's probe, less the over-dredge allowance of ${settings.overDredgeAllowance} ${length}); over-dredge = the part below the pay surface; ` +
    "deposited = where the bottom rose; remaining = the bottom as of the second survey down to firm sand. " +
    `Volumes in ${volume}.${project.lengthUnit === "us-ft" ? " A cubic yard is 27 cubic (survey) feet." : ""}`
  );
}

/**
 * The period between two surveys in force (`from`, `to`: survey ids; absent: the baseline and
 * the latest). Null when the project has no figures (no baseline or no work limit). Throws a
 * ValidationError naming `from` or `to` for an id that is not a survey in force, or a `to` that
 * is not after `from`.
 */
export async function loadPayPeriod(project: ProjectView, query: PeriodQuery = {}): Promise<PayPeriodView | null> {
  const state = await getEngineState(project.id);
  if (!state) return null;
  const geometry = await loadProjectGeometry(project.id);
  const inForce = state.periods.surveys;
  const rows = await Survey.findAll({ where: { projectId: project.id, id: inForce.map((survey) => survey.id) }, attributes: ["id", "kind", "surveyedOn", "datum", "fileName", "contentSha256", "qa"] });
  const byId = new Map(rows.map((row) => [row.id, row]));
  const surveys: PeriodSurvey[] = inForce.map((survey) => {
    const row = byId.get(survey.id);
    return { id: survey.id, kind: survey.kind, surveyedOn: survey.surveyedOn, datum: row?.datum ?? "", fileName: row?.fileName ?? "", contentSha256: row?.contentSha256 ?? "", ...surveyTvu(row?.qa ?? {}, project.lengthUnit) };
  });
  let from = query.from ? positionOf(surveys, query.from, "from") : 0;
  let to = query.to ? positionOf(surveys, query.to, "to") : surveys.length - 1;
  const month = query.month ?? null;
  if (month !== null) {
    if (query.from || query.to) throw new ValidationError({ field: "month", value: month, message: "names the period by itself: give either month or from and to, not both" });
    const named = monthPeriod(surveys, month);
    if (named.error !== undefined) throw new ValidationError({ field: "month", value: month, message: named.error });
    ({ from, to } = named);
  }
  if (!(from < to)) {
    if (surveys.length < 2) throw new ValidationError({ field: "to", message: "there is only the baseline so far: a period needs a later survey" });
    throw new ValidationError({ field: "to", value: query.to ?? String(surveys[to].id), message: `must be a survey in force after the one named in from (survey ${surveys[from].id} of ${surveys[from].surveyedOn})` });
  }
  const grid = project.grid;
  const settings: PeriodSettings = { overDredgeAllowance: grid.overDredgeAllowance, firmSandTolerance: grid.tolerance, cellSize: grid.cellSize, rasterResolution: grid.rasterResolution, maxEdge: grid.maxEdge };
  const lengthLabel = unitLabel(project.lengthUnit);
  const volumeLabel = unitLabel(project.lengthUnit, "volume");
  const figures = computePeriodFigures({
    surfaces: state.surfaces, periods: state.periods, from, to,
    zones: geometry.zones, settings: geometry.settings, overDredgeAllowance: grid.overDredgeAllowance, lengthUnit: project.lengthUnit,
    tvu: surveys.map((survey) => survey.tvu),
  });
  return {
    surveys, from: surveys[from], to: surveys[to], whole: from === 0 && to === surveys.length - 1,
    month: month === null ? null : { key: month, name: monthName(month) },
    months: monthsWithPeriods(surveys).map((key) => ({ key, name: monthName(key) })),
    volumeLabel, lengthLabel, settings, method: periodMethod(project, settings, lengthLabel, volumeLabel),
    uncertainty: uncertaintyWords(surveys.slice(0, to + 1), figures.total.biasVolumePerUnit, lengthLabel, volumeLabel), figures,
  };
}

/** The part of a period view that a signed report keeps (no cells: the zone and project rows). */
function snapshotOf(period: PayPeriodView): PayPeriodSnapshot {
  return {
    from: period.from, to: period.to, volumeLabel: period.volumeLabel, lengthLabel: period.lengthLabel, settings: period.settings, method: period.method, uncertainty: period.uncertainty,
    total: period.figures.total, zones: period.figures.zones,
  };
}

/**
 * Signs the period's report: its figures now, the surveys and settings they rest on, the typed
 * name and the time, stored as issued, and an audit entry. Returns the report's id.
 */
export async function signPayPeriod(project: ProjectView, user: UserView, input: { from: string; to: string; signedName: string }, ip: string | null): Promise<number> {
  const signedName = input.signedName.trim();
  if (signedName.length === 0) throw new ValidationError({ field: "signedName", message: "Type your name to sign the period's report" });
  if (signedName.length > 200) throw new ValidationError({ field: "signedName", message: "at most 200 characters" });
  const period = await loadPayPeriod(project, { from: input.from, to: input.to });
  if (!period) throw new ValidationError({ field: "from", message: "The project has no figures yet (no baseline survey or no work limit), so there is no period to sign." });
  const snapshot = snapshotOf(period);
  return getSequelize().transaction(async (transaction) => {
    const report = await PayPeriodReport.create(
      { projectId: project.id, fromSurveyId: period.from.id, toSurveyId: period.to.id, signedName, signedById: user.id, signedAt: new Date(), snapshot },
      { transaction },
    );
    await recordAudit(
      {
        action: AUDIT_ACTIONS.payPeriodSigned, projectId: project.id, userId: user.id, ip,
        detail: { reportId: report.id, fromSurveyId: period.from.id, toSurveyId: period.to.id, signedName, paidVolume: snapshot.total.paidVolume, overDredgeVolume: snapshot.total.overDredgeVolume, volumeUnit: period.volumeLabel },
      },
      transaction,
    );
    return report.id;
  });
}

export interface SignedPeriod {
  id: number;
  signedName: string;
  signedAt: string;
  snapshot: PayPeriodSnapshot;
  /** The same period recomputed now, minus the signed figures, per column of the project row; null when it cannot be recomputed. */
  difference: PeriodVolumes | null;
  /** Why there is no difference (a survey retracted or superseded since). */
  recomputeNote: string | null;
}

/** The project's signed periods, newest first, each beside its recompute now. */
export async function listSignedPeriods(project: ProjectView): Promise<SignedPeriod[]> {
  const reports = await PayPeriodReport.findAll({ where: { projectId: project.id }, order: [["signedAt", "DESC"], ["id", "DESC"]] });
  const signed: SignedPeriod[] = [];
  for (const report of reports) signed.push(await presentSigned(project, report));
  return signed;
}

/** One signed period of the project, as issued, beside its recompute now; a NotFoundError when the project has no such report. */
export async function getSignedPeriod(project: ProjectView, reportId: number): Promise<SignedPeriod> {
  const report = await PayPeriodReport.findOne({ where: { id: reportId, projectId: project.id } });
  if (!report) throw new NotFoundError("There is no such signed period in this project.");
  return presentSigned(project, report);
}

async function presentSigned(project: ProjectView, report: PayPeriodReport): Promise<SignedPeriod> {
  let difference: PeriodVolumes | null = null;
  let recomputeNote: string | null = null;
  try {
    const now = await loadPayPeriod(project, { from: String(report.fromSurveyId), to: String(report.toSurveyId) });
    if (now) {
      const total = report.snapshot.total;
      difference = Object.fromEntries(PERIOD_VOLUME_KEYS.map((key) => [key, now.figures.total[key] - total[key]])) as unknown as PeriodVolumes;
    } else recomputeNote = "The project has no figures now.";
  } catch (error) {
    if (!(error instanceof ValidationError)) throw error;
    recomputeNote = "One of its surveys is no longer in force (retracted or superseded), so the period cannot be recomputed; the signed figures stand as issued.";
  }
  return { id: report.id, signedName: report.signedName, signedAt: report.signedAt.toISOString(), snapshot: report.snapshot, difference, recomputeNote };
}
