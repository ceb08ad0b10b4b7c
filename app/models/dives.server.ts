import { Op } from "sequelize";
import { parseCellLabel } from "../../shared/grid/cell-grid";
import { z } from "zod";
import { NO_DECOMPRESSION_CAUTION, NO_DECOMPRESSION_SOURCE } from "../../shared/no-decompression";
import { Assignment, CellResult, Dive, DiveCell, DiveTeam, distinctProjectDates, getSequelize } from "~/lib/db.server";
import type { DiveForAttribution } from "../../shared/dewatering/zone-attribution";
import { NotFoundError, ValidationError } from "~/lib/errors";
import { isAfterLocalDay, localDayOf, minutesOfClock as minutesOf } from "../../shared/local-time";
import { noDecompressionInfo, workDateSchema, type NoDecompressionInfo } from "./assignments.server";
import { AUDIT_ACTIONS, recordAudit } from "~/lib/audit/audit.server";
import type { ProjectView } from "~/lib/auth/project-view.server";
import type { UserView } from "~/lib/auth/users.server";
import { diveInputSchema } from "~/lib/field-records/inputs";
export { diveInputSchema } from "~/lib/field-records/inputs";
import { claimIdempotencyKey } from "~/lib/api/idempotency.server";

/**
 * The dive log: dives actually made on the day's assigned cells. A logged bottom time beyond the
 * no-decompression figure for the logged maximum depth is flagged, as information only.
 */

/** Minutes from 00:00. */

export type DiveInput = z.infer<typeof diveInputSchema>;

/**
 * Bottom time from the two times: from leaving the surface to leaving the bottom (the US Navy
 * Diving Manual's definition of bottom time, recalled from memory).
 */
export function bottomMinutesOf(input: Pick<DiveInput, "leftSurface" | "leftBottom" | "bottomMinutes">): number {
  if (input.leftSurface && input.leftBottom) return minutesOf(input.leftBottom) - minutesOf(input.leftSurface);
  return input.bottomMinutes!;
}

export interface DiveView {
  id: number;
  date: string;
  team: string;
  diver: string;
  /** The diver was not on the team's roster. */
  visitor: boolean;
  leftSurface: string | null;
  leftBottom: string | null;
  bottomMinutes: number;
  maxDepth: number;
  cells: string[];
  notes: string;
  /** The table figure for the maximum depth and whether the bottom time goes beyond it. */
  noDecompression: NoDecompressionInfo | null;
}

/** A logged dive with the table's caution and source, as the log shows them. */
export interface DiveRecorded {
  dive: DiveView;
  caution: string;
  source: string;
}

function present(dive: Dive, project: ProjectView): DiveView {
  return {
    id: dive.id,
    date: dive.diveDate,
    team: dive.team?.name ?? "",
    diver: dive.diverName,
    visitor: dive.diverIsVisitor,
    leftSurface: dive.leftSurfaceAt,
    leftBottom: dive.leftBottomAt,
    bottomMinutes: dive.bottomMinutes,
    maxDepth: dive.maxDepth,
    cells: (dive.cells ?? []).map((cell) => cell.label).sort(),
    notes: dive.notes,
    noDecompression: noDecompressionInfo(dive.maxDepth, project.lengthUnit, dive.bottomMinutes),
  };
}

/**
 * Logs a dive: the cells must be the team's assigned cells on that date. Throws NotFoundError (no
 * such team) or ValidationError (labels that are not cells, or cells not assigned to the team that
 * day: `code` says which, `cells` lists them).
 */
export async function recordDive(project: ProjectView, user: UserView, input: DiveInput, ip: string | null = null, now: number = Date.now()): Promise<DiveRecorded> {
  if (isAfterLocalDay(input.date, now, project.timeZone)) {
    throw new ValidationError(
      { field: "date", value: input.date, message: `A dive is logged once it has been made: ${input.date} is after today (${localDayOf(now, project.timeZone)} in ${project.timeZone}), so no dive can be logged on that plan yet.` },
      { code: "future-date" },
    );
  }
  const teams = await DiveTeam.findAll({ where: { projectId: project.id } });
  const team = teams.find((candidate) => (typeof input.team === "number" ? candidate.id === input.team : candidate.name.toLowerCase() === input.team.toLowerCase()));
  if (!team) throw new NotFoundError({ field: "team", message: `There is no dive team "${input.team}" on this project.` });
  const diver = rosterDiver(team, input);
  const labels = [...new Set(input.cells.map((label) => label.trim().toUpperCase()))];
  const positions = labels.map((label) => ({ label, position: parseCellLabel(label) }));
  const unknown = positions.filter((cell) => !cell.position).map((cell) => cell.label);
  if (unknown.length > 0) throw new ValidationError({ field: "cells", message: `These are not cell labels: ${unknown.join(", ")}.` }, { code: "unknown-cells", cells: unknown });
  const assigned = await Assignment.findAll({
    where: { projectId: project.id, workDate: input.date, teamId: team.id, [Op.or]: positions.map(({ position }) => ({ row: position!.row, col: position!.col })) },
    attributes: ["row", "col", "label"],
  });
  const assignedKeys = new Set(assigned.map((row) => `${row.row}/${row.col}`));
  const notAssigned = positions.filter(({ position }) => !assignedKeys.has(`${position!.row}/${position!.col}`)).map((cell) => cell.label);
  if (notAssigned.length > 0) {
    throw new ValidationError(
      { field: "cells", message: `Cells ${notAssigned.join(", ")} are not assigned to ${team.name} on ${input.date}; the log takes dives on the team's assigned cells only (assign them on the map first).` },
      { code: "not-assigned", cells: notAssigned },
    );
  }
  const bottomMinutes = bottomMinutesOf(input);
  const id = await getSequelize().transaction(async (transaction) => {
    const idempotency = await claimIdempotencyKey(transaction);
    const dive = await Dive.create(
      {
        projectId: project.id, diveDate: input.date, teamId: team.id, diverName: diver.name, diverIsVisitor: diver.visitor,
        leftSurfaceAt: input.leftSurface ?? null, leftBottomAt: input.leftBottom ?? null, bottomMinutes,
        maxDepth: Math.round(input.maxDepth * 100) / 100, notes: input.notes ?? "", recordedById: user.id,
      },
      { transaction },
    );
    await idempotency.created(dive.id);
    await DiveCell.bulkCreate(positions.map(({ label, position }) => ({ diveId: dive.id, projectId: project.id, row: position!.row, col: position!.col, label })), { transaction });
    await recordAudit({ action: AUDIT_ACTIONS.diveRecorded, projectId: project.id, userId: user.id, ip, detail: { date: input.date, team: team.name, diver: diver.name, visitor: diver.visitor, bottomMinutes, maxDepth: input.maxDepth, cells: labels } }, transaction);
    return dive.id;
  });
  const [dive] = await findDives(project, { id });
  return { dive, caution: NO_DECOMPRESSION_CAUTION, source: NO_DECOMPRESSION_SOURCE };
}

/**
 * The diver as logged: a name on the team's roster (written as the roster writes it), or a visitor
 * when the dive says so. A name off the roster without `visitor` is refused, naming who is listed.
 * A visitor whose name is on the roster is logged as that roster member.
 */
function rosterDiver(team: DiveTeam, input: Pick<DiveInput, "diver" | "visitor">): { name: string; visitor: boolean } {
  const wanted = input.diver.trim().replace(/\s+/g, " ").toLowerCase();
  const member = team.members.find((candidate) => candidate.name.trim().replace(/\s+/g, " ").toLowerCase() === wanted);
  if (member) return { name: member.name, visitor: false };
  if (input.visitor) return { name: input.diver.trim(), visitor: true };
  const listed = team.members.map((candidate) => candidate.name);
  throw new ValidationError(
    {
      field: "diver",
      value: input.diver,
      message: `${input.diver} is not on ${team.name}'s roster (${listed.length > 0 ? listed.join(", ") : "no one is listed"}); choose a diver from the team, or log them as a visitor.`,
    },
    { code: "not-on-roster", roster: listed },
  );
}

async function findDives(project: ProjectView, where: { id?: number; date?: string; diveIds?: number[] }): Promise<DiveView[]> {
  const dives = await Dive.findAll({
    where: {
      projectId: project.id,
      ...(where.id !== undefined ? { id: where.id } : {}),
      ...(where.date !== undefined ? { diveDate: where.date } : {}),
      ...(where.diveIds !== undefined ? { id: where.diveIds } : {}),
    },
    include: [
      { model: DiveTeam, as: "team", attributes: ["name"] },
      { model: DiveCell, as: "cells", attributes: ["label"] },
    ],
    order: [["diveDate", "DESC"], ["leftSurfaceAt", "ASC"], ["id", "ASC"]],
  });
  return dives.map((dive) => present(dive, project));
}

/** Distinct dates on which the project's dives were logged (the days crews worked), YYYY-MM-DD. */
export function loggedDiveDates(projectId: number): Promise<string[]> {
  return distinctProjectDates(Dive, "diveDate", projectId);
}

/**
 * The dives of the given days with the zone of each cell they worked, as the grid's latest figures
 * place it (a zone's id, null for no zone, undefined for a cell the figures do not hold): what the
 * reconciliation attributes pumped solids by.
 */
export async function divesForAttribution(project: ProjectView, dates: ReadonlyArray<string>): Promise<DiveForAttribution[]> {
  if (dates.length === 0) return [];
  const dives = await Dive.findAll({
    where: { projectId: project.id, diveDate: { [Op.in]: [...new Set(dates)] } },
    attributes: ["id", "diveDate", "leftSurfaceAt", "leftBottomAt", "bottomMinutes"],
    include: [{ model: DiveCell, as: "cells", attributes: ["id", "row", "col"] }],
  });
  const cells = dives.flatMap((dive) => dive.cells ?? []);
  const placed = new Map<string, number | null>();
  if (cells.length > 0) {
    const results = await CellResult.findAll({
      where: { projectId: project.id, [Op.or]: [...new Map(cells.map((cell) => [`${cell.row}:${cell.col}`, { row: cell.row, col: cell.col }])).values()] },
      attributes: ["row", "col", "zoneId"], raw: true,
    });
    for (const result of results) placed.set(`${result.row}:${result.col}`, result.zoneId ?? null);
  }
  return dives.map((dive) => ({
    date: dive.diveDate, leftSurface: dive.leftSurfaceAt, leftBottom: dive.leftBottomAt, bottomMinutes: Number(dive.bottomMinutes),
    cellZones: (dive.cells ?? []).map((cell) => placed.get(`${cell.row}:${cell.col}`)),
  }));
}

/** The day's dives, every team. */
export function listDivesOn(project: ProjectView, date: string): Promise<DiveView[]> {
  return findDives(project, { date });
}

/** A cell's dives, newest first (at most 50). */
export async function listCellDives(project: ProjectView, label: string): Promise<DiveView[] | null> {
  const position = parseCellLabel(label);
  if (!position) return null;
  const rows = await DiveCell.findAll({ where: { projectId: project.id, row: position.row, col: position.col }, attributes: ["diveId"], order: [["diveId", "DESC"]], limit: 50 });
  if (rows.length === 0) return [];
  return findDives(project, { diveIds: rows.map((row) => row.diveId) });
}
