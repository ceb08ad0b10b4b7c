import { FIND_CATEGORY_LABELS, type FindCategory } from "../finds/finds";
import { localClockOf } from "../local-time";
import { LITRES_PER_US_GALLON, handVolumeUnitFor, kilogramsTo, litresTo, massUnitsFor, measureLabel, type LengthUnit } from "../units";
import { COMPLIANCE_STATION_SETTING, type CompiledDay, type EquipmentLine, type TeamDay, type VisitorLine, type Weather } from "./compile";

/**
 * How a compiled day's figures are written out, once for the page and the PDF: the report keeps
 * SI figures and shows them in the project's units (US gallons, short tons and pounds on a feet
 * project; cubic metres, tonnes and kilograms on a metre project). Pure.
 */

export const formatNumber = (value: number, places = 1) => value.toLocaleString("en-US", { maximumFractionDigits: places });

export interface ReportUnits {
  slurry: (m3: number) => string;
  bulk: (kg: number) => string;
  mass: (kg: number) => string;
}

export function reportUnits(lengthUnit: LengthUnit): ReportUnits {
  const { mass, bulkMass } = massUnitsFor(lengthUnit);
  const metric = lengthUnit === "m";
  return {
    slurry: (m3) => (metric ? `${formatNumber(m3)} m³` : `${formatNumber((m3 * 1000) / LITRES_PER_US_GALLON, 0)} gal`),
    bulk: (kg) => `${formatNumber(kilogramsTo(kg, bulkMass), 2)} ${measureLabel(bulkMass)}`,
    mass: (kg) => `${formatNumber(kilogramsTo(kg, mass), metric ? 2 : 1)} ${measureLabel(mass)}`,
  };
}

/** The production figures as label and value, in the order the page and the PDF show them. */
export function productionRows(production: CompiledDay["production"], units: ReportUnits): Array<[string, string]> {
  return [
    ["Shifts", String(production.shifts)],
    ["Pump hours", formatNumber(production.pumpHours, 2)],
    ["Slurry pumped", units.slurry(production.slurryPumpedM3)],
    ["Dry solids pumped", units.bulk(production.drySolidsKg)],
    ["Neat polymer", units.mass(production.neatPolymerKg)],
    ["Tube fills", String(production.tubeFills)],
    ["Haul loads", String(production.haulLoads)],
    ["Dry solids hauled", units.bulk(production.haulDrySolidsKg)],
  ];
}

/** "Overcast · 18 °C · wind SW 10 kn · rain none", or null when nothing was entered. */
export function weatherLine(weather: Weather | null): string | null {
  if (!weather) return null;
  const line = [weather.conditions, weather.airTemperature, weather.wind && `wind ${weather.wind}`, weather.rain && `rain ${weather.rain}`].filter(Boolean).join(" · ");
  return line || null;
}

/** The equipment lines as the page's and the PDF's table rows: name, hours working, hours idle, idle reason ("—" when not idle). */
export function equipmentRows(equipment: readonly EquipmentLine[] | undefined): Array<[string, string, string, string]> {
  return (equipment ?? []).map((line) => [line.name, formatNumber(line.workingHours, 2), formatNumber(line.idleHours, 2), line.idleHours > 0 ? line.idleReason : "—"]);
}

/** "3 pieces: 26.5 h working, 5.5 h idle", or null when no equipment was entered. */
export function equipmentTotalsLine(equipment: readonly EquipmentLine[] | undefined): string | null {
  if (!equipment || equipment.length === 0) return null;
  const working = equipment.reduce((sum, line) => sum + line.workingHours, 0);
  const idle = equipment.reduce((sum, line) => sum + line.idleHours, 0);
  return `${equipment.length} ${equipment.length === 1 ? "piece" : "pieces"}: ${formatNumber(working, 2)} h working, ${formatNumber(idle, 2)} h idle`;
}

/** "Cultural: 1 · Faunal: 2", or null when there were no finds. */
export function findsLine(byCategory: Record<string, number>): string | null {
  const entries = Object.entries(byCategory);
  if (entries.length === 0) return null;
  return entries.map(([category, count]) => `${FIND_CATEGORY_LABELS[category as FindCategory] ?? category}: ${count}`).join(" · ");
}

/**
 * The debris removed by hand in words: "Removed by hand in basket loads: 23 items counted, 12.5 gal
 * by volume (4 catalogue lines)", the volume in the project's hand-volume unit (US gallons on a feet
 * project, litres on a metre project); null when no basket load was logged.
 */
export function byHandLine(byHand: CompiledDay["finds"]["byHand"], lengthUnit: LengthUnit): string | null {
  if (!byHand) return null;
  const unit = handVolumeUnitFor(lengthUnit);
  const parts = [
    byHand.items > 0 ? `${formatNumber(byHand.items, 0)} item${byHand.items === 1 ? "" : "s"} counted` : null,
    byHand.litres !== null ? `${formatNumber(litresTo(byHand.litres, unit), 1)} ${measureLabel(unit)} by volume` : null,
  ].filter(Boolean);
  return `Removed by hand in basket loads: ${parts.join(", ")} (${byHand.lines} catalogue line${byHand.lines === 1 ? "" : "s"})`;
}

const INTERRUPTION_KINDS: Record<CompiledDay["interruptions"][number]["kind"], string> = { "stop-work": "Stop-work", "stand-down": "Wildlife stand-down", weather: "Weather downtime" };

/** An interruption in words, with its local times, the hours it cost on the day and, for a stop-work, the agency's notice. */
export function interruptionLine(event: CompiledDay["interruptions"][number], timeZone: string): string {
  const clock = (iso: string) => localClockOf(Date.parse(iso), timeZone);
  // A weather spell ending at midnight ends the day: 24:00, not the next day's 00:00.
  const end = event.end === null ? "still open" : event.kind === "weather" && clock(event.end) === "00:00" ? "24:00" : clock(event.end);
  const line = `${INTERRUPTION_KINDS[event.kind]} (${event.reason}) from ${clock(event.start)} to ${end}: ${formatNumber(event.lostHours, 2)} h lost on the day`;
  if (event.agencyNotified) {
    const notice = [event.agencyNotified.to && `to ${event.agencyNotified.to}`, event.agencyNotified.how && `by ${event.agencyNotified.how}`].filter(Boolean).join(", ");
    return `${line}; agency notified at ${clock(event.agencyNotified.at)}${notice ? ` (${notice})` : ""}`;
  }
  if (event.agencyNotified === null) return `${line}; agency not notified${event.notifyBy ? ` (due by ${clock(event.notifyBy)})` : ""}`;
  return line;
}

/**
 * Said beside the day's lost hours when interruptions overlapped: an hour lost to two causes counts
 * once, and the lines add up to more ("… counts once; 4.5 h line by line"); null when none overlapped.
 */
export function lostHoursNote(report: Pick<CompiledDay, "interruptions" | "lostHours">): string | null {
  const separately = report.interruptions.reduce((sum, event) => sum + event.lostHours, 0);
  return separately > report.lostHours + 0.005 ? `interruptions overlapped: an hour lost to two causes counts once; ${formatNumber(separately, 2)} h line by line` : null;
}

/** A team's head count for the table: "—", "4", or "5 entered" when entered over the compiled figure. */
export function headCountCell(team: TeamDay): string {
  if (team.headCount === null) return "—";
  return team.enteredHeadCount ? `${team.headCount} entered` : String(team.headCount);
}

/** What the compiled head count rests on, in words: "4 from the day plan", "3 from the dive log", "none compiled". */
export function compiledHeadCountWords(team: Pick<TeamDay, "compiledHeadCount" | "headCountSource">): string {
  return team.compiledHeadCount == null || !team.headCountSource ? "none compiled" : `${team.compiledHeadCount} from the ${team.headCountSource}`;
}

/**
 * The head counts entered over the compiled ones, the compiled figure beside each: "Head counts
 * entered: Alpha 4 from the day plan, entered 5 (a county tender joined)"; null when none was entered.
 */
export function enteredHeadCountsLine(teams: readonly TeamDay[]): string | null {
  const entered = teams.filter((team) => team.enteredHeadCount);
  if (entered.length === 0) return null;
  return `Head counts entered: ${entered.map((team) => `${team.team} ${compiledHeadCountWords(team)}, entered ${team.enteredHeadCount!.headCount}${team.enteredHeadCount!.reason ? ` (${team.enteredHeadCount!.reason})` : ""}`).join("; ")}.`;
}

/** The inspections and visitors as table rows: arrived, left ("—" not entered), name, organisation, purpose. */
export function visitorRows(visitors: readonly VisitorLine[] | undefined): Array<[string, string, string, string, string]> {
  return (visitors ?? []).map((visitor) => [visitor.arrived, visitor.left || "—", visitor.name, visitor.organisation || "—", visitor.purpose || "—"]);
}

/** The survey of the day against the one before it, in words, or null when no survey fell on the day. */
export function surveyLine(survey: CompiledDay["production"]["survey"]): string | null {
  if (!survey) return null;
  const cells = Math.abs(survey.cellsReachedFirmSand) === 1 ? "cell" : "cells";
  return `Survey of this day${survey.since ? ` against the survey of ${survey.since}` : ""}: ${formatNumber(survey.removedVolume)} ${survey.volumeLabel} removed, ${survey.cellsReachedFirmSand} ${cells} newly at firm sand, ${formatNumber(survey.remainingVolume)} ${survey.volumeLabel} remaining.${survey.settingsVersion != null ? ` Computed with settings version ${survey.settingsVersion}.` : ""}`;
}

/** What the report says on a project with no compliance station (and so no sampling check), once for the page and the PDF. */
export function noComplianceStationLine(): string {
  return `No compliance station is set up for this project, so missed sampling intervals are not checked. A manager adds one under ${COMPLIANCE_STATION_SETTING}.`;
}

/** An earlier countersignature in words, with the version it countersigned (`stamp`: an instant as the project's local date and time). */
export function earlierCountersignatureLine(earlier: { name: string; email: string; at: string; amendments: number }, stamp: (iso: string) => string): string {
  const version = earlier.amendments === 0 ? "the report as signed, before any amendment" : `the report with its first ${earlier.amendments === 1 ? "amendment" : `${earlier.amendments} amendments`}`;
  return `Earlier countersignature: ${earlier.name}, ${stamp(earlier.at)} (link sent to ${earlier.email}), of ${version}.`;
}

/** What a countersigned report that was amended since says beside its countersignature. */
export function countersignOutdatedLine(): string {
  return "Amended after this countersignature: the countersignature is of the report before that amendment.";
}

/** A batch sent or downloaded as one PDF holds at most two weeks of days. */
export const BATCH_DAYS = 14;

/** A report's state on the calendar, and its words (never colour alone). */
export type DayState = "no work" | "draft" | "signed" | "countersigned" | "amended";

export const DAY_STATE_DESCRIPTIONS: Record<DayState, string> = {
  "no work": "no dives and no report",
  draft: "work logged or notes entered, not signed",
  signed: "signed by the supervisor, locked",
  countersigned: "countersigned by the agency's inspector, with any amendment made before it",
  amended: "corrected by a dated amendment since it was signed or countersigned",
};

/** What happened to a report, when (milliseconds); null for what has not happened. */
export interface ReportEvents {
  signedAtMs: number | null;
  countersignedAtMs: number | null;
  amendedAtMs: readonly number[];
}

/**
 * A day's state on the calendar: the latest of its report's events wins. Signed, then countersigned
 * by the inspector: countersigned. An amendment after the countersignature: amended, since the
 * inspector countersigned a report that has been corrected since (the correction waits for their
 * eyes). An amendment before the countersignature: countersigned, since the inspector countersigned
 * the report with that amendment beside it. An amendment and a countersignature stamped in the same
 * second count the amendment as later, so a correction is never hidden behind a countersignature.
 * `note` says the other event, so both show: "after countersignature", "with 1 amendment".
 */
export function dayStatus(report: ReportEvents | null, worked: boolean): { state: DayState; note: string | null } {
  if (!report || report.signedAtMs === null) return { state: report || worked ? "draft" : "no work", note: null };
  const lastAmendment = report.amendedAtMs.length > 0 ? Math.max(...report.amendedAtMs) : null;
  const countersigned = report.countersignedAtMs;
  const amendments = (count: number) => `with ${count} ${count === 1 ? "amendment" : "amendments"}`;
  // Stored times keep whole seconds: within one second the amendment counts as the later event.
  const second = (ms: number) => Math.floor(ms / 1000);
  if (countersigned !== null && (lastAmendment === null || second(countersigned) > second(lastAmendment))) {
    return { state: "countersigned", note: report.amendedAtMs.length > 0 ? amendments(report.amendedAtMs.length) : null };
  }
  if (lastAmendment !== null) return { state: "amended", note: countersigned !== null ? "after countersignature" : null };
  return { state: "signed", note: null };
}

/** The state alone (see dayStatus). */
export function dayState(report: ReportEvents | null, worked: boolean): DayState {
  return dayStatus(report, worked).state;
}
