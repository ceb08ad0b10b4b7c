import { fn, col } from "sequelize";
import { createCrs } from "../../shared/crs";
import { cellPolygon, parseCellLabel } from "../../shared/grid/cell-grid";
import { localDayOf } from "../../shared/local-time";
import { dayPlanState, type DayPlanState } from "../../shared/dive-plan/day-plan-state";
import { missingEmergencyItems, type EmergencyInfo } from "../../shared/dive-plan/emergency-info";
import type { LonLatRing } from "../../shared/progress/outline-svg";
import { Assignment, Dive, DiveTeam, Project } from "~/lib/db.server";
import { resolveCrsDefinition } from "~/lib/geo/epsg.server";
import { NotFoundError } from "~/lib/errors";
import type { ProjectView } from "~/lib/auth/project-view.server";
import type { DayPlanView } from "./assignments.server";

/**
 * The list of day plans (every date with assigned cells, newest first) and what the printed day
 * sheet carries beyond the plan itself: a small map of the day's cells inside the work limit and
 * the project's emergency information.
 */

export interface DayPlanSummary {
  date: string;
  teams: string[];
  cells: number;
  dives: number;
  state: DayPlanState;
}

export interface DayPlanPage {
  plans: DayPlanSummary[];
  page: number;
  pageSize: number;
  /** Dates with a plan, all pages. */
  total: number;
  pages: number;
  /** The project's today, YYYY-MM-DD, in its time zone. */
  today: string;
}

export const DAY_PLANS_PAGE_SIZE = 30;

/** One page of the project's day plans, newest first. A page past the last comes back empty. */
export async function listDayPlans(project: ProjectView, page = 1, pageSize = DAY_PLANS_PAGE_SIZE, now = Date.now()): Promise<DayPlanPage> {
  const where = { projectId: project.id };
  const today = localDayOf(now, project.timeZone);
  const total = await Assignment.count({ where, distinct: true, col: "workDate" });
  const rows = (await Assignment.findAll({
    where,
    attributes: ["workDate", [fn("COUNT", col("id")), "cells"]],
    group: ["workDate"],
    order: [["workDate", "DESC"]],
    limit: pageSize,
    offset: (page - 1) * pageSize,
    raw: true,
  })) as unknown as Array<{ workDate: string; cells: number | string }>;
  const dates = rows.map((row) => String(row.workDate).slice(0, 10));
  const [teamRows, diveRows, teams] = dates.length === 0
    ? [[], [], []]
    : await Promise.all([
        Assignment.findAll({ where: { ...where, workDate: dates }, attributes: ["workDate", "teamId"], group: ["workDate", "teamId"], raw: true }) as unknown as Promise<Array<{ workDate: string; teamId: number }>>,
        Dive.findAll({ where: { ...where, diveDate: dates }, attributes: ["diveDate", [fn("COUNT", col("id")), "dives"]], group: ["diveDate"], raw: true }) as unknown as Promise<Array<{ diveDate: string; dives: number | string }>>,
        DiveTeam.findAll({ where, attributes: ["id", "name", "sortOrder"], order: [["sortOrder", "ASC"], ["id", "ASC"]] }),
      ]);
  const teamOrder = new Map(teams.map((team, index) => [team.id, { name: team.name, index }]));
  const teamsOn = new Map<string, number[]>();
  for (const row of teamRows) {
    const date = String(row.workDate).slice(0, 10);
    teamsOn.set(date, [...(teamsOn.get(date) ?? []), row.teamId]);
  }
  const divesOn = new Map(diveRows.map((row) => [String(row.diveDate).slice(0, 10), Number(row.dives)]));
  const plans = rows.map((row, index) => {
    const date = dates[index];
    const dives = divesOn.get(date) ?? 0;
    const names = (teamsOn.get(date) ?? [])
      .map((id) => teamOrder.get(id) ?? { name: "a removed team", index: Number.MAX_SAFE_INTEGER })
      .sort((a, b) => a.index - b.index)
      .map((team) => team.name);
    return { date, teams: names, cells: Number(row.cells), dives, state: dayPlanState(date, today, dives) };
  });
  return { plans, page, pageSize, total, pages: Math.max(1, Math.ceil(total / pageSize)), today };
}

/** The day's cells drawn on the sheet: each assigned cell's outline with its team, inside the work limit, lon/lat. */
export interface DaySheetMap {
  workLimit: LonLatRing[][];
  cells: Array<{ label: string; team: string; teamIndex: number; ring: LonLatRing }>;
}

type LonLatGeometry = { type: "Polygon"; coordinates: LonLatRing[] } | { type: "MultiPolygon"; coordinates: LonLatRing[][] };

export interface DaySheetExtras {
  map: DaySheetMap | null;
  emergency: EmergencyInfo | null;
  /** What the emergency information lacks, in the sheet's words (every item when none is set). */
  emergencyMissing: string[];
  /** The project's today, YYYY-MM-DD: dives are logged on or before it. */
  today: string;
  timeZone: string;
}

/** The map and emergency information for a day's sheet; the map is null without a work limit. */
export async function getDaySheetExtras(project: ProjectView, plan: DayPlanView, now = Date.now()): Promise<DaySheetExtras> {
  const row = await Project.findByPk(project.id, { attributes: ["id", "crs", "workLimitGeoJson", "emergencyInfo"] });
  if (!row) throw new NotFoundError("There is no such project.");
  const emergency = row.emergencyInfo ?? null;
  let map: DaySheetMap | null = null;
  if (row.workLimitGeoJson) {
    const geometry = JSON.parse(row.workLimitGeoJson) as LonLatGeometry;
    const crs = createCrs(resolveCrsDefinition(row.crs).definition);
    const cells = plan.teams.flatMap(({ team, cells: teamCells }, teamIndex) =>
      teamCells.flatMap((cell) => {
        const position = parseCellLabel(cell.label);
        if (!position) return [];
        const ring = cellPolygon(project.grid, position.row, position.col).map(([x, y]) => crs.toLonLat(x, y) as [number, number]);
        return [{ label: cell.label, team: team.name, teamIndex, ring }];
      }),
    );
    map = { workLimit: geometry.type === "Polygon" ? [geometry.coordinates] : geometry.coordinates, cells };
  }
  return { map, emergency, emergencyMissing: missingEmergencyItems(emergency), today: localDayOf(now, project.timeZone), timeZone: project.timeZone };
}
