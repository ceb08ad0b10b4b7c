import { createCrs } from "../../shared/crs";
import { cellPolygon, createCellGrid } from "../../shared/grid/cell-grid";
import { csvLine, type CsvValue } from "../../shared/csv-safe";
import { selectSurveysInForce } from "../../shared/surveys-in-force";
import { unitLabel } from "../../shared/units";
import { UNZONED_NOTE } from "../../shared/volumes/rollup";
import { CellResult, ProjectSettingsVersion, Survey, SurveySnapshot, User, Zone } from "~/lib/db.server";
import { resolveCrsDefinition } from "~/lib/geo/epsg.server";
import { loadProjectGeometry } from "~/lib/engine/project-geometry.server";
import { loadProgress, type ProgressFigures, type ProgressView } from "./progress.server";
import type { StoredCellFigures } from "./cells-presenter";
import type { ProjectView } from "~/lib/auth/project-view.server";
import { presentStoredCellFigures } from "./cells-presenter";
import { loadPayPeriod, periodCellRows, surfaceMethodWords, type PayPeriodView, type PeriodQuery, type PeriodSurvey } from "./pay-periods.server";
import { PERIOD_VOLUME_KEYS } from "../../shared/volumes/period";

/**
 * Quantities for pay applications: the survey pair they rest on, the method in words, zone
 * totals and per-cell figures, as plain data for the CSV, the GeoJSON and the printable report.
 */

export interface SurveyRef {
  id: number;
  kind: string;
  surveyedOn: string;
  datum: string;
}

export interface QuantitiesView {
  project: { id: number; name: string; crs: string; lengthLabel: string; lengthLabelLong: string; volumeLabel: string; cellSize: number; rasterResolution: number };
  baseline: SurveyRef | null;
  latest: SurveyRef | null;
  method: string;
  progress: ProgressView;
  cells: Array<StoredCellFigures & { zone: string | null; latestSurveyOn: string | null }>;
  /** The pay period asked for (default: the baseline to the latest survey); null without figures. */
  period: PayPeriodView | null;
  /** The settings version the stored figures were computed with (the settings page's history); null: before the history began, or no figures. */
  settingsVersion: { version: number; savedAt: string; savedBy: string | null } | null;
}

/** The settings version named by the latest snapshot: the one the stored figures were computed with. */
async function figuresSettingsVersion(projectId: number): Promise<QuantitiesView["settingsVersion"]> {
  const snapshot = await SurveySnapshot.findOne({ where: { projectId }, order: [["surveyedOn", "DESC"]], attributes: ["id", "settingsVersionId"] });
  if (!snapshot?.settingsVersionId) return null;
  const version = await ProjectSettingsVersion.findByPk(snapshot.settingsVersionId, { include: [{ model: User, as: "changedBy", attributes: ["id", "name", "email"] }] });
  return version && { version: version.version, savedAt: version.createdAt.toISOString(), savedBy: version.changedBy ? version.changedBy.name || version.changedBy.email : null };
}

/** The settings version in words, for the CSV and the printed report. */
export function settingsVersionWords(version: QuantitiesView["settingsVersion"]): string {
  if (!version) return "not recorded (computed before the settings history began)";
  return `version ${version.version}, saved ${version.savedAt.slice(0, 16).replace("T", " ")} UTC${version.savedBy ? ` by ${version.savedBy}` : ""} (the project's settings history)`;
}

/** `period`: the pay period's ends (survey ids); a bad one throws a ValidationError naming `from` or `to`. */
export async function loadQuantities(project: ProjectView, period: PeriodQuery = {}): Promise<QuantitiesView> {
  const [payPeriod, progress, surveys, zones, cells, settingsVersion] = await Promise.all([
    loadPayPeriod(project, period),
    loadProgress(project),
    Survey.findAll({ where: { projectId: project.id, status: "active" }, attributes: ["id", "kind", "surveyedOn", "datum"] }),
    Zone.findAll({ where: { projectId: project.id }, attributes: ["id", "name"] }),
    CellResult.findAll({ where: { projectId: project.id }, order: [["row", "ASC"], ["col", "ASC"]] }),
    figuresSettingsVersion(project.id),
  ]);
  const ref = (survey: Survey | undefined): SurveyRef | null =>
    survey ? { id: survey.id, kind: survey.kind, surveyedOn: String(survey.surveyedOn), datum: survey.datum } : null;
  // The quantities rest on the surveys the figures were computed from.
  const inForce = selectSurveysInForce(surveys);
  const zoneName = new Map(zones.map((zone) => [zone.id, zone.name]));
  const surveyDate = new Map(surveys.map((survey) => [survey.id, String(survey.surveyedOn)]));
  const length = unitLabel(project.lengthUnit);
  const volumeLabel = unitLabel(project.lengthUnit, "volume");
  return {
    project: {
      id: project.id,
      name: project.name,
      crs: project.crs,
      lengthLabel: length,
      lengthLabelLong: unitLabel(project.lengthUnit, "length-long"),
      volumeLabel,
      cellSize: project.grid.cellSize,
      rasterResolution: project.grid.rasterResolution,
    },
    baseline: ref(inForce?.baseline),
    latest: ref(inForce?.later.at(-1) ?? inForce?.baseline),
    method:
      surfaceMethodWords(project.grid, length) +
      "Planned = baseline muck top down to firm sand (probe refusal); removed = baseline down to the latest bottom; remaining = latest bottom down to firm sand. " +
      `Volumes in ${volumeLabel}.`,
    progress,
    period: payPeriod,
    settingsVersion,
    cells: cells
      .filter((cell) => cell.areaInLimit > 0)
      .map((cell) => ({
        ...presentStoredCellFigures(cell),
        zone: cell.zoneId === null ? null : zoneName.get(Number(cell.zoneId)) ?? null,
        latestSurveyOn: cell.latestSurveyId === null ? null : surveyDate.get(Number(cell.latestSurveyId)) ?? null,
      })),
  };
}

function surveyWords(survey: SurveyRef | null): string {
  return survey ? `${survey.kind} survey of ${survey.surveyedOn} (#${survey.id}, ${survey.datum})` : "none";
}

/** A period's end in words: date, kind, id, the file's name and its SHA-256. */
export function periodSurveyWords(survey: PeriodSurvey): string {
  return `${survey.kind} survey of ${survey.surveyedOn} (#${survey.id}, ${survey.datum}), file ${survey.fileName}, SHA-256 ${survey.contentSha256}`;
}

export function periodSettingsWords(period: PayPeriodView): string {
  const { settings, lengthLabel } = period;
  return `over-dredge allowance ${settings.overDredgeAllowance} ${lengthLabel}; firm-sand tolerance ${settings.firmSandTolerance} ${lengthLabel}; ` +
    `cell size ${settings.cellSize} ${lengthLabel}; raster resolution ${settings.rasterResolution} ${lengthLabel}; longest triangle edge ${settings.maxEdge} ${lengthLabel}`;
}

function zoneRow(name: string, figures: ProgressFigures): CsvValue[] {
  return [
    name, figures.plannedVolume, figures.removedVolume, figures.remainingVolume,
    figures.percentCompleteByVolume, figures.cells, figures.cellsAtFirmSand, figures.cellsConfirmed,
    figures.percentCellsAtFirmSand, figures.lastSurveyOn ?? "",
  ];
}

/** The quantities CSV: a header block, zone totals, then one row per cell. Every text field is formula-safe. */
export function quantitiesCsv(view: QuantitiesView, generatedAt: Date): string {
  const { project, progress } = view;
  const volume = project.volumeLabel;
  const lines: string[] = [];
  lines.push(csvLine(["Firmsand quantities"]));
  lines.push(csvLine(["Project", project.name]));
  lines.push(csvLine(["Baseline survey", surveyWords(view.baseline)]));
  lines.push(csvLine(["Latest survey", surveyWords(view.latest)]));
  lines.push(csvLine(["Coordinate reference system", project.crs]));
  lines.push(csvLine(["Units", `volumes in ${volume}; lengths in ${project.lengthLabelLong} (${project.lengthLabel}); areas in ${project.lengthLabel}²`]));
  lines.push(csvLine(["Method", view.method]));
  lines.push(csvLine(["Settings version", settingsVersionWords(view.settingsVersion)]));
  lines.push(csvLine(["Generated", generatedAt.toISOString()]));
  if (progress.zones.some((zone) => zone.zoneId === null)) lines.push(csvLine(["Zone rows", UNZONED_NOTE]));
  const period = view.period;
  if (period) {
    lines.push("\r\n");
    lines.push(csvLine(["Pay period"]));
    lines.push(csvLine(["Period from", periodSurveyWords(period.from)]));
    lines.push(csvLine(["Period to", periodSurveyWords(period.to)]));
    lines.push(csvLine(["Period method", period.method]));
    lines.push(csvLine(["Settings in force", periodSettingsWords(period)]));
    lines.push(csvLine(["Uncertainty", period.uncertainty]));
    lines.push(csvLine([
      "period zone", `removed (${volume})`, `paid (${volume})`, `over-dredge (${volume})`, `deposited (${volume})`, `remaining at end (${volume})`, "cells",
      `removed ± 95 % (${volume})`,
    ]));
    for (const zone of period.figures.zones) lines.push(csvLine([zone.name, ...PERIOD_VOLUME_KEYS.map((key) => zone[key]), zone.cells, zone.removedBandVolume], 2));
    const periodTotal = period.figures.total;
    lines.push(csvLine(["Period project total", ...PERIOD_VOLUME_KEYS.map((key) => periodTotal[key]), periodTotal.cells, periodTotal.removedBandVolume], 2));
  }
  lines.push("\r\n");
  lines.push(csvLine(["Zone totals"]));
  lines.push(csvLine([
    "zone", `planned (${volume})`, `removed (${volume})`, `remaining (${volume})`, "complete by volume (%)",
    "cells", "cells at firm sand", "cells confirmed", "cells at firm sand (%)", "last survey",
  ]));
  for (const zone of progress.zones) lines.push(csvLine(zoneRow(zone.name, zone), 2));
  lines.push(csvLine(zoneRow("Project total", progress.total), 2));
  lines.push("\r\n");
  lines.push(csvLine(["Cells"]));
  lines.push(csvLine([
    "cell", "row", "col", "zone", "status", `planned (${volume})`, `removed (${volume})`, `deposited (${volume})`, `remaining (${volume})`,
    `mean remaining thickness (${project.lengthLabel})`, "surveyed coverage (0-1)", `area in work limit (${project.lengthLabel}²)`, "latest survey",
    ...(period ? [`period removed (${volume})`, `period paid (${volume})`, `period over-dredge (${volume})`, `period deposited (${volume})`, `remaining at period end (${volume})`] : []),
  ]));
  const periodCells = new Map(period && periodCellRows(period.figures).map((cell) => [cell.label, cell]));
  for (const cell of view.cells) {
    const inPeriod = periodCells.get(cell.label);
    lines.push(
      csvLine([
        cell.label, cell.row, cell.col, cell.zone ?? "", cell.status, cell.plannedVolume, cell.removedVolume, cell.depositedVolume, cell.remainingVolume,
        cell.meanRemainingThickness, cell.coverage, cell.areaInLimit, cell.latestSurveyOn ?? "",
        ...(period ? PERIOD_VOLUME_KEYS.map((key) => inPeriod?.[key] ?? "") : []),
      ]),
    );
  }
  return lines.join("");
}

/** The cells as a GeoJSON FeatureCollection in lon/lat (RFC 7946) with their figures. */
export async function quantitiesGeoJson(view: QuantitiesView): Promise<GeoJSON.FeatureCollection<GeoJSON.Polygon> & { period?: unknown }> {
  const geometry = await loadProjectGeometry(view.project.id);
  if (!geometry.workLimit) return { type: "FeatureCollection", features: [] };
  const grid = createCellGrid(geometry.workLimit, {
    cellSize: geometry.settings.cellSize,
    originX: geometry.settings.originX,
    originY: geometry.settings.originY,
    rotationDegrees: geometry.settings.rotationDegrees,
  });
  const crs = createCrs(resolveCrsDefinition(view.project.crs).definition);
  const period = view.period;
  const periodCells = new Map(period && periodCellRows(period.figures).map((cell) => [cell.label, cell]));
  return {
    type: "FeatureCollection",
    // A foreign member (RFC 7946 §6.1): what the period columns of every feature rest on.
    ...(period ? { period: { from: period.from, to: period.to, method: period.method, uncertainty: period.uncertainty, settings: period.settings, volumeUnit: period.volumeLabel, lengthUnit: period.lengthLabel, total: period.figures.total, zones: period.figures.zones } } : {}),
    features: view.cells.map((cell) => {
      const inPeriod = periodCells.get(cell.label);
      return {
        type: "Feature",
        geometry: { type: "Polygon", coordinates: [cellPolygon(grid, cell.row, cell.col).map(([x, y]) => crs.toLonLat(x, y))] },
        properties: {
          ...cell, volumeUnit: view.project.volumeLabel, lengthUnit: view.project.lengthLabel,
          ...(inPeriod ? { periodRemovedVolume: inPeriod.removedVolume, periodPaidVolume: inPeriod.paidVolume, periodOverDredgeVolume: inPeriod.overDredgeVolume, periodDepositedVolume: inPeriod.depositedVolume, periodEndRemainingVolume: inPeriod.remainingVolume } : {}),
        },
      };
    }),
  };
}
