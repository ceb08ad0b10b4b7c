import { Op, UniqueConstraintError, type Transaction } from "sequelize";
import { z } from "zod";
import { cellIndex, cellLabel as cellLabelOf } from "../../shared/grid/cell-grid";
import { exceedsNoDecompressionLimit, noDecompressionLimit, NO_DECOMPRESSION_CAUTION, NO_DECOMPRESSION_SOURCE, type NoDecompressionLookup } from "../../shared/no-decompression";
import { CELL_STATUSES } from "../../shared/cell-status";
import { convertLength } from "../../shared/units";
import { isEmergencyInfoEmpty, missingEmergencyItems, type EmergencyInfo } from "../../shared/dive-plan/emergency-info";
import { describeNamed, equipmentLine } from "../../shared/dive-plan/equipment";
import { localDayOf } from "../../shared/local-time";
import { Assignment, DiveTeam, getSequelize, MonitoringStation, Project, StopWorkEvent, WildlifeStandDown, type DiveTeamMember } from "~/lib/db.server";
import { ConflictError, NotFoundError, ValidationError } from "~/lib/errors";
import { getProjectSurfaces } from "~/lib/engine/engine-state.server";
import { queueMail } from "~/lib/mail/outbox.server";
import { AUDIT_ACTIONS, recordAudit } from "~/lib/audit/audit.server";
import { getCellsPayload, type CellsPayload } from "./cells.server";
import { listDiveTeams, presentTeam, type DiveTeamView } from "./dive-teams.server";
import { openHoldsOn } from "./holds.server";
import type { ProjectView } from "~/lib/auth/project-view.server";
import type { UserView } from "~/lib/auth/users.server";
import { workDateSchema } from "~/lib/field-records/inputs";
export { workDateSchema } from "~/lib/field-records/inputs";

/** Dive plans: the day's cells per team, refused when a cell would go to two teams on one day. */

export const assignmentInputSchema = z.object({
  date: workDateSchema,
  /** The team's name or id. */
  team: z.union([z.string().trim().min(1).max(120), z.number().int().positive()]),
  cells: z.array(z.string().trim().min(1).max(16)).min(1, "choose at least one cell").max(5000),
  hose: z.string().trim().min(1, "name the hose or station").max(120),
  notes: z.string().max(4000).default(""),
  /** Planned bottom time per dive, minutes (checked against the no-decompression figure). */
  bottomTimeMinutes: z.number().int().min(1).max(600).nullish(),
  /** Required when a cell is already confirmed by the closeout survey. */
  reason: z.string().trim().max(2000).nullish(),
});
export type AssignmentInput = z.infer<typeof assignmentInputSchema>;

export { listDiveTeams, type DiveTeamView } from "./dive-teams.server";

export interface NoDecompressionInfo {
  depthFt: number;
  lookup: NoDecompressionLookup;
  exceeds: boolean | null;
}

/** Table figures for a working depth (project unit); the depth enters as measured in feet (fresh water read as sea water). */
export function noDecompressionInfo(workingDepth: number | null, unit: ProjectView["lengthUnit"], bottomTimeMinutes: number | null): NoDecompressionInfo | null {
  if (workingDepth === null || !Number.isFinite(workingDepth)) return null;
  const depthFt = Math.max(0, convertLength(workingDepth, unit, "ft"));
  return { depthFt, lookup: noDecompressionLimit(depthFt), exceeds: bottomTimeMinutes === null ? null : exceedsNoDecompressionLimit(depthFt, bottomTimeMinutes) };
}

/** What an assignment stored: the cells, each with its working depth and no-decompression figure. */
export interface AssignmentsCreated {
  date: string;
  team: string;
  cells: string[];
  teamBelowMinimum: { size: number; minimum: number } | null;
  workingDepths: Record<string, number | null>;
  noDecompression: Record<string, NoDecompressionInfo | null>;
  caution: string;
  source: string;
}

/** A label → grid index reader for the cells inside the work limit (null for any other label). */
export function cellLookup(payload: CellsPayload) {
  const { grid } = payload;
  return (label: string) => {
    if (!grid) return null;
    const index = labelIndex(payload).get(label.toUpperCase());
    return index === undefined ? null : index;
  };
}

const labelIndexCache = new WeakMap<CellsPayload, Map<string, number>>();
function labelIndex(payload: CellsPayload): Map<string, number> {
  let map = labelIndexCache.get(payload);
  if (map) return map;
  map = new Map();
  const grid = payload.grid;
  if (grid) {
    for (let index = 0; index < payload.status.length; index++) {
      if (payload.status[index] < 0) continue;
      const row = Math.floor(index / grid.cols) + grid.firstRow;
      const col = (index % grid.cols) + grid.firstCol;
      map.set(cellLabelOf(row, col), index);
    }
  }
  labelIndexCache.set(payload, map);
  return map;
}

async function conflictsFor(projectId: number, date: string, cells: Array<{ row: number; col: number }>) {
  const existing = await Assignment.findAll({
    where: { projectId, workDate: date, [Op.or]: cells.map(({ row, col }) => ({ row, col })) },
    include: [{ model: DiveTeam, as: "team", attributes: ["name"] }],
    order: [["label", "ASC"]],
  });
  return existing.map((assignment) => ({ cell: assignment.label, team: assignment.team?.name ?? "another team" }));
}

/** Working depth per grid index from the latest bottom (deepest point in the cell), project unit. */
async function workingDepths(projectId: number): Promise<Float64Array | null> {
  const surfaces = await getProjectSurfaces(projectId);
  return surfaces ? surfaces.cellMaxDepth : null;
}

function heldRefusal(held: Array<{ holdId: number; cells: string[] }>): ConflictError {
  const parts = held.map((hold) => `${hold.cells.join(", ")} (hold #${hold.holdId})`).join("; ");
  return new ConflictError(
    { field: "cells", message: `Cells ${parts} are under a stop-work hold and cannot be assigned until the hold is lifted.` },
    { code: "held-cells", holds: held.map((hold) => ({ id: hold.holdId, cells: hold.cells })) },
  );
}

/**
 * What stops today's work on the whole project at `now`: open turbidity stop-work events (the
 * dredging that causes the plume stops until a resample is within the limit and the resumption is
 * recorded) and wildlife stand-downs in force (in-water equipment stops until the animal has left
 * and the wait has passed). Read after the project row's lock, as the holds are: a reading or a
 * sighting opens its event under that lock, so one being opened this instant is waited for and seen.
 */
async function workStoppages(projectId: number, now: Date, transaction: Transaction) {
  const [events, standDowns] = await Promise.all([
    StopWorkEvent.findAll({ where: { projectId, resumedAt: null }, include: [{ model: MonitoringStation, as: "station", attributes: ["name"] }], order: [["id", "ASC"]], transaction }),
    WildlifeStandDown.findAll({
      where: { projectId, startedAt: { [Op.lte]: now }, [Op.or]: [{ endsAt: null }, { endsAt: { [Op.gt]: now } }] },
      order: [["id", "ASC"]],
      transaction,
    }),
  ]);
  return {
    stopWork: events.map((event) => ({ id: event.id, station: event.station?.name ?? "" })),
    standDowns: standDowns.map((standDown) => ({ id: standDown.id, species: standDown.species, until: standDown.endsAt?.toISOString() ?? null })),
  };
}

function stoppedRefusal(date: string, stopped: Awaited<ReturnType<typeof workStoppages>>): ConflictError {
  const reasons = [
    ...stopped.stopWork.map((event) => `stop-work #${event.id} (turbidity exceedance at ${event.station})`),
    ...stopped.standDowns.map((standDown) => `a ${standDown.species} stand-down (#${standDown.id}${standDown.until ? `, until ${standDown.until}` : ", the animal is still near"})`),
  ];
  return new ConflictError(
    { field: "date", message: `Work on the project is stopped today by ${reasons.join(" and ")}: no cells can be assigned for today (${date}) until it is cleared. Later days may still be planned.` },
    { code: "work-stopped", stopWork: stopped.stopWork, standDowns: stopped.standDowns },
  );
}

/**
 * Assigns cells to a team on a day. Throws NotFoundError (no such team), ValidationError (a hose
 * the team lacks, cells outside the work limit, confirmed cells without a reason: `code` says
 * which) or ConflictError (cells already another team's that day, listed in `conflicts`; cells
 * under an open stop-work hold, listed in `holds`; any cell for today while work is stopped, with
 * the open stop-work events and stand-downs listed, `code: "work-stopped"`).
 */
export async function createAssignments(project: ProjectView, user: UserView, input: AssignmentInput, ip: string | null = null): Promise<AssignmentsCreated> {
  const teams = await DiveTeam.findAll({ where: { projectId: project.id } });
  const team = teams.find((candidate) => (typeof input.team === "number" ? candidate.id === input.team : candidate.name.toLowerCase() === input.team.toLowerCase()));
  if (!team) throw new NotFoundError({ field: "team", message: `There is no dive team "${input.team}" on this project.` });
  if (team.retiredAt) throw new ConflictError({ field: "team", message: `${team.name} is retired and takes no new cells; bring it back on the teams page first, or choose a team in service.` }, { code: "team-retired" });
  const teamView = presentTeam(team, project);
  const hoseNames = teamView.hoses.map((hose) => hose.name);
  if (hoseNames.length > 0 && !hoseNames.includes(input.hose)) {
    throw new ValidationError({ field: "hose", message: `${team.name} has no hose or station "${input.hose}" (it has ${hoseNames.join(", ")}).` }, { code: "unknown-hose" });
  }
  const payload = await getCellsPayload(project);
  const lookup = cellLookup(payload);
  const labels = [...new Set(input.cells.map((label) => label.toUpperCase()))];
  const unknown = labels.filter((label) => lookup(label) === null);
  if (unknown.length > 0) throw new ValidationError({ field: "cells", message: `These cells are not inside the work limit: ${unknown.join(", ")}.` }, { code: "unknown-cells", cells: unknown });
  const grid = payload.grid!;
  const cells = labels.map((label) => {
    const index = lookup(label)!;
    return { label, index, row: Math.floor(index / grid.cols) + grid.firstRow, col: (index % grid.cols) + grid.firstCol };
  });
  // A stop-work hold around a find outranks everything else: it names the hold, never the find.
  const held = await openHoldsOn(project.id, cells);
  if (held.length > 0) throw heldRefusal(held);
  const confirmedCode = CELL_STATUSES.indexOf("confirmed");
  const confirmed = cells.filter((cell) => payload.status[cell.index] === confirmedCode).map((cell) => cell.label);
  const reason = input.reason?.trim() || null;
  if (confirmed.length > 0 && !reason) {
    throw new ValidationError({ field: "reason", message: `Cells ${confirmed.join(", ")} are confirmed by the closeout survey. Say why they go back into work.` }, { code: "reason-required", cells: confirmed });
  }
  const refused = (conflicts: Array<{ cell: string; team: string }>): ConflictError => {
    const others = [...new Set(conflicts.map((conflict) => conflict.team))].join(" and ");
    return new ConflictError(
      { field: "cells", message: `Cells ${conflicts.map((conflict) => conflict.cell).join(", ")} are already assigned to ${others} on ${input.date}; a cell goes to one team per day, so they cannot also go to ${team.name}.` },
      { team: team.name, conflicts },
    );
  };
  const depths = await workingDepths(project.id);
  const depthOf = (index: number) => {
    const value = depths?.[index];
    return value === undefined || !Number.isFinite(value) ? null : Math.round(value * 100) / 100;
  };
  try {
    await getSequelize().transaction(async (transaction) => {
      const conflicts = await conflictsFor(project.id, input.date, cells);
      if (conflicts.length > 0) throw refused(conflicts);
      // A find is logged, and its hold placed, under the project row's lock (finds.server.ts). Taking
      // the same lock before looking again means a hold being placed this instant is waited for and
      // seen, never slipped past; the lock is held only for these few statements.
      await Project.findByPk(project.id, { attributes: ["id"], lock: transaction.LOCK.UPDATE, transaction });
      const heldNow = await openHoldsOn(project.id, cells, transaction);
      if (heldNow.length > 0) throw heldRefusal(heldNow);
      // Something that stops work stops today's: the plan for today is refused while it lasts.
      // A later day may be planned (the event may be cleared by then); the panel says work is stopped.
      const now = new Date();
      if (input.date === localDayOf(now.getTime(), project.timeZone)) {
        const stopped = await workStoppages(project.id, now, transaction);
        if (stopped.stopWork.length > 0 || stopped.standDowns.length > 0) throw stoppedRefusal(input.date, stopped);
      }
      await Assignment.bulkCreate(
        cells.map((cell) => ({
          projectId: project.id,
          workDate: input.date,
          teamId: team.id,
          row: cell.row,
          col: cell.col,
          label: cell.label,
          hose: input.hose,
          notes: input.notes ?? "",
          workingDepth: depthOf(cell.index),
          plannedBottomMinutes: input.bottomTimeMinutes ?? null,
          confirmedReason: confirmed.includes(cell.label) ? reason : null,
          createdById: user.id,
        })),
        { transaction },
      );
      await recordAudit({ action: AUDIT_ACTIONS.assignmentCreated, projectId: project.id, userId: user.id, ip, detail: { date: input.date, team: team.name, hose: input.hose, cells: labels, confirmedReason: confirmed.length > 0 ? reason : undefined } }, transaction);
    });
  } catch (error) {
    // Another request took a cell between the check and the insert: the unique index refuses it.
    if (error instanceof UniqueConstraintError) throw refused(await conflictsFor(project.id, input.date, cells));
    throw error;
  }
  const workingDepthsByCell: Record<string, number | null> = {};
  const noDecompression: Record<string, NoDecompressionInfo | null> = {};
  for (const cell of cells) {
    workingDepthsByCell[cell.label] = depthOf(cell.index);
    noDecompression[cell.label] = noDecompressionInfo(depthOf(cell.index), project.lengthUnit, input.bottomTimeMinutes ?? null);
  }
  return {
    date: input.date,
    team: team.name,
    cells: labels,
    teamBelowMinimum: teamView.belowMinimum ? { size: teamView.members.length, minimum: project.minTeamSize } : null,
    workingDepths: workingDepthsByCell,
    noDecompression,
    caution: NO_DECOMPRESSION_CAUTION,
    source: NO_DECOMPRESSION_SOURCE,
  };
}

export interface PlanCellView {
  label: string;
  zone: string | null;
  hose: string;
  notes: string;
  workingDepth: number | null;
  plannedBottomMinutes: number | null;
  noDecompression: NoDecompressionInfo | null;
  remainingThickness: number | null;
  remainingVolume: number | null;
  status: string | null;
  confirmedReason: string | null;
}

export interface DayPlanView {
  date: string;
  lengthLabel: string;
  volumeLabel: string;
  minTeamSize: number;
  teams: Array<{ team: DiveTeamView; cells: PlanCellView[]; remainingVolume: number }>;
  caution: string;
  source: string;
}

/** The day's plan: every team with its cells (teams without cells that day are left out). */
export async function getDayPlan(project: ProjectView, date: string): Promise<DayPlanView> {
  const [assignments, teams, payload] = await Promise.all([
    Assignment.findAll({ where: { projectId: project.id, workDate: date }, order: [["label", "ASC"]] }),
    // Retired teams too: a past day's plan still shows the team that worked it.
    listDiveTeams(project, { retired: true }),
    getCellsPayload(project),
  ]);
  const grid = payload.grid;
  const byTeam = new Map<number, PlanCellView[]>();
  for (const assignment of assignments) {
    const index = grid ? cellIndex(grid, assignment.row, assignment.col) : -1;
    const zoneIndex = index >= 0 ? payload.zone[index] : -1;
    const cells = byTeam.get(assignment.teamId) ?? [];
    cells.push({
      label: assignment.label,
      zone: zoneIndex >= 0 ? payload.zones[zoneIndex].name : null,
      hose: assignment.hose,
      notes: assignment.notes,
      workingDepth: assignment.workingDepth,
      plannedBottomMinutes: assignment.plannedBottomMinutes,
      noDecompression: noDecompressionInfo(assignment.workingDepth, project.lengthUnit, assignment.plannedBottomMinutes),
      remainingThickness: index >= 0 ? payload.remainingThickness[index] : null,
      remainingVolume: index >= 0 ? payload.remainingVolume[index] : null,
      status: index >= 0 && payload.status[index] >= 0 ? CELL_STATUSES[payload.status[index]] : null,
      confirmedReason: assignment.confirmedReason,
    });
    byTeam.set(assignment.teamId, cells);
  }
  return {
    date,
    lengthLabel: payload.labels.length,
    volumeLabel: payload.labels.volume,
    minTeamSize: project.minTeamSize,
    teams: teams
      .filter((team) => byTeam.has(team.id))
      .map((team) => {
        const cells = byTeam.get(team.id)!;
        return { team, cells, remainingVolume: Math.round(cells.reduce((sum, cell) => sum + (cell.remainingVolume ?? 0), 0) * 10) / 10 };
      }),
    caution: NO_DECOMPRESSION_CAUTION,
    source: NO_DECOMPRESSION_SOURCE,
  };
}

function formatNoDecompression(info: NoDecompressionInfo | null): string {
  if (!info) return "depth unknown";
  const { lookup } = info;
  if (lookup.kind === "unlimited") return `${lookup.tableDepthFsw} fsw row: no limit listed`;
  if (lookup.kind === "beyond-table") return "deeper than the rows held: see the full table and the dive plan";
  return `${lookup.tableDepthFsw} fsw row: ${lookup.limitMinutes} min${info.exceeds ? " (PLANNED BOTTOM TIME EXCEEDS IT)" : ""}`;
}

/** The emergency information as the e-mailed sheet carries it, or the plain warning when it is missing. */
function emergencyLines(emergency: EmergencyInfo | null): string[] {
  const missing = missingEmergencyItems(emergency);
  if (!emergency || isEmergencyInfoEmpty(emergency)) return ["EMERGENCY: No emergency information set — add it under Settings before diving."];
  const pair = (name: string, phone: string) => [name, phone].filter(Boolean).join(", ") || "not set";
  return [
    `EMERGENCY: services ${emergency.emergencyNumber || "not set"}`,
    `  Nearest hospital: ${pair(emergency.hospitalName, emergency.hospitalPhone)}`,
    `  Nearest hyperbaric chamber: ${pair(emergency.chamberName, emergency.chamberPhone)}`,
    `  Site address: ${emergency.siteAddress || "not set"}`,
    `  Access point: ${emergency.accessPoint || "not set"}`,
    ...(missing.length > 0 ? [`  Incomplete, missing ${missing.join("; ")} — add it under Settings before diving.`] : []),
  ];
}

/** The plan sheet as plain text, one team. */
export function planSheetText(project: ProjectView, plan: DayPlanView, teamIndex: number, planUrl: string, emergency: EmergencyInfo | null = null): string {
  const { team, cells } = plan.teams[teamIndex];
  const lines = [
    `${project.name}: dive plan for ${plan.date}, ${team.name}${team.station ? ` (${team.station})` : ""}`,
    "",
    `CAUTION: ${plan.caution}`,
    ...emergencyLines(emergency),
    equipmentLine(team.hoses, team.pumps),
    team.belowMinimum ? `FLAG: ${team.name} lists ${team.members.length} people; the project's minimum team size is ${plan.minTeamSize}.` : "",
    "",
    `Cell | zone | hose | working depth (${plan.lengthLabel}) | no-decompression figure | remaining thickness (${plan.lengthLabel}) | remaining (${plan.volumeLabel}) | notes`,
    ...cells.map((cell) =>
      [cell.label, cell.zone ?? "-", describeNamed(team.hoses, cell.hose), cell.workingDepth ?? "-", formatNoDecompression(cell.noDecompression), cell.remainingThickness ?? "-", cell.remainingVolume ?? "-", cell.notes || "-"].join(" | "),
    ),
    "",
    `No-decompression figures: ${plan.source}.`,
    `The plan on Firmsand: ${planUrl}`,
  ];
  return lines.filter((line, index) => line !== "" || lines[index - 1] !== "").join("\n");
}

/** E-mails each team's part of the day's plan to its members; returns the addresses written to. */
export async function emailDayPlan(project: ProjectView, user: UserView, date: string, planUrl: string, ip: string | null = null): Promise<string[]> {
  const plan = await getDayPlan(project, date);
  const emergency = (await Project.findByPk(project.id, { attributes: ["id", "emergencyInfo"] }))?.emergencyInfo ?? null;
  const sentTo: string[] = [];
  await getSequelize().transaction(async (transaction) => {
    for (const [index, { team }] of plan.teams.entries()) {
      const text = planSheetText(project, plan, index, planUrl, emergency);
      for (const member of team.members) {
        await queueMail({ to: member.email, subject: `Dive plan ${date}: ${team.name} (${project.name})`, text }, transaction);
        sentTo.push(member.email);
      }
    }
    await recordAudit({ action: AUDIT_ACTIONS.planEmailed, projectId: project.id, userId: user.id, ip, detail: { date, to: sentTo } }, transaction);
  });
  return sentTo;
}

/** One cell's assignments, newest first, for the inspector. */
export async function cellAssignments(project: ProjectView, row: number, col: number) {
  const rows = await Assignment.findAll({
    where: { projectId: project.id, row, col },
    include: [{ model: DiveTeam, as: "team", attributes: ["name"] }],
    order: [["workDate", "DESC"]],
    limit: 20,
  });
  return rows.map((assignment) => ({ date: assignment.workDate, team: assignment.team?.name ?? "", hose: assignment.hose, notes: assignment.notes }));
}
