import { Op } from "sequelize";
import { z } from "zod";
import { compileDay, localDayBounds, type CompiledDay, type DayInterruption, type SurveyTotals } from "../../shared/daily-report/compile";
import { localDayOf } from "../../shared/local-time";
import { unitLabel } from "../../shared/units";
import {
  Assignment, DailyReport, DewateringShift, DailyReportAmendment, Dive, DiveTeam, Find, Haul, Hold, MonitoringStation, StopWorkEvent, SurveySnapshot, TubeFill, WaterQualityReading, WildlifeStandDown,
  getSequelize, type EnteredNotesRecord,
} from "~/lib/db.server";
import { ConflictError, NotFoundError } from "~/lib/errors";
import { AUDIT_ACTIONS, recordAudit } from "~/lib/audit/audit.server";
import type { ProjectView } from "~/lib/auth/project-view.server";
import type { UserView } from "~/lib/auth/users.server";
import { workDateSchema } from "./assignments.server";
import { listDivesOn } from "./dives.server";
import { getWaterQualitySettings, samplingRoutineOf } from "./water-quality.server";

/**
 * A project's daily report: the local day's records compiled (shared/daily-report), the notes the
 * supervisor enters, the typed-name signature that locks it with a snapshot of its figures, and
 * the dated amendments that correct it afterwards.
 */

export const reportDateSchema = workDateSchema;

const text = (max: number) => z.string().trim().max(max).default("");
export const enteredNotesInputSchema = z.object({
  conditions: text(200),
  airTemperature: text(60),
  wind: text(120),
  rain: text(120),
  effect: text(2000),
  inspections: text(4000),
  safety: text(4000),
  notes: text(4000),
});
export const signInputSchema = z.object({ name: z.string().trim().min(1, "type your name to sign").max(200) });
export const amendmentInputSchema = z.object({ text: z.string().trim().min(1, "write the correction").max(4000) });

const EMPTY_NOTES: EnteredNotesRecord = { weather: null, inspections: "", safety: "", notes: "" };
const minutesOfClock = (clock: string) => Number(clock.slice(0, 2)) * 60 + Number(clock.slice(3, 5));

export interface DailyReportView {
  report: CompiledDay;
  /** Whether the figures are the snapshot taken at signing (true) or compiled just now. */
  asSigned: boolean;
  signed: { name: string; at: string } | null;
  amendments: Array<{ text: string; by: string; at: string }>;
}

/** Loads the local day's records and compiles them. */
export async function compileReport(project: ProjectView, date: string, entered: EnteredNotesRecord, nowMs = Date.now()): Promise<CompiledDay> {
  const { startMs, endMs } = localDayBounds(date, project.timeZone);
  const start = new Date(startMs);
  const end = new Date(endMs);
  const [dives, planned, shifts, tubeFills, hauls, stations, readings, settings, stopWork, standDowns, finds, holds, snapshots] = await Promise.all([
    listDivesOn(project, date),
    Assignment.findAll({ where: { projectId: project.id, workDate: date }, include: [{ model: DiveTeam, as: "team" }] }),
    DewateringShift.findAll({ where: { projectId: project.id, shiftDate: date } }),
    TubeFill.count({ where: { projectId: project.id, fillDate: date } }),
    Haul.findAll({ where: { projectId: project.id, haulDate: date } }),
    MonitoringStation.findAll({ where: { projectId: project.id, kind: "compliance" }, order: [["name", "ASC"]] }),
    WaterQualityReading.findAll({ where: { projectId: project.id, localDay: date }, include: [{ model: MonitoringStation, as: "station" }] }),
    getWaterQualitySettings(project),
    StopWorkEvent.findAll({ where: { projectId: project.id, openedAt: { [Op.lt]: end }, [Op.or]: [{ resumedAt: null }, { resumedAt: { [Op.gt]: start } }] }, include: [{ model: MonitoringStation, as: "station" }] }),
    WildlifeStandDown.findAll({ where: { projectId: project.id, startedAt: { [Op.lt]: end }, [Op.or]: [{ endsAt: null }, { endsAt: { [Op.gt]: start } }] } }),
    // Category and catalogue number only: a daily report goes to funders and never carries a find's location.
    Find.findAll({ where: { projectId: project.id, foundAt: { [Op.gte]: start, [Op.lt]: end } }, attributes: ["catalogueNumber", "category"] }),
    Hold.findAll({
      where: { projectId: project.id, [Op.or]: [{ placedAt: { [Op.gte]: start, [Op.lt]: end } }, { liftedAt: { [Op.gte]: start, [Op.lt]: end } }] },
      include: [{ model: Find, as: "find", attributes: ["catalogueNumber"] }],
    }),
    // The project totals each survey left, as of this day and the survey before it.
    SurveySnapshot.findAll({ where: { projectId: project.id, surveyedOn: { [Op.lte]: date } }, attributes: ["surveyedOn", "totals"], order: [["surveyedOn", "DESC"]], limit: 2 }),
  ]);
  const totalsOf = (snapshot: SurveySnapshot): SurveyTotals => ({
    surveyedOn: String(snapshot.surveyedOn), removedVolume: snapshot.totals.removedVolume, remainingVolume: snapshot.totals.remainingVolume, cellsAtFirmSand: snapshot.totals.cellsAtFirmSand,
  });
  const survey = snapshots[0] && String(snapshots[0].surveyedOn) === date
    ? { today: totalsOf(snapshots[0]), previous: snapshots[1] ? totalsOf(snapshots[1]) : null, volumeLabel: unitLabel(project.lengthUnit, "volume") }
    : null;
  const teams = new Map<string, number>();
  for (const assignment of planned) if (assignment.team) teams.set(assignment.team.name, assignment.team.members.length);
  const interruptions: DayInterruption[] = [
    ...stopWork.map((event) => ({ kind: "stop-work" as const, reason: `turbidity at ${event.station?.name ?? "a station"}`, startMs: event.openedAt.getTime(), endMs: event.resumedAt?.getTime() ?? null })),
    ...standDowns.map((event) => ({ kind: "stand-down" as const, reason: event.species, startMs: event.startedAt.getTime(), endMs: event.endsAt?.getTime() ?? null })),
  ];
  return compileDay({
    date,
    timeZone: project.timeZone,
    nowMs,
    lengthLabel: unitLabel(project.lengthUnit),
    dives: dives.map((dive) => ({ team: dive.team, diver: dive.diver, visitor: dive.visitor, bottomMinutes: dive.bottomMinutes, maxDepth: dive.maxDepth, cells: dive.cells, beyondNoDecompression: dive.noDecompression?.exceeds === true })),
    plannedTeams: [...teams].map(([team, headCount]) => ({ team, headCount })),
    // The dry solids and polymer each shift stored when it was logged: the figures the shift log shows.
    shifts: shifts.map((shift) => ({ pumpHours: shift.pumpHours, slurryFlow: { value: shift.slurryFlowValue, unit: shift.slurryFlowUnit }, drySolidsKg: shift.drySolidsKg, neatPolymerKg: shift.neatPolymerKg })),
    tubeFills,
    hauls: hauls.map((haul) => ({ ticketNumber: haul.ticketNumber, drySolidsKg: haul.drySolidsKg, loadWetMass: haul.loadWetMass, loadVolume: haul.loadVolume })),
    complianceStations: stations.map((station) => station.name),
    readings: readings.map((reading) => ({ station: reading.station?.name ?? "", stationKind: reading.station?.kind ?? "other", takenAtMs: reading.takenAt.getTime(), value: reading.value, unit: reading.unit, exceeds: reading.exceeds })),
    sampling: samplingRoutineOf(settings),
    interruptions,
    finds: finds.map((find) => ({ catalogueNumber: find.catalogueNumber, category: find.category })),
    holds: holds.map((hold) => ({ catalogueNumber: hold.find?.catalogueNumber ?? "", placedAtMs: hold.placedAt.getTime(), liftedAtMs: hold.liftedAt?.getTime() ?? null })),
    entered,
    survey,
  });
}

function findReport(project: ProjectView, date: string) {
  return DailyReport.findOne({ where: { projectId: project.id, localDate: date }, include: [{ model: DailyReportAmendment, as: "amendments" }] });
}

/** The day's report: as signed (the snapshot) once signed, else compiled now. */
export async function getDailyReport(project: ProjectView, date: string, nowMs = Date.now()): Promise<DailyReportView> {
  const row = await findReport(project, date);
  const signed = row?.signedAt && row.signedByName ? { name: row.signedByName, at: row.signedAt.toISOString() } : null;
  const report = signed && row?.snapshot ? (row.snapshot as unknown as CompiledDay) : await compileReport(project, date, row?.entered ?? EMPTY_NOTES, nowMs);
  const amendments = [...(row?.amendments ?? [])]
    .sort((a, b) => a.createdAt.getTime() - b.createdAt.getTime() || a.id - b.id)
    .map((amendment) => ({ text: amendment.text, by: amendment.byName, at: amendment.createdAt.toISOString() }));
  return { report, asSigned: Boolean(signed), signed, amendments };
}

const LOCKED = "This day's report is signed and locked: add an amendment instead.";

/** Stores the weather and notes the supervisor enters; refused once the report is signed. */
export async function saveEnteredNotes(project: ProjectView, user: UserView, date: string, input: z.output<typeof enteredNotesInputSchema>, ip: string | null = null): Promise<void> {
  const weather = input.conditions || input.airTemperature || input.wind || input.rain || input.effect
    ? { conditions: input.conditions, airTemperature: input.airTemperature, wind: input.wind, rain: input.rain, effect: input.effect }
    : null;
  const entered: EnteredNotesRecord = { weather, inspections: input.inspections, safety: input.safety, notes: input.notes };
  await getSequelize().transaction(async (transaction) => {
    const [row] = await DailyReport.findOrCreate({ where: { projectId: project.id, localDate: date }, defaults: { projectId: project.id, localDate: date, entered: EMPTY_NOTES }, transaction, lock: transaction.LOCK.UPDATE });
    if (row.signedAt) throw new ConflictError(LOCKED);
    await row.update({ entered }, { transaction });
    await recordAudit({ action: AUDIT_ACTIONS.dailyReportNotesEntered, projectId: project.id, userId: user.id, ip, detail: { date } }, transaction);
  });
}

/** Signs the day's report with the typed name; keeps the compiled figures as signed. 409 once signed. */
export async function signDailyReport(project: ProjectView, user: UserView, date: string, name: string, ip: string | null = null, nowMs = Date.now()): Promise<DailyReportView> {
  await getSequelize().transaction(async (transaction) => {
    const [row] = await DailyReport.findOrCreate({ where: { projectId: project.id, localDate: date }, defaults: { projectId: project.id, localDate: date, entered: EMPTY_NOTES }, transaction, lock: transaction.LOCK.UPDATE });
    if (row.signedAt) throw new ConflictError(`This day's report was already signed by ${row.signedByName} at ${row.signedAt.toISOString()}.`);
    const snapshot = await compileReport(project, date, row.entered, nowMs);
    await row.update({ signedByName: name, signedAt: new Date(nowMs), signedById: user.id, snapshot: snapshot as unknown as Record<string, unknown> }, { transaction });
    await recordAudit({ action: AUDIT_ACTIONS.dailyReportSigned, projectId: project.id, userId: user.id, ip, detail: { date, name } }, transaction);
  });
  return getDailyReport(project, date, nowMs);
}

/** A dated correction to a signed report (an unsigned one is edited directly). */
export async function addAmendment(project: ProjectView, user: UserView, date: string, text: string, ip: string | null = null): Promise<DailyReportView> {
  await getSequelize().transaction(async (transaction) => {
    const row = await DailyReport.findOne({ where: { projectId: project.id, localDate: date }, transaction, lock: transaction.LOCK.UPDATE });
    if (!row?.signedAt) throw new ConflictError("This day's report is not signed yet: correct it directly; amendments are for signed reports.");
    await DailyReportAmendment.create({ reportId: row.id, text, byName: user.name, byId: user.id }, { transaction });
    await recordAudit({ action: AUDIT_ACTIONS.dailyReportAmended, projectId: project.id, userId: user.id, ip, detail: { date } }, transaction);
  });
  return getDailyReport(project, date);
}

export type DayState = "no work" | "draft" | "signed" | "amended";

/** The last `days` local days (today first) and each one's state. */
export async function listRecentDays(project: ProjectView, days = 14, nowMs = Date.now()): Promise<Array<{ date: string; state: DayState; dives: number }>> {
  const today = localDayOf(nowMs, project.timeZone);
  const dates: string[] = [];
  for (let back = 0; back < days; back += 1) {
    const [year, month, day] = today.split("-").map(Number);
    dates.push(new Date(Date.UTC(year!, month! - 1, day! - back)).toISOString().slice(0, 10));
  }
  const [reports, dives] = await Promise.all([
    DailyReport.findAll({ where: { projectId: project.id, localDate: { [Op.in]: dates } }, include: [{ model: DailyReportAmendment, as: "amendments", attributes: ["id"] }] }),
    Dive.findAll({ where: { projectId: project.id, diveDate: { [Op.in]: dates } }, attributes: ["diveDate"] }),
  ]);
  return dates.map((date) => {
    const report = reports.find((row) => row.localDate === date);
    const count = dives.filter((dive) => dive.diveDate === date).length;
    const state: DayState = report?.signedAt ? ((report.amendments?.length ?? 0) > 0 ? "amended" : "signed") : report || count > 0 ? "draft" : "no work";
    return { date, state, dives: count };
  });
}

/** The `<date>` of a day's URL, or 404: a day that cannot exist has no report. */
export function dayParam(value: string | undefined): string {
  const parsed = reportDateSchema.safeParse(value);
  if (!parsed.success) throw new NotFoundError("There is no such day: a day is written YYYY-MM-DD.");
  return parsed.data;
}
