import { z } from "zod";
import { surveyOrderSchema, tvuCoefficients, type SurveyOrder } from "../../shared/qa/tvu";
import { biasInUnit, verticalBiasWords, type VerticalBias } from "../../shared/qa/vertical-bias";
import { unitLabel, type LengthUnit } from "../../shared/units";
import { PERIOD_VOLUME_KEYS, type PeriodVolumes } from "../../shared/volumes/period";
import { AUDIT_ACTIONS, recordAudit } from "~/lib/audit/audit.server";
import type { ProjectView } from "~/lib/auth/project-view.server";
import type { UserView } from "~/lib/auth/users.server";
import { PayPeriodReport, Survey, getSequelize, type PayPeriodSnapshot } from "~/lib/db.server";
import { createHash } from "node:crypto";
import { BoundedCache } from "~/lib/cache/bounded-cache";
import { getEngineState, projectRecomputeStamp, serverEnginePool } from "~/lib/engine/engine-state.server";
import { computePeriodFigures, periodFiguresInput, type PeriodFigures } from "~/lib/engine/period-figures";
import { monthName, monthPeriod, monthsWithPeriods } from "../../shared/volumes/named-period";
import { loadProjectGeometry } from "~/lib/engine/project-geometry.server";
import { NotFoundError, ValidationError } from "~/lib/errors";
import { verticalBiasOf } from "~/models/survey.server";

/** A period's cells as rows (its figures keep them as columns). */
export { periodCellRows } from "~/lib/engine/period-figures";

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
  /** IHO S-44 order the survey was checked against: its TVU at 95 % is √(a² + (b·d)²) at each depth d. */
  order: SurveyOrder;
  /** Where the band's depths come from: the survey's water-surface elevation minus the bottom, node by node; its median depth; or none (a alone). */
  depths: { from: "water-surface"; waterSurfaceElevation: number } | { from: "median-depth"; medianDepth: number } | { from: "none" };
  /** The most the survey's vertical reference may be off (95 %), as recorded; null when none is. */
  bias: VerticalBias | null;
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
 * A survey's IHO S-44 order as its import recorded it (its QA), and where its depths are measured
 * from: its own water-surface elevation, else the project's newest (a file of elevations sounded
 * from the same water), else the median depth its QA recorded, else none (the depth-independent part alone).
 */
function surveyUncertainty(qa: Record<string, unknown>, waterSurface: number | null, projectWaterSurface: number | null): Pick<PeriodSurvey, "order" | "depths"> {
  // Every import records its order; "1a" is the import form's default, for a row from before that.
  const order = surveyOrderSchema.catch("1a").parse(qa.order ?? qa.surveyOrder);
  const level = waterSurface ?? projectWaterSurface;
  if (level !== null) return { order, depths: { from: "water-surface", waterSurfaceElevation: level } };
  const median = typeof qa.medianDepth === "number" && Number.isFinite(qa.medianDepth) ? qa.medianDepth : null;
  return { order, depths: median === null ? { from: "none" } : { from: "median-depth", medianDepth: median } };
}

/** A survey's part of the band's input (shared/volumes/period-uncertainty.ts), without its soundings per cell. */
function bandSurvey(survey: PeriodSurvey, unit: LengthUnit) {
  const { depths } = survey;
  return {
    ...tvuCoefficients(survey.order, unit),
    waterSurfaceElevation: depths.from === "water-surface" ? depths.waterSurfaceElevation : null,
    fallbackDepth: depths.from === "median-depth" ? depths.medianDepth : null,
    bias: biasInUnit(survey.bias, unit),
  };
}

function depthWords(survey: PeriodSurvey, length: string): string {
  const { depths } = survey;
  if (depths.from === "water-surface") return `depths from the water surface at ${depths.waterSurfaceElevation} ${length}`;
  if (depths.from === "median-depth") return `its median depth ${depths.medianDepth.toFixed(2)} ${length} (no water-surface elevation)`;
  return "no depths known (a alone)";
}

/** The band's method in words, with each survey's order, TVU and recorded reference bias, and what a bias does to removed. */
function uncertaintyWords(surveys: readonly PeriodSurvey[], biasVolumePerUnit: number, unit: LengthUnit, length: string, volume: string): string {
  const tenth = (Math.round(biasVolumePerUnit * 0.1 * 10) / 10).toLocaleString("en-US");
  const anyBias = surveys.some((survey) => survey.bias !== null);
  return (
    "± on removed: 95 % band from the surveys' vertical uncertainty (IHO S-44 ed. 6.0.0, table 1: TVU = √(a² + (b·d)²) for the survey's order at each depth d, " +
    "d = the survey's water-surface elevation − the bottom at each raster node, TVU² averaged over the cell), " +
    "taken as each sounding's random error and averaged over the soundings of each cell (1/√n) that changed in the period; " +
    "each survey's recorded reference bias (water level, datum), a systematic bias that shifts the whole surface, enters as the area it carries at the period's start less the area it carries at its end × the bias and does not average down; " +
    "the random part of both ends and every survey's bias added in quadrature. " +
    `Surveys: ${surveys.map((survey) => { const { a, b } = tvuCoefficients(survey.order, unit); return `#${survey.id} order ${survey.order} (a ${a.toFixed(2)} ${length}, b ${b}), ${depthWords(survey, length)}, reference bias ${verticalBiasWords(survey.bias)}`; }).join("; ")}. ` +
    `Each 0.1 ${length} of reference bias at one end moves removed by about ${tenth} ${volume}${anyBias ? "" : "; no survey has a bias recorded, so none is in the band"}.`
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
 * What every period of the project is computed from now: the engine state under its recompute
 * stamp, the geometry, the surveys in force with their files and uncertainty, and `version`, the
 * digest of everything else a period's figures depend on (zones, settings, allowance, unit, the
 * surveys' orders, water surfaces and reference biases). Null when the project has no figures.
 */
async function periodContext(project: ProjectView) {
  const stamp = await projectRecomputeStamp(project.id);
  const state = await getEngineState(project.id, stamp);
  if (!state) return null;
  const geometry = await loadProjectGeometry(project.id);
  const inForce = state.periods.surveys;
  const rows = await Survey.findAll({ where: { projectId: project.id, id: inForce.map((survey) => survey.id) }, attributes: ["id", "kind", "surveyedOn", "datum", "fileName", "contentSha256", "qa", "waterSurfaceElevation", "verticalBiasValue", "verticalBiasUnit", "verticalBiasSource"] });
  const byId = new Map(rows.map((row) => [row.id, row]));
  const surveys: PeriodSurvey[] = inForce.map((survey) => {
    const row = byId.get(survey.id);
    return { id: survey.id, kind: survey.kind, surveyedOn: survey.surveyedOn, datum: row?.datum ?? "", fileName: row?.fileName ?? "", contentSha256: row?.contentSha256 ?? "", ...surveyUncertainty(row?.qa ?? {}, row?.waterSurfaceElevation ?? null, state.surfaces.waterSurfaceElevation), bias: row ? verticalBiasOf(row) : null };
  });
  const inputs = {
    zones: geometry.zones, settings: geometry.settings, overDredgeAllowance: project.grid.overDredgeAllowance, lengthUnit: project.lengthUnit,
    uncertainty: surveys.map((survey) => bandSurvey(survey, project.lengthUnit)),
  };
  const version = createHash("sha256").update(JSON.stringify(inputs)).digest("base64url").slice(0, 22);
  return { stamp, state, surveys, inputs, version };
}
type PeriodContext = NonNullable<Awaited<ReturnType<typeof periodContext>>>;

// A period's figures per project, recompute stamp, surveys in force, the two ends and the version
// of the other inputs: one pass over every raster node (a second or more for a large bay), made in
// the engine pool from the state's rasters (held in shared memory, so nothing is copied), then
// read by the page, the report, the exports and the signed periods' comparison until something
// they rest on changes. Each holds a column per figure over the cells (megabytes at bay scale): a
// few at a time.
const PERIODS_HELD = 8;
const periodCache = new BoundedCache<PeriodFigures>(PERIODS_HELD);

function periodKey(project: ProjectView, context: PeriodContext, from: number, to: number): string {
  return `${project.id}:${context.stamp}:${context.surveys.map((survey) => survey.id).join(",")}:${context.surveys[from].id}-${context.surveys[to].id}:${context.version}`;
}

/** The period's figures, computed once per version of what they rest on, in the engine pool (on this thread only with ENGINE_THREADS=0). */
function periodFigures(project: ProjectView, context: PeriodContext, from: number, to: number): Promise<PeriodFigures> {
  const current = `${project.id}:${context.stamp}:`;
  // A period of an older stamp is never read again: let it go now rather than when it ages out.
  periodCache.dropWhere((key) => key.startsWith(`${project.id}:`) && !key.startsWith(current));
  return periodCache.getOrCompute(periodKey(project, context, from, to), async () => {
    const input = periodFiguresInput(context.state, from, to, context.inputs);
    const pool = serverEnginePool();
    return pool ? pool.computePeriodFigures(input) : computePeriodFigures(input);
  });
}

/**
 * The period between two surveys in force (`from`, `to`: survey ids; absent: the baseline and
 * the latest). Null when the project has no figures (no baseline or no work limit). Throws a
 * ValidationError naming `from` or `to` for an id that is not a survey in force, or a `to` that
 * is not after `from`.
 */
export async function loadPayPeriod(project: ProjectView, query: PeriodQuery = {}): Promise<PayPeriodView | null> {
  const context = await periodContext(project);
  if (!context) return null;
  const { surveys } = context;
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
  const figures = await periodFigures(project, context, from, to);
  return {
    surveys, from: surveys[from], to: surveys[to], whole: from === 0 && to === surveys.length - 1,
    month: month === null ? null : { key: month, name: monthName(month) },
    months: monthsWithPeriods(surveys).map((key) => ({ key, name: monthName(key) })),
    volumeLabel, lengthLabel, settings, method: periodMethod(project, settings, lengthLabel, volumeLabel),
    uncertainty: uncertaintyWords(surveys.slice(0, to + 1), figures.total.biasVolumePerUnit, project.lengthUnit, lengthLabel, volumeLabel), figures,
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
  /** The same period recomputed now, minus the signed figures, per column of the project row; null when it cannot be recomputed or was not compared. */
  difference: PeriodVolumes | null;
  /** Why there is no difference (a survey retracted or superseded since); null when there is one or it was not compared. */
  recomputeNote: string | null;
  /** Whether the figures now were looked at: always for one report and the API; on the page's list only where they were already computed. */
  compared: boolean;
}

/**
 * The project's signed periods, newest first, as issued (their stored snapshots). `compare`:
 * "always" recomputes each period now for its difference (the API); "cached" gives the difference
 * only where the period's figures now are already computed (the page's list, which must not
 * recompute every period it lists on each load), and says which reports can no longer be recomputed.
 */
export async function listSignedPeriods(project: ProjectView, compare: "always" | "cached" = "always"): Promise<SignedPeriod[]> {
  const reports = await PayPeriodReport.findAll({ where: { projectId: project.id }, order: [["signedAt", "DESC"], ["id", "DESC"]] });
  if (reports.length === 0) return [];
  const context = await periodContext(project);
  const signed: SignedPeriod[] = [];
  for (const report of reports) signed.push(await presentSigned(project, report, context, compare));
  return signed;
}

/** One signed period of the project, as issued, beside its recompute now; a NotFoundError when the project has no such report. */
export async function getSignedPeriod(project: ProjectView, reportId: number): Promise<SignedPeriod> {
  const report = await PayPeriodReport.findOne({ where: { id: reportId, projectId: project.id } });
  if (!report) throw new NotFoundError("There is no such signed period in this project.");
  return presentSigned(project, report, await periodContext(project), "always");
}

const NO_LONGER_IN_FORCE = "One of its surveys is no longer in force (retracted or superseded), so the period cannot be recomputed; the signed figures stand as issued.";

async function presentSigned(project: ProjectView, report: PayPeriodReport, context: PeriodContext | null, compare: "always" | "cached"): Promise<SignedPeriod> {
  const issued = { id: report.id, signedName: report.signedName, signedAt: report.signedAt.toISOString(), snapshot: report.snapshot };
  if (!context) return { ...issued, difference: null, recomputeNote: "The project has no figures now.", compared: true };
  const from = context.surveys.findIndex((survey) => survey.id === report.fromSurveyId);
  const to = context.surveys.findIndex((survey) => survey.id === report.toSurveyId);
  if (from < 0 || to < 0 || !(from < to)) return { ...issued, difference: null, recomputeNote: NO_LONGER_IN_FORCE, compared: true };
  const figures = compare === "always" ? periodFigures(project, context, from, to) : periodCache.peek(periodKey(project, context, from, to));
  if (!figures) return { ...issued, difference: null, recomputeNote: null, compared: false };
  const now = (await figures).total;
  const total = report.snapshot.total;
  const difference = Object.fromEntries(PERIOD_VOLUME_KEYS.map((key) => [key, now[key] - total[key]])) as unknown as PeriodVolumes;
  return { ...issued, difference, recomputeNote: null, compared: true };
}
