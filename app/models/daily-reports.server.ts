import { Op, UniqueConstraintError, type Transaction } from "sequelize";
import { z } from "zod";
import {
  EQUIPMENT_MAX_LINES, HEAD_COUNT_MAX, VISITORS_MAX_LINES, WEATHER_DOWNTIME_MAX_LINES, compileDay, localDayBounds, type CompiledDay, type DayInterruption, type SurveyTotals,
} from "../../shared/daily-report/compile";
import { CLOCK_PATTERN, END_CLOCK_PATTERN, instantOfClock } from "../../shared/daily-report/local-periods";
import { BATCH_DAYS, dayStatus, type DayState, type ReportEvents } from "../../shared/daily-report/present";
import { localDayOf, minutesOfClock } from "../../shared/local-time";
import { unitLabel } from "../../shared/units";
import {
  Assignment, CountersignRequest, DailyReport, Membership, Project, ReportSubscriber, User, DewateringShift, DailyReportAmendment, Dive, DiveTeam, Find, Haul, Hold, MonitoringStation, ProjectSettingsVersion, StopWorkEvent, SurveySnapshot, TubeFill, WaterQualityReading, WildlifeStandDown,
  getSequelize, type EnteredNotesRecord,
} from "~/lib/db.server";
import { ConflictError, NotFoundError, ValidationError } from "~/lib/errors";
import { queueMail } from "~/lib/mail/outbox.server";
import { createLinkToken, hashLinkToken } from "~/lib/auth/tokens.server";
import { normaliseEmail } from "~/lib/auth/users.server";
import { presentProject } from "~/lib/auth/project-view.server";
import { getObject, objectKey, putObject } from "~/lib/storage/storage.server";
import { renderDailyReportBatchPdf, renderDailyReportPdf, type PdfDay } from "~/lib/pdf/daily-report-pdf.server";
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
  /** The free-text note on inspections from before visitor lines: sent only while the page shows it (kept otherwise). */
  inspections: z.string().trim().max(4000).optional(),
  safety: text(4000),
  notes: text(4000),
});
export const signInputSchema = z.object({ name: z.string().trim().min(1, "type your name to sign").max(200) });
export const amendmentInputSchema = z.object({ text: z.string().trim().min(1, "write the correction").max(4000) });
const emailField = z.string().trim().min(1, "enter an e-mail address").max(254).pipe(z.email("is not an e-mail address like name@example.org"));
export const countersignRequestInputSchema = z.object({ email: emailField });
export const countersignInputSchema = z.object({ name: z.string().trim().min(1, "type your name to countersign").max(200) });
export const subscriberInputSchema = z.union([z.object({ email: emailField }), z.object({ userId: z.coerce.number().int().positive() })]);
export const batchInputSchema = z.object({ from: workDateSchema, to: workDateSchema });

const equipmentLineInput = z.object(
  // Each field checked in the refinement below, where the line's number is known.
  { name: z.unknown().optional(), workingHours: z.unknown().optional(), idleHours: z.unknown().optional(), idleReason: z.unknown().optional() },
  { message: 'each line is {"name", "workingHours", "idleHours", "idleReason"}' },
);

/**
 * The day's equipment lines as entered (the page's form and `PUT …/equipment`): a name, hours
 * working and hours idle (0 when left out), and the idle reason in words whenever it stood idle.
 * Hours are at most the local day's length (24 h; 23 or 25 h on a daylight-saving change), each and
 * together. Every refusal names its line ("line 2: …") and sits on that line's field.
 */
export function equipmentInputSchema(dayHours = 24) {
  const most = formatHours(dayHours);
  return z
    .object({
      equipment: z
        .array(equipmentLineInput, { message: 'equipment is a list of {"name", "workingHours", "idleHours", "idleReason"}' })
        .max(EQUIPMENT_MAX_LINES, `at most ${EQUIPMENT_MAX_LINES} pieces of equipment on one day's report`),
    })
    .superRefine(({ equipment }, context) => {
      const seen = new Map<string, number>();
      equipment.forEach((line, index) => {
        const named = `line ${index + 1}`;
        const issue = (field: string, message: string) => context.addIssue({ code: "custom", path: ["equipment", index, field], message: `${named}: ${message}` });
        const name = typeof line.name === "string" ? line.name.trim() : "";
        if (typeof line.name !== "string" || name === "") issue("name", "name the equipment (e.g. suction pump 1, booster pump, work boat)");
        else if (name.length > 120) issue("name", "the name is at most 120 characters");
        else if (seen.has(name.toLowerCase())) issue("name", `${name} is already on line ${seen.get(name.toLowerCase())! + 1}: give each piece one line`);
        else seen.set(name.toLowerCase(), index);
        const hours: Record<"workingHours" | "idleHours", number | null> = { workingHours: 0, idleHours: 0 };
        for (const [field, words] of [["workingHours", "working hours"], ["idleHours", "idle hours"]] as const) {
          const value = line[field];
          if (value === undefined || value === null) continue;
          if (typeof value !== "number" || !Number.isFinite(value) || value < 0 || value > dayHours) {
            issue(field, `${words} are a number of hours from 0 to ${most}`);
            hours[field] = null;
          } else hours[field] = value;
        }
        if (hours.workingHours === null || hours.idleHours === null) return;
        if (hours.workingHours + hours.idleHours > dayHours + 1e-9) {
          issue("idleHours", `working and idle hours add up to ${formatHours(hours.workingHours + hours.idleHours)} h, more than the ${most} h of this day`);
        } else if (hours.workingHours === 0 && hours.idleHours === 0) {
          issue("workingHours", "give its hours working, idle, or both");
        }
        const reason = typeof line.idleReason === "string" ? line.idleReason.trim() : "";
        if (line.idleReason !== undefined && line.idleReason !== null && typeof line.idleReason !== "string") issue("idleReason", "the idle reason is words");
        else if (reason.length > 500) issue("idleReason", "the idle reason is at most 500 characters");
        else if (hours.idleHours > 0 && reason === "") issue("idleReason", "say why it stood idle (waiting on a turbidity stop, repair, no crew…)");
      });
    })
    .transform(({ equipment }) => ({
      equipment: equipment.map((line) => ({
        name: String(line.name ?? "").trim(),
        workingHours: Math.round(Number(line.workingHours ?? 0) * 100) / 100,
        idleHours: Math.round(Number(line.idleHours ?? 0) * 100) / 100,
        idleReason: typeof line.idleReason === "string" ? line.idleReason.trim() : "",
      })),
    }));
}

const formatHours = (hours: number) => String(Math.round(hours * 100) / 100);

const CREWS_MAX_LINES = 30;

/** A line of an entered list: each field checked in the list's refinement, where the line's number is known. */
const enteredLine = (fields: readonly string[], shape: string) => z.object(Object.fromEntries(fields.map((field) => [field, z.unknown().optional()])), { message: `each line is ${shape}` });
const optionalText = (value: unknown) => (typeof value === "string" ? value.trim() : "");

/**
 * Head counts entered over the compiled ones (the page's form and `PUT …/crews`): a line per crew,
 * naming one of the project's teams (`teamNames`), a whole number of people from 0 to 99 and,
 * optionally, why the compiled figure is not the crew on site. The list replaces the entered
 * counts; a team left out goes back to its compiled count. Refusals name the line and the field.
 */
export function crewsInputSchema(teamNames: readonly string[]) {
  const shape = '{"team", "headCount", "reason"}';
  const known = new Map(teamNames.map((name) => [name.toLowerCase(), name]));
  return z
    .object({ crews: z.array(enteredLine(["team", "headCount", "reason"], shape), { message: `crews is a list of ${shape}` }).max(CREWS_MAX_LINES, `at most ${CREWS_MAX_LINES} crews on one day's report`) })
    .superRefine(({ crews }, context) => {
      const seen = new Map<string, number>();
      crews.forEach((line, index) => {
        const team = optionalText(line.team);
        const named = `line ${index + 1}${team && team.length <= 120 ? ` (${team})` : ""}`;
        const issue = (field: string, message: string) => context.addIssue({ code: "custom", path: ["crews", index, field], message: `${named}: ${message}` });
        if (typeof line.team !== "string" || team === "") issue("team", "name the team");
        else if (team.length > 120) issue("team", "a team's name is at most 120 characters");
        else if (!known.has(team.toLowerCase())) issue("team", `this project has no team named ${team}${teamNames.length > 0 ? ` (its teams: ${teamNames.join(", ")})` : ""}`);
        else if (seen.has(team.toLowerCase())) issue("team", `${team} is already on line ${seen.get(team.toLowerCase())! + 1}: one head count per team`);
        else seen.set(team.toLowerCase(), index);
        if (typeof line.headCount !== "number" || !Number.isInteger(line.headCount) || line.headCount < 0 || line.headCount > HEAD_COUNT_MAX) {
          issue("headCount", `the head count is a whole number of people from 0 to ${HEAD_COUNT_MAX}`);
        }
        if (line.reason !== undefined && line.reason !== null && typeof line.reason !== "string") issue("reason", "the reason is words");
        else if (optionalText(line.reason).length > 500) issue("reason", "the reason is at most 500 characters");
      });
    })
    .transform(({ crews }) => ({
      crews: crews.map((line) => ({ team: known.get(optionalText(line.team).toLowerCase())!, headCount: Number(line.headCount), reason: optionalText(line.reason) })),
    }));
}

/**
 * Checks a local wall-clock time of the report's day; returns its instant, or says what is wrong.
 * `end`: 24:00 (the day's end) is allowed.
 */
function clockOnDay(value: unknown, date: string, timeZone: string, end: boolean): { ms: number } | { problem: string } {
  const clock = typeof value === "string" ? value.trim() : "";
  if (!(end ? END_CLOCK_PATTERN : CLOCK_PATTERN).test(clock)) return { problem: `is a time written HH:MM on the 24-hour clock${end ? " (24:00 for the end of the day)" : ""}` };
  const ms = instantOfClock(date, clock, timeZone);
  if (ms === null) return { problem: `${clock} does not exist on ${date}: the clocks went forward an hour that night` };
  return { ms };
}

/**
 * The day's weather downtime (the page's form and `PUT …/weather-downtime`): spells with a start and
 * an end in the project's local time on the report's day (the end may be 24:00), and the reason in
 * words. The end comes after the start (a spell through midnight is entered on each day); spells do
 * not overlap one another. On the day the clocks go back, a time in the repeated hour is its first
 * occurrence. Refusals name the line and the field.
 */
export function weatherDowntimeInputSchema(date: string, timeZone: string) {
  const shape = '{"start", "end", "reason"}';
  return z
    .object({ weatherDowntime: z.array(enteredLine(["start", "end", "reason"], shape), { message: `weatherDowntime is a list of ${shape}` }).max(WEATHER_DOWNTIME_MAX_LINES, `at most ${WEATHER_DOWNTIME_MAX_LINES} spells of weather downtime on one day's report`) })
    .superRefine(({ weatherDowntime }, context) => {
      const spells: Array<{ index: number; startMs: number; endMs: number; text: string }> = [];
      weatherDowntime.forEach((line, index) => {
        const issue = (field: string, message: string) => context.addIssue({ code: "custom", path: ["weatherDowntime", index, field], message: `line ${index + 1}: ${message}` });
        const start = clockOnDay(line.start, date, timeZone, false);
        const end = clockOnDay(line.end, date, timeZone, true);
        if ("problem" in start) issue("start", `the start ${start.problem}`);
        if ("problem" in end) issue("end", `the end ${end.problem}`);
        const reason = optionalText(line.reason);
        if (typeof line.reason !== "string" || reason === "") issue("reason", "say what weather stopped the work (e.g. lightning within 10 miles)");
        else if (reason.length > 300) issue("reason", "the reason is at most 300 characters");
        if ("ms" in start && "ms" in end) {
          if (end.ms <= start.ms) issue("end", `the end (${String(line.end).trim()}) comes after the start (${String(line.start).trim()}); downtime through midnight is entered on each day`);
          else spells.push({ index, startMs: start.ms, endMs: end.ms, text: `${String(line.start).trim()}–${String(line.end).trim()}` });
        }
      });
      // A later line that begins before an earlier-starting one ends overlaps it.
      spells.sort((a, b) => a.startMs - b.startMs || a.index - b.index);
      spells.forEach((spell, position) => {
        const before = spells.slice(0, position).find((other) => other.endMs > spell.startMs);
        if (!before) return;
        const [later, earlier] = spell.index > before.index ? [spell, before] : [before, spell];
        context.addIssue({ code: "custom", path: ["weatherDowntime", later.index, "start"], message: `line ${later.index + 1}: ${later.text} overlaps line ${earlier.index + 1} (${earlier.text}); enter each spell of downtime once` });
      });
    })
    .transform(({ weatherDowntime }) => ({
      weatherDowntime: weatherDowntime.map((line) => ({ start: String(line.start).trim(), end: String(line.end).trim(), reason: optionalText(line.reason) })),
    }));
}

/**
 * The day's inspections and visitors (the page's form and `PUT …/visitors`): who (name required,
 * organisation), why (purpose, or what the inspection covered), and when they arrived and left in
 * the project's local time on the report's day; the leaving time may be left out (the missing list
 * then asks for it), and comes after the arrival. Refusals name the line and the field.
 */
export function visitorsInputSchema(date: string, timeZone: string) {
  const shape = '{"arrived", "left", "name", "organisation", "purpose"}';
  return z
    .object({ visitors: z.array(enteredLine(["arrived", "left", "name", "organisation", "purpose"], shape), { message: `visitors is a list of ${shape}` }).max(VISITORS_MAX_LINES, `at most ${VISITORS_MAX_LINES} inspections and visitors on one day's report`) })
    .superRefine(({ visitors }, context) => {
      visitors.forEach((line, index) => {
        const issue = (field: string, message: string) => context.addIssue({ code: "custom", path: ["visitors", index, field], message: `line ${index + 1}: ${message}` });
        const name = optionalText(line.name);
        if (typeof line.name !== "string" || name === "") issue("name", "name the visitor or inspector");
        else if (name.length > 120) issue("name", "the name is at most 120 characters");
        for (const [field, most] of [["organisation", 120], ["purpose", 500]] as const) {
          if (line[field] !== undefined && line[field] !== null && typeof line[field] !== "string") issue(field, `the ${field} is words`);
          else if (optionalText(line[field]).length > most) issue(field, `the ${field} is at most ${most} characters`);
        }
        const arrived = clockOnDay(line.arrived, date, timeZone, false);
        if ("problem" in arrived) issue("arrived", `the time of arrival ${arrived.problem}`);
        if (line.left === undefined || line.left === null || optionalText(line.left) === "") return;
        const left = clockOnDay(line.left, date, timeZone, true);
        if ("problem" in left) issue("left", `the time of leaving ${left.problem}`);
        else if ("ms" in arrived && left.ms <= arrived.ms) issue("left", `the time of leaving (${optionalText(line.left)}) comes after the arrival (${optionalText(line.arrived)})`);
      });
    })
    .transform(({ visitors }) => ({
      visitors: visitors.map((line) => ({ arrived: optionalText(line.arrived), left: optionalText(line.left), name: optionalText(line.name), organisation: optionalText(line.organisation), purpose: optionalText(line.purpose) })),
    }));
}

/** The hours in the project's local day: 24, or 23 / 25 across a daylight-saving change. */
export function hoursInDay(project: ProjectView, date: string): number {
  const { startMs, endMs } = localDayBounds(date, project.timeZone);
  return (endMs - startMs) / 3_600_000;
}

const EMPTY_NOTES: EnteredNotesRecord = { weather: null, equipment: [], crews: [], weatherDowntime: [], visitors: [], inspections: "", safety: "", notes: "" };

export interface DailyReportView {
  date: string;
  report: CompiledDay;
  /** Whether the figures are the snapshot taken at signing (true) or compiled just now. */
  asSigned: boolean;
  signed: { name: string; at: string } | null;
  /** The agency inspector's countersignature, through the e-mailed one-time link. */
  countersigned: { name: string; email: string; at: string } | null;
  /**
   * Countersignatures before the latest, kept when the report was amended and countersigned again,
   * oldest first; `amendments`: how many amendments the report carried when it was countersigned.
   */
  earlierCountersignatures: Array<{ name: string; email: string; at: string; amendments: number }>;
  /** Amended since the latest countersignature: the signer may ask the inspector to countersign again. */
  countersignOutdated: boolean;
  amendments: Array<{ text: string; by: string; at: string }>;
  state: DayState;
  /** A signed report whose PDF is not stored (nor sent to the subscribers) yet: the storage did not answer; retried. */
  pdfPending: { attempts: number; nextAttemptAt: string; lastError: string | null } | null;
  /** The other event beside the state, when both happened ("after countersignature", "with 1 amendment"). */
  stateNote: string | null;
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
    // Category, catalogue number and a basket line's count and volume only: a daily report goes to funders and never carries a find's location.
    Find.findAll({ where: { projectId: project.id, foundAt: { [Op.gte]: start, [Op.lt]: end } }, attributes: ["catalogueNumber", "category", "count", "volumeValue", "volumeUnit", "fromBasket"] }),
    Hold.findAll({
      where: { projectId: project.id, [Op.or]: [{ placedAt: { [Op.gte]: start, [Op.lt]: end } }, { liftedAt: { [Op.gte]: start, [Op.lt]: end } }] },
      include: [{ model: Find, as: "find", attributes: ["catalogueNumber"] }],
    }),
    // The project totals each survey left, as of this day and the survey before it.
    SurveySnapshot.findAll({
      where: { projectId: project.id, surveyedOn: { [Op.lte]: date } }, attributes: ["surveyedOn", "totals", "settingsVersionId"], order: [["surveyedOn", "DESC"]], limit: 2,
      include: [{ model: ProjectSettingsVersion, as: "settingsVersion", attributes: ["id", "version"] }],
    }),
  ]);
  const totalsOf = (snapshot: SurveySnapshot): SurveyTotals => ({
    surveyedOn: String(snapshot.surveyedOn), removedVolume: snapshot.totals.removedVolume, remainingVolume: snapshot.totals.remainingVolume, cellsAtFirmSand: snapshot.totals.cellsAtFirmSand,
  });
  const survey = snapshots[0] && String(snapshots[0].surveyedOn) === date
    ? { today: totalsOf(snapshots[0]), previous: snapshots[1] ? totalsOf(snapshots[1]) : null, volumeLabel: unitLabel(project.lengthUnit, "volume"), settingsVersion: snapshots[0].settingsVersion?.version ?? null }
    : null;
  const teams = new Map<string, number>();
  for (const assignment of planned) if (assignment.team) teams.set(assignment.team.name, assignment.team.members.length);
  const interruptions: DayInterruption[] = [
    ...stopWork.map((event) => ({
      kind: "stop-work" as const, reason: `turbidity at ${event.station?.name ?? "a station"}`, startMs: event.openedAt.getTime(), endMs: event.resumedAt?.getTime() ?? null,
      notifyByMs: event.notifyBy.getTime(),
      agencyNotified: event.agencyNotifiedAt ? { atMs: event.agencyNotifiedAt.getTime(), to: event.agencyNotifiedTo ?? "", how: event.agencyNotifiedHow ?? "" } : null,
    })),
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
    finds: finds.map((find) => ({
      catalogueNumber: find.catalogueNumber, category: find.category,
      basket: find.fromBasket ? { count: find.count, volume: find.volumeValue !== null && find.volumeUnit !== null ? { value: find.volumeValue, unit: find.volumeUnit } : null } : null,
    })),
    holds: holds.map((hold) => ({ catalogueNumber: hold.find?.catalogueNumber ?? "", placedAtMs: hold.placedAt.getTime(), liftedAtMs: hold.liftedAt?.getTime() ?? null })),
    entered,
    survey,
  });
}

function findReport(project: ProjectView, date: string) {
  return DailyReport.findOne({ where: { projectId: project.id, localDate: date }, include: [{ model: DailyReportAmendment, as: "amendments" }] });
}

/** A report row's events for its state: signed, countersigned (only once signed), each amendment. */
function eventsOf(row: DailyReport): ReportEvents {
  const signedAtMs = row.signedAt && row.signedByName ? row.signedAt.getTime() : null;
  return {
    signedAtMs,
    countersignedAtMs: signedAtMs !== null && row.countersignedAt && row.countersignedByName ? row.countersignedAt.getTime() : null,
    amendedAtMs: (row.amendments ?? []).map((amendment) => amendment.createdAt.getTime()),
  };
}

/** The used countersign links of a countersigned report but the latest one: its earlier countersignatures, oldest first. */
async function earlierCountersignaturesOf(row: DailyReport | null): Promise<DailyReportView["earlierCountersignatures"]> {
  if (!row?.countersignedAt) return [];
  const used = await CountersignRequest.findAll({ where: { reportId: row.id, usedAt: { [Op.ne]: null }, countersignedName: { [Op.ne]: null } }, order: [["usedAt", "ASC"], ["id", "ASC"]] });
  return used.slice(0, -1).map((request) => ({ name: request.countersignedName!, email: request.email, at: request.usedAt!.toISOString(), amendments: request.amendmentsSeen ?? 0 }));
}

/** The view of a report row (as signed when signed, with the figures given). */
function viewOf(row: DailyReport | null, date: string, report: CompiledDay, worked: boolean, earlierCountersignatures: DailyReportView["earlierCountersignatures"] = []): DailyReportView {
  const signed = row?.signedAt && row.signedByName ? { name: row.signedByName, at: row.signedAt.toISOString() } : null;
  const countersigned = signed && row?.countersignedAt && row.countersignedByName
    ? { name: row.countersignedByName, email: row.countersignedEmail ?? "", at: row.countersignedAt.toISOString() }
    : null;
  const amendments = [...(row?.amendments ?? [])]
    .sort((a, b) => a.createdAt.getTime() - b.createdAt.getTime() || a.id - b.id)
    .map((amendment) => ({ text: amendment.text, by: amendment.byName, at: amendment.createdAt.toISOString() }));
  const { state, note } = dayStatus(row ? eventsOf(row) : null, worked);
  const pdfPending = signed && row?.pdfDueAt ? { attempts: row.pdfAttempts, nextAttemptAt: row.pdfDueAt.toISOString(), lastError: row.pdfLastError } : null;
  const countersignOutdated = countersigned !== null && state === "amended";
  return { date, report, asSigned: Boolean(signed), signed, countersigned, earlierCountersignatures: countersigned ? earlierCountersignatures : [], countersignOutdated, amendments, state, stateNote: note, pdfPending };
}

/** The day's report: as signed (the snapshot) once signed, else compiled now. */
export async function getDailyReport(project: ProjectView, date: string, nowMs = Date.now()): Promise<DailyReportView> {
  const row = await findReport(project, date);
  const report = row?.signedAt && row.snapshot ? (row.snapshot as unknown as CompiledDay) : await compileReport(project, date, row?.entered ?? EMPTY_NOTES, nowMs);
  return viewOf(row, date, report, report.dives.count > 0, await earlierCountersignaturesOf(row));
}

const LOCKED = "This day's report is signed and locked: add an amendment instead.";

/** Stores the weather and notes the supervisor enters; refused once the report is signed. */
export async function saveEnteredNotes(project: ProjectView, user: UserView, date: string, input: z.output<typeof enteredNotesInputSchema>, ip: string | null = null): Promise<void> {
  const weather = input.conditions || input.airTemperature || input.wind || input.rain || input.effect
    ? { conditions: input.conditions, airTemperature: input.airTemperature, wind: input.wind, rain: input.rain, effect: input.effect }
    : null;
  await getSequelize().transaction(async (transaction) => {
    const [row] = await DailyReport.findOrCreate({ where: { projectId: project.id, localDate: date }, defaults: { projectId: project.id, localDate: date, entered: EMPTY_NOTES }, transaction, lock: transaction.LOCK.UPDATE });
    if (row.signedAt) throw new ConflictError(LOCKED);
    // The lists (equipment, head counts, weather downtime, visitors) are saved on their own and kept here.
    const entered: EnteredNotesRecord = { ...row.entered, weather, inspections: input.inspections ?? row.entered.inspections, safety: input.safety, notes: input.notes };
    await row.update({ entered }, { transaction });
    await recordAudit({ action: AUDIT_ACTIONS.dailyReportNotesEntered, projectId: project.id, userId: user.id, ip, detail: { date } }, transaction);
  });
}

/** The equipment names on the latest report before `date` that has any: a new day's lines start from them. */
export async function earlierEquipmentNames(project: ProjectView, date: string): Promise<string[]> {
  const earlier = await DailyReport.findAll({ where: { projectId: project.id, localDate: { [Op.lt]: date } }, attributes: ["id", "entered"], order: [["localDate", "DESC"]], limit: 14 });
  const latest = earlier.find((row) => row.entered.equipment.length > 0);
  return latest ? latest.entered.equipment.map((line) => line.name) : [];
}

/**
 * Replaces the day's equipment lines (checked by `equipmentInputSchema` against the day's length);
 * audited like the weather and notes; refused once the report is signed.
 */
export async function saveEquipment(project: ProjectView, user: UserView, date: string, input: { equipment: EnteredNotesRecord["equipment"] }, ip: string | null = null): Promise<EnteredNotesRecord["equipment"]> {
  await saveEnteredList(project, user, date, { equipment: input.equipment }, { equipment: input.equipment.map((line) => line.name) }, ip);
  return input.equipment;
}

/**
 * Replaces one entered list of the day's report (equipment, head counts, weather downtime, visitors)
 * under the report's row lock, audited like the weather and notes; refused once the report is signed.
 */
async function saveEnteredList(project: ProjectView, user: UserView, date: string, patch: Partial<EnteredNotesRecord>, detail: Record<string, unknown>, ip: string | null): Promise<void> {
  await getSequelize().transaction(async (transaction) => {
    const [row] = await DailyReport.findOrCreate({ where: { projectId: project.id, localDate: date }, defaults: { projectId: project.id, localDate: date, entered: EMPTY_NOTES }, transaction, lock: transaction.LOCK.UPDATE });
    if (row.signedAt) throw new ConflictError(LOCKED);
    await row.update({ entered: { ...row.entered, ...patch } }, { transaction });
    await recordAudit({ action: AUDIT_ACTIONS.dailyReportNotesEntered, projectId: project.id, userId: user.id, ip, detail: { date, ...detail } }, transaction);
  });
}

/**
 * The names of the project's teams: what a head count may name (retired ones too, since an older
 * day's crew may have been one); `inService` keeps to the teams in service (the page's form lists
 * those beside the day's own teams).
 */
export async function projectTeamNames(project: ProjectView, { inService = false } = {}): Promise<string[]> {
  const teams = await DiveTeam.findAll({ where: { projectId: project.id, ...(inService ? { retiredAt: null } : {}) }, attributes: ["name"], order: [["sortOrder", "ASC"], ["name", "ASC"]] });
  return teams.map((team) => team.name);
}

/** Replaces the head counts entered over the compiled ones (checked by `crewsInputSchema`); a team left out goes back to its compiled count. */
export async function saveCrews(project: ProjectView, user: UserView, date: string, input: { crews: EnteredNotesRecord["crews"] }, ip: string | null = null): Promise<EnteredNotesRecord["crews"]> {
  await saveEnteredList(project, user, date, { crews: input.crews }, { crews: input.crews.map((crew) => `${crew.team}: ${crew.headCount}`) }, ip);
  return input.crews;
}

/** Replaces the day's weather downtime (checked by `weatherDowntimeInputSchema` against the day). */
export async function saveWeatherDowntime(project: ProjectView, user: UserView, date: string, input: { weatherDowntime: EnteredNotesRecord["weatherDowntime"] }, ip: string | null = null): Promise<EnteredNotesRecord["weatherDowntime"]> {
  await saveEnteredList(project, user, date, { weatherDowntime: input.weatherDowntime }, { weatherDowntime: input.weatherDowntime.map((spell) => `${spell.start}–${spell.end} ${spell.reason}`) }, ip);
  return input.weatherDowntime;
}

/** Replaces the day's inspections and visitors (checked by `visitorsInputSchema` against the day). */
export async function saveVisitors(project: ProjectView, user: UserView, date: string, input: { visitors: EnteredNotesRecord["visitors"] }, ip: string | null = null): Promise<EnteredNotesRecord["visitors"]> {
  await saveEnteredList(project, user, date, { visitors: input.visitors }, { visitors: input.visitors.map((visitor) => visitor.name) }, ip);
  return input.visitors;
}

/**
 * Signs the day's report with the typed name and keeps the compiled figures as signed; the commit
 * needs nothing but the database, so a signature is never lost to a mail or storage outage. The
 * signed report's PDF is then stored and queued to the subscribers (`prepareSignedPdf`); if the file
 * storage cannot be reached the report waits, marked, and the background job retries it. 409 once signed.
 */
export async function signDailyReport(project: ProjectView, user: UserView, date: string, name: string, ip: string | null = null, nowMs = Date.now()): Promise<DailyReportView> {
  const reportId = await getSequelize().transaction(async (transaction) => {
    const [row] = await DailyReport.findOrCreate({ where: { projectId: project.id, localDate: date }, defaults: { projectId: project.id, localDate: date, entered: EMPTY_NOTES }, transaction, lock: transaction.LOCK.UPDATE });
    if (row.signedAt) throw new ConflictError(`This day's report was already signed by ${row.signedByName} at ${row.signedAt.toISOString()}.`);
    const snapshot = await compileReport(project, date, row.entered, nowMs);
    await row.update({
      signedByName: name, signedAt: new Date(nowMs), signedById: user.id, snapshot: snapshot as unknown as Record<string, unknown>,
      pdfDueAt: new Date(nowMs), pdfAttempts: 0, pdfLastError: null,
    }, { transaction });
    await recordAudit({ action: AUDIT_ACTIONS.dailyReportSigned, projectId: project.id, userId: user.id, ip, detail: { date, name } }, transaction);
    return row.id;
  });
  // The answer waits for the PDF a few seconds at most: a store that hangs rather than refusing
  // leaves the attempt running (its failure is recorded and retried) and the page says "being prepared".
  let timer: NodeJS.Timeout | undefined;
  await Promise.race([
    prepareSignedPdf(reportId).catch(() => "waiting"),
    new Promise((done) => { timer = setTimeout(done, SIGN_WAITS_FOR_PDF_MS); }),
  ]);
  clearTimeout(timer);
  return getDailyReport(project, date, nowMs);
}

/** How long a signature's answer waits for its PDF to be stored before saying it is being prepared. */
const SIGN_WAITS_FOR_PDF_MS = 8_000;

/** Pauses before the 2nd, 3rd… attempt at a signed report's PDF; the last repeats until it is stored (never given up). */
const PDF_RETRY_SECONDS = [15, 60, 300, 900, 1800];

/**
 * A signed report's PDF, made once the signature is committed: rendered from the signed figures,
 * stored, and queued to the project's subscribers with the stored file attached, in one transaction
 * under the report's row lock (two processes never send it twice; a refusal sends nothing). When
 * storage (or anything else) fails, the attempt is counted and the next one set; the signature stays.
 * "stored": done now; "waiting": failed, retried at `pdfDueAt`; "none": nothing was due.
 */
export async function prepareSignedPdf(reportId: number, now = new Date()): Promise<"stored" | "waiting" | "none"> {
  try {
    return await getSequelize().transaction(async (transaction) => {
      const row = await DailyReport.findOne({ where: { id: reportId }, transaction, lock: transaction.LOCK.UPDATE });
      if (!row?.signedAt || !row.signedByName || !row.pdfDueAt) return "none";
      const project = presentProject((await Project.findByPk(row.projectId, { transaction }))!);
      const view = await getDailyReport(project, row.localDate);
      const file = await storeSignedPdf(project, view);
      const subscribers = await ReportSubscriber.findAll({ where: { projectId: project.id }, order: [["email", "ASC"]], transaction });
      for (const subscriber of subscribers) {
        await queueMail({
          to: subscriber.email,
          ref: `daily-report:${row.id}`,
          subject: `Daily report ${row.localDate} signed · ${project.name}`,
          text: [
            `The daily report of ${row.localDate} for "${project.name}" was signed by ${row.signedByName}.`,
            "",
            `The signed report is attached (${file.filename}). Corrections after signing appear as dated amendments beside it.`,
            "",
            "You receive this because a manager of the project added you to its daily report subscribers.",
          ].join("\n"),
          attachments: [{ storageKey: file.key, filename: file.filename, contentType: "application/pdf" }],
        }, transaction);
      }
      await row.update({ pdfDueAt: null, pdfAttempts: 0, pdfLastError: null }, { transaction });
      return "stored" as const;
    });
  } catch (error) {
    const row = await DailyReport.findByPk(reportId, { attributes: ["id", "pdfAttempts", "pdfDueAt"] });
    if (!row?.pdfDueAt) throw error;
    const attempts = row.pdfAttempts + 1;
    const pause = PDF_RETRY_SECONDS[Math.min(attempts, PDF_RETRY_SECONDS.length) - 1]! * 1000;
    const message = String((error as Error).message ?? error).slice(0, 500);
    await DailyReport.update({ pdfAttempts: attempts, pdfLastError: message, pdfDueAt: new Date(now.getTime() + pause) }, { where: { id: reportId } });
    process.stderr.write(`Firmsand: the PDF of signed daily report ${reportId} could not be stored (attempt ${attempts}, retried in ${pause / 1000} s): ${message}\n`);
    return "waiting";
  }
}

/** Makes the signed reports' PDFs that are due (oldest first, a few at a time); returns how many were stored. */
export async function prepareDueSignedPdfs(now = new Date()): Promise<number> {
  const due = await DailyReport.findAll({ where: { pdfDueAt: { [Op.lte]: now } }, attributes: ["id"], order: [["pdfDueAt", "ASC"], ["id", "ASC"]], limit: 10 });
  let stored = 0;
  for (const row of due) if ((await prepareSignedPdf(row.id, now)) === "stored") stored++;
  return stored;
}

let pdfTimer: NodeJS.Timeout | null = null;

/** Retries the waiting signed PDFs every 15 s (unref'd). Started by the production server with the mail delivery. */
export function startSignedPdfJobs(): void {
  if (pdfTimer) return;
  let running = false;
  const tick = () => {
    if (running) return;
    running = true;
    prepareDueSignedPdfs()
      .catch((error: unknown) => process.stderr.write(`Firmsand: the waiting daily report PDFs could not be read: ${(error as Error).message}\n`))
      .finally(() => {
        running = false;
      });
  };
  tick();
  pdfTimer = setInterval(tick, 15_000);
  pdfTimer.unref();
}

// The production server (app/serve.mjs) starts the background tasks the app registers on load.
const registry = globalThis as typeof globalThis & { firmsandBackgroundTasks?: Array<() => void> };
(registry.firmsandBackgroundTasks ??= []).push(startSignedPdfJobs);

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

export { type DayState };

/** The days of a month ("YYYY-MM") in the project's calendar and each one's state. */
export async function listMonthDays(project: ProjectView, month: string): Promise<Array<{ date: string; state: DayState; note: string | null; dives: number }>> {
  const [year, monthNumber] = month.split("-").map(Number);
  const count = new Date(Date.UTC(year!, monthNumber!, 0)).getUTCDate();
  const dates = Array.from({ length: count }, (_, index) => `${month}-${String(index + 1).padStart(2, "0")}`);
  const [reports, dives] = await Promise.all([
    DailyReport.findAll({ where: { projectId: project.id, localDate: { [Op.in]: dates } }, include: [{ model: DailyReportAmendment, as: "amendments", attributes: ["id", "createdAt"] }] }),
    Dive.findAll({ where: { projectId: project.id, diveDate: { [Op.in]: dates } }, attributes: ["diveDate"] }),
  ]);
  return dates.map((date) => {
    const report = reports.find((row) => row.localDate === date) ?? null;
    const diveCount = dives.filter((dive) => dive.diveDate === date).length;
    const { state, note } = dayStatus(report ? eventsOf(report) : null, diveCount > 0);
    return { date, state, note, dives: diveCount };
  });
}

const PDF_TYPE = "application/pdf";
const pdfProject = (project: ProjectView) => ({ name: project.name, timeZone: project.timeZone, lengthUnit: project.lengthUnit });
const pdfDay = (view: DailyReportView): PdfDay => ({
  date: view.date, report: view.report, signed: view.signed, countersigned: view.countersigned, amendments: view.amendments,
  earlierCountersignatures: view.earlierCountersignatures, countersignOutdated: view.countersignOutdated,
});
export const dailyReportFilename = (project: ProjectView, date: string) => `${project.slug}-daily-report-${date}.pdf`;

/**
 * The stored "signed report" file for what the signed report shows now: signed, countersigned
 * ("c"; "c2" for a second countersignature after an amendment) and each amendment ("a2") make a
 * new file, so the first signed file stays as it was sent.
 */
function signedPdfKey(project: ProjectView, view: DailyReportView): string {
  const countersignatures = view.countersigned ? view.earlierCountersignatures.length + 1 : 0;
  const revision = `signed${countersignatures > 0 ? `-c${countersignatures > 1 ? countersignatures : ""}` : ""}${view.amendments.length > 0 ? `-a${view.amendments.length}` : ""}`;
  return objectKey(["projects", project.id, "daily-reports", view.date, `${revision}.pdf`]);
}

async function storeSignedPdf(project: ProjectView, view: DailyReportView): Promise<{ key: string; filename: string; bytes: Buffer }> {
  const key = signedPdfKey(project, view);
  const bytes = await renderDailyReportPdf(pdfProject(project), pdfDay(view));
  await putObject(key, bytes, PDF_TYPE);
  return { key, filename: dailyReportFilename(project, view.date), bytes };
}

/**
 * The day's report as a PDF: a draft is rendered from the figures as they stand; a signed report
 * is rendered once for each state it reaches (signed, countersigned, amended), stored, and served
 * from storage afterwards. While the file storage cannot be reached, a signed report is rendered
 * from its signed figures and served without being stored (`stored: false`), so it still downloads.
 */
export async function dailyReportPdf(project: ProjectView, date: string): Promise<{ bytes: Buffer; filename: string; stored: boolean }> {
  const view = await getDailyReport(project, date);
  const filename = dailyReportFilename(project, date);
  if (!view.signed) return { bytes: await renderDailyReportPdf(pdfProject(project), pdfDay(view)), filename, stored: false };
  const key = signedPdfKey(project, view);
  const kept = await getObject(key).catch(() => undefined);
  if (kept) return { bytes: kept.bytes, filename, stored: true };
  const bytes = await renderDailyReportPdf(pdfProject(project), pdfDay(view));
  // undefined: the storage did not answer; leave storing (and the subscribers' mail) to prepareSignedPdf.
  const stored = kept === null ? await putObject(key, bytes, PDF_TYPE).then(() => true, () => false) : false;
  return { bytes, filename, stored };
}

/** The dates from `from` to `to`, both included; at most 14 (a two-week batch), `from` first. */
export function batchDates(from: string, to: string): string[] {
  if (from > to) throw new ValidationError({ field: "to", message: "The last day comes before the first: choose the first day, then a day on or after it." });
  const dates = [from];
  while (dates.at(-1)! < to) {
    dates.push(nextDayOf(dates.at(-1)!));
    if (dates.length > BATCH_DAYS) throw new ValidationError({ field: "to", message: `A batch holds at most ${BATCH_DAYS} days (two weeks): choose a last day at most 13 days after the first.` });
  }
  return dates;
}

/** Days from `from` to `to` in one PDF, each as the page shows it (signed ones as signed). */
export async function dailyReportBatchPdf(project: ProjectView, from: string, to: string): Promise<{ bytes: Buffer; filename: string }> {
  const dates = batchDates(from, to);
  const views: DailyReportView[] = [];
  for (const date of dates) views.push(await getDailyReport(project, date));
  const bytes = await renderDailyReportBatchPdf(pdfProject(project), views.map(pdfDay));
  return { bytes, filename: `${project.slug}-daily-reports-${from}-to-${to}.pdf` };
}

/** Sends the batch to every subscriber as one PDF (stored, then attached by its key); returns how many mails were queued. */
export async function sendDailyReportBatch(project: ProjectView, user: UserView, from: string, to: string, ip: string | null = null): Promise<number> {
  const subscribers = await ReportSubscriber.findAll({ where: { projectId: project.id }, order: [["email", "ASC"]] });
  if (subscribers.length === 0) throw new ConflictError("This project has no report subscribers yet: add members or addresses first.");
  const { bytes, filename } = await dailyReportBatchPdf(project, from, to);
  const key = objectKey(["projects", project.id, "daily-reports", "batches", `${from}-to-${to}-${Date.now()}.pdf`]);
  await putObject(key, bytes, PDF_TYPE);
  await getSequelize().transaction(async (transaction) => {
    for (const subscriber of subscribers) {
      await queueMail({
        to: subscriber.email,
        ref: `daily-report-batch:${project.id}`,
        subject: `Daily reports ${from} to ${to} · ${project.name}`,
        text: [
          `${user.name} sends the daily reports of "${project.name}" from ${from} to ${to} as one PDF (attached, ${filename}).`,
          "",
          "Signed days are shown as signed, with their countersignature and amendments; unsigned days are marked as drafts.",
        ].join("\n"),
        attachments: [{ storageKey: key, filename, contentType: PDF_TYPE }],
      }, transaction);
    }
    await recordAudit({ action: AUDIT_ACTIONS.dailyReportBatchSent, projectId: project.id, userId: user.id, ip, detail: { from, to, recipients: subscribers.length } }, transaction);
  });
  return subscribers.length;
}

export interface SubscriberView {
  id: number;
  email: string;
  /** The member's name, or null for an outside address. */
  member: string | null;
}

export async function listSubscribers(project: ProjectView): Promise<SubscriberView[]> {
  const rows = await ReportSubscriber.findAll({ where: { projectId: project.id }, include: [{ model: User, as: "user", attributes: ["name"] }], order: [["email", "ASC"]] });
  return rows.map((row) => ({ id: row.id, email: row.email, member: row.user?.name ?? null }));
}

/** The manager adds a member (by account) or an outside address; an address already subscribed is a ConflictError. */
export async function addSubscriber(project: ProjectView, user: UserView, input: z.output<typeof subscriberInputSchema>, ip: string | null = null): Promise<SubscriberView> {
  let email: string;
  let member: User | null = null;
  if ("userId" in input) {
    const membership = await Membership.findOne({ where: { projectId: project.id, userId: input.userId }, include: [{ model: User, as: "user" }] });
    member = (membership as (Membership & { user?: User }) | null)?.user ?? null;
    if (!member) throw new ValidationError({ field: "userId", message: "That person is not a member of this project." });
    email = member.email;
  } else {
    email = normaliseEmail(input.email);
    member = await User.findOne({ where: { email } });
    if (member && !(await Membership.count({ where: { projectId: project.id, userId: member.id } }))) member = null;
  }
  try {
    const row = await getSequelize().transaction(async (transaction) => {
      const created = await ReportSubscriber.create({ projectId: project.id, email, userId: member?.id ?? null, addedById: user.id }, { transaction });
      await recordAudit({ action: AUDIT_ACTIONS.reportSubscriberAdded, projectId: project.id, userId: user.id, ip, detail: { email } }, transaction);
      return created;
    });
    return { id: row.id, email, member: member?.name ?? null };
  } catch (error) {
    if (error instanceof UniqueConstraintError) throw new ConflictError({ field: "email", message: `${email} already receives this project's daily reports.` });
    throw error;
  }
}

export async function removeSubscriber(project: ProjectView, user: UserView, subscriberId: number, ip: string | null = null): Promise<void> {
  await getSequelize().transaction(async (transaction) => {
    const row = await ReportSubscriber.findOne({ where: { id: subscriberId, projectId: project.id }, transaction });
    if (!row) throw new NotFoundError("That subscriber is not on this project's list.");
    await row.destroy({ transaction });
    await recordAudit({ action: AUDIT_ACTIONS.reportSubscriberRemoved, projectId: project.id, userId: user.id, ip, detail: { email: row.email } }, transaction);
  });
}

export const COUNTERSIGN_LIFETIME_MS = 14 * 24 * 60 * 60 * 1000;

/**
 * The signer (or a manager) asks the agency's inspector to countersign: a one-time link by e-mail,
 * like an invitation. An earlier open link for the same report stops working. The report must be
 * signed, and not countersigned, or amended since its countersignature (409 otherwise): the new
 * countersignature is of the amended report; the earlier one stays on record beside it.
 */
export async function requestCountersign(project: ProjectView, user: UserView, date: string, emailInput: string, origin: string, ip: string | null = null, now = new Date()): Promise<{ email: string; expiresAt: string; token: string }> {
  const email = normaliseEmail(emailInput);
  const { token, tokenHash } = createLinkToken();
  const expiresAt = new Date(now.getTime() + COUNTERSIGN_LIFETIME_MS);
  await getSequelize().transaction(async (transaction) => {
    const row = await DailyReport.findOne({ where: { projectId: project.id, localDate: date }, transaction, lock: transaction.LOCK.UPDATE });
    if (!row?.signedAt) throw new ConflictError("This day's report is not signed yet: sign it before asking for the inspector's countersignature.");
    if (row.countersignedAt && !(await amendedSinceCountersign(row, transaction))) {
      throw new ConflictError(`This day's report was already countersigned by ${row.countersignedByName}, and not amended since: a new countersignature is asked for only after an amendment.`);
    }
    // The open links are found first and revoked by id: an UPDATE ranging over reportId took gap locks
    // that deadlocked with the INSERT of a link for another day's report asked for at the same moment.
    // The report's row lock keeps this report's links from changing meanwhile.
    const open = await CountersignRequest.findAll({ where: { reportId: row.id, usedAt: null, revokedAt: null }, attributes: ["id"], transaction });
    if (open.length > 0) await CountersignRequest.update({ revokedAt: now }, { where: { id: open.map((link) => link.id) }, transaction });
    const request = await CountersignRequest.create({ reportId: row.id, email, tokenHash, expiresAt, requestedById: user.id }, { transaction });
    await recordAudit({ action: AUDIT_ACTIONS.dailyReportCountersignRequested, projectId: project.id, userId: user.id, ip, detail: { date, email } }, transaction);
    await queueMail({
      to: email,
      ref: `countersign:${request.id}`,
      subject: `Please countersign the daily report of ${date} · ${project.name}`,
      text: [
        `${user.name} asks you to countersign the daily report of ${date} for "${project.name}" on Firmsand.`,
        "",
        `Open this link to read the signed report and countersign it with your typed name: ${origin}/countersign/${token}`,
        "",
        `No account is needed. The link works once and expires on ${expiresAt.toUTCString()}.`,
      ].join("\n"),
    }, transaction);
  });
  return { email, expiresAt: expiresAt.toISOString(), token };
}

/** The open countersign link of a signed report, if one was sent (for the page to say so). */
export async function openCountersignRequest(project: ProjectView, date: string, now = new Date()): Promise<{ email: string; expiresAt: string; mailRef: string } | null> {
  const request = await CountersignRequest.findOne({
    where: { usedAt: null, revokedAt: null, expiresAt: { [Op.gt]: now } },
    include: [{ model: DailyReport, as: "report", where: { projectId: project.id, localDate: date }, required: true }],
    order: [["id", "DESC"]],
  });
  return request ? { email: request.email, expiresAt: request.expiresAt.toISOString(), mailRef: `countersign:${request.id}` } : null;
}

export type CountersignLookup =
  | { status: "open"; email: string; projectName: string; timeZone: string; lengthUnit: ProjectView["lengthUnit"]; view: DailyReportView }
  | { status: "expired" | "used" | "unknown" };

/** Whether a countersigned report was amended since (an amendment in the same second counts as later, as on the calendar). */
async function amendedSinceCountersign(report: DailyReport, transaction?: Transaction): Promise<boolean> {
  if (!report.countersignedAt || !report.signedAt) return false;
  const amendments = await DailyReportAmendment.findAll({ where: { reportId: report.id }, attributes: ["id", "createdAt"], transaction });
  const { state } = dayStatus({ signedAtMs: report.signedAt.getTime(), countersignedAtMs: report.countersignedAt.getTime(), amendedAtMs: amendments.map((amendment) => amendment.createdAt.getTime()) }, true);
  return state === "amended";
}

async function findCountersignRequest(token: string, transaction?: Transaction) {
  return CountersignRequest.findOne({
    where: { tokenHash: hashLinkToken(token) },
    include: [{ model: DailyReport, as: "report", include: [{ model: Project, as: "project" }] }],
    transaction,
    lock: transaction ? transaction.LOCK.UPDATE : undefined,
  });
}

/** A link is spent once used or replaced, and when the report is countersigned and not amended since (`current`). */
function countersignStatus(request: CountersignRequest | null, now: Date, current: boolean): "open" | "expired" | "used" | "unknown" {
  if (!request?.report) return "unknown";
  if (request.usedAt || request.revokedAt || current) return "used";
  if (request.expiresAt.getTime() <= now.getTime()) return "expired";
  return "open";
}

/** What a countersign link shows: the signed report, read-only, or why the link no longer works. */
export async function lookUpCountersign(token: string, now = new Date()): Promise<CountersignLookup> {
  const request = await findCountersignRequest(token);
  const current = Boolean(request?.report?.countersignedAt) && !(await amendedSinceCountersign(request!.report!));
  const status = countersignStatus(request, now, current);
  if (status !== "open" || !request?.report?.project) return { status: status === "open" ? "unknown" : status };
  const project = presentProject(request.report.project);
  return { status: "open", email: request.email, projectName: project.name, timeZone: project.timeZone, lengthUnit: project.lengthUnit, view: await getDailyReport(project, request.report.localDate) };
}

/** Countersigns through the link, once: the report becomes countersigned and the link is spent. */
export async function countersignReport(token: string, name: string, ip: string | null = null, now = new Date()): Promise<{ ok: true; date: string } | { ok: false; reason: "expired" | "used" | "unknown" }> {
  return getSequelize().transaction(async (transaction) => {
    const request = await findCountersignRequest(token, transaction);
    const report = request ? await DailyReport.findOne({ where: { id: request.reportId }, transaction, lock: transaction.LOCK.UPDATE }) : null;
    if (request && report) request.report = report;
    const current = Boolean(report?.countersignedAt) && !(await amendedSinceCountersign(report!, transaction));
    const status = countersignStatus(request, now, current);
    if (status !== "open" || !request || !report) return { ok: false, reason: status === "open" ? "unknown" : status };
    // The version countersigned: the amendments the report carries now. An earlier countersignature stays on its own link's row.
    const amendmentsSeen = await DailyReportAmendment.count({ where: { reportId: report.id }, transaction });
    const again = report.countersignedAt !== null;
    await report.update({ countersignedByName: name, countersignedEmail: request.email, countersignedAt: now }, { transaction });
    await request.update({ usedAt: now, countersignedName: name, amendmentsSeen }, { transaction });
    await recordAudit({ action: AUDIT_ACTIONS.dailyReportCountersigned, projectId: report.projectId, userId: null, ip, detail: { date: report.localDate, name, email: request.email, amendments: amendmentsSeen, ...(again ? { again: true } : {}) } }, transaction);
    return { ok: true, date: report.localDate };
  });
}

/**
 * The `<date>` of a day's URL, or a NotFoundError naming the `date` field: a day that cannot exist
 * (2026-13-45, 2026-02-30, "abc") has no report. Pages answer it with the not-found page, the API
 * with its JSON 404.
 */
export function dayParam(value: string | undefined): string {
  const parsed = reportDateSchema.safeParse(value);
  if (!parsed.success) {
    const shaped = /^\d{4}-\d{2}-\d{2}$/.test(value ?? "");
    throw new NotFoundError({
      field: "date",
      value: (value ?? "").slice(0, 40),
      message: shaped ? `There is no day ${value} in the calendar: check the month and the day.` : "There is no such day: a day is written YYYY-MM-DD, e.g. 2026-06-10.",
    });
  }
  return parsed.data;
}

const nextDayOf = (date: string) => {
  const [year, month, day] = date.split("-").map(Number);
  return new Date(Date.UTC(year!, month! - 1, day! + 1)).toISOString().slice(0, 10);
};
