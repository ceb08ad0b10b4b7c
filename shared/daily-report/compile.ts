import { instantOfLocal, localClockOf } from "../local-time";
import { instantOfClock, unionHours } from "./local-periods";
import { parseCellLabel } from "../grid/cell-grid";
import { missedIntervals, type SamplingRoutine } from "../water-quality/missed-samples";
import { litresFrom, type HandVolumeUnit } from "../units";

/**
 * The daily report compiled from one local day's records (already loaded and already limited to
 * that day by the caller, except interruptions, which are clipped here to the local day). Pure:
 * the figures are sums of the records, and what is missing is listed so no field goes blank.
 */

/** One US gallon is 231 cubic inches exactly (US customary definition): 0.003785411784 m³. */
export const M3_PER_US_GALLON = 0.003785411784;

export interface DayDive {
  team: string;
  diver: string;
  /** The diver was not on the team's roster (logged as a visitor). */
  visitor?: boolean;
  bottomMinutes: number;
  maxDepth: number;
  cells: readonly string[];
  /** The bottom time goes beyond the table's no-decompression figure for the depth (information only). */
  beyondNoDecompression: boolean;
}

export interface DayShift {
  pumpHours: number;
  slurryFlow: { value: number; unit: "gpm" | "m3/h" };
  drySolidsKg: number | null;
  neatPolymerKg: number | null;
}

export interface DayHaul {
  ticketNumber: string;
  drySolidsKg: number;
  loadWetMass: number | null;
  loadVolume: number | null;
}

export interface DayReading {
  station: string;
  stationKind: string;
  takenAtMs: number;
  value: number;
  unit: string;
  /** The verdict made on save: true exceeds, false within the limit, null not evaluated (no pair or no rule). */
  exceeds: boolean | null;
}

export interface DayInterruption {
  /** Weather downtime is entered on the report (compiled from `entered.weatherDowntime`); the others are records. */
  kind: "stop-work" | "stand-down" | "weather";
  /** Station or species. */
  reason: string;
  startMs: number;
  /** Null while still open. */
  endMs: number | null;
  /** A stop-work's notice to the agency: when it was due, and when, to whom and how it was given (null: not yet). */
  notifyByMs?: number | null;
  agencyNotified?: { atMs: number; to: string; how: string } | null;
}

export interface DayFind {
  catalogueNumber: string;
  category: string;
  /** A line of a basket load (debris removed by hand), with its count and volume as entered. */
  basket?: { count: number | null; volume: { value: number; unit: HandVolumeUnit } | null } | null;
}

export interface DayHold {
  catalogueNumber: string;
  placedAtMs: number;
  liftedAtMs: number | null;
}

export interface Weather {
  conditions: string;
  airTemperature: string;
  wind: string;
  rain: string;
  /** The weather's effect on the work, in words. */
  effect: string;
}

/** One piece of equipment's day, as entered: hours working, hours idle, and why it stood idle. */
export interface EquipmentLine {
  /** In the site's words: "suction pump 1", "booster pump", "dewatering plant", "work boat". */
  name: string;
  workingHours: number;
  idleHours: number;
  /** Required when idleHours > 0. */
  idleReason: string;
}

/** The most pieces of equipment one day's report lists. */
export const EQUIPMENT_MAX_LINES = 20;

/** A crew's head count entered on the report, overriding the compiled one (from the day plan or the dive log). */
export interface CrewHeadCount {
  team: string;
  /** Whole people on site, 0 to 99. */
  headCount: number;
  /** Why the compiled figure is not the crew on site, in words (optional). */
  reason: string;
}

/** A spell of weather downtime, in the project's local time on the report's day. */
export interface WeatherDowntime {
  /** HH:MM local. */
  start: string;
  /** HH:MM local, or 24:00 (the day's end); after the start. */
  end: string;
  /** In words: "lightning within 10 miles", "wind over 20 kn on the open water". */
  reason: string;
}

/** An inspection or a visit: who came, from where, why, and when they arrived and left (local HH:MM). */
export interface VisitorLine {
  arrived: string;
  /** "" when the time of leaving was not entered (the missing list asks for it). */
  left: string;
  name: string;
  organisation: string;
  /** The purpose of the visit, or what the inspection covered. */
  purpose: string;
}

/** The most lines of each entered list on one day's report. */
export const WEATHER_DOWNTIME_MAX_LINES = 12;
export const VISITORS_MAX_LINES = 30;
export const HEAD_COUNT_MAX = 99;

export interface EnteredNotes {
  weather: Weather | null;
  /** Equipment working and idle; absent on reports saved or signed before equipment hours were kept. */
  equipment?: EquipmentLine[];
  /** Head counts entered over the compiled ones; absent on reports saved or signed before they could be. */
  crews?: CrewHeadCount[];
  /** Weather downtime spells; absent on reports saved or signed before they were kept. */
  weatherDowntime?: WeatherDowntime[];
  /** Inspections and visitors with their times; absent on reports saved or signed before they were kept. */
  visitors?: VisitorLine[];
  /**
   * Inspections and visitors as free text, as entered before they were lines with times: kept and
   * shown as an earlier note, no longer entered.
   */
  inspections: string;
  safety: string;
  notes: string;
}

export interface DayRecords {
  date: string;
  timeZone: string;
  /** The instant the report is compiled; an open interruption counts until then (or the day's end). */
  nowMs: number;
  /** The project's short length label ("ftUS", "m"): depths in the flags carry it. */
  lengthLabel?: string;
  dives: readonly DayDive[];
  /** Team sizes from the day plan: team name → head count. */
  plannedTeams: ReadonlyArray<{ team: string; headCount: number }>;
  shifts: readonly DayShift[];
  tubeFills: number;
  hauls: readonly DayHaul[];
  complianceStations: readonly string[];
  readings: readonly DayReading[];
  sampling: SamplingRoutine | null;
  interruptions: readonly DayInterruption[];
  finds: readonly DayFind[];
  holds: readonly DayHold[];
  entered: EnteredNotes;
  /** The survey figures as of this day's survey and of the survey before it, when a survey fell on the day. */
  survey?: DaySurvey | null;
}

/** Project totals as of a survey date (the figures each survey leaves: removed so far, remaining, cells at firm sand). */
export interface SurveyTotals {
  surveyedOn: string;
  removedVolume: number;
  remainingVolume: number;
  cellsAtFirmSand: number;
}

export interface DaySurvey {
  /** The totals as of the survey that fell on the day. */
  today: SurveyTotals;
  /** The totals as of the survey in force before it (the baseline's are zero removed). */
  previous: SurveyTotals | null;
  volumeLabel: string;
  /** The settings version the day's figures were computed with (the settings history); null: not recorded. */
  settingsVersion?: number | null;
}

export interface TeamDay {
  team: string;
  /** The head count the report gives: the entered one when there is one, else the compiled one. */
  headCount: number | null;
  /**
   * The compiled figure and where it comes from: the team's roster on the day plan, else the divers
   * the dive log names for the team (visitors included). Absent on reports signed before head counts could be entered.
   */
  compiledHeadCount?: number | null;
  headCountSource?: "day plan" | "dive log" | null;
  /** The head count entered over the compiled one, with its reason; null when none was. */
  enteredHeadCount?: { headCount: number; reason: string } | null;
  dives: number;
  bottomMinutes: number;
  maxDepth: number | null;
  cells: string[];
  flags: string[];
  /** Divers logged as visitors (not on the team's roster); absent in reports signed before visitors were marked. */
  visitors?: string[];
}

export interface CompiledDay {
  date: string;
  dives: { count: number; bottomMinutes: number; maxDepth: number | null; flags: string[] };
  teams: TeamDay[];
  cells: string[];
  production: {
    shifts: number;
    pumpHours: number;
    slurryPumpedM3: number;
    drySolidsKg: number;
    neatPolymerKg: number;
    tubeFills: number;
    haulLoads: number;
    haulDrySolidsKg: number;
    haulTickets: string[];
    /**
     * When a survey fell on the day: what it shows since the survey before it (removed volume, the
     * cells that reached firm sand), and what remains. Absent on reports signed before it existed.
     */
    survey?: { surveyedOn: string; since: string | null; removedVolume: number; cellsReachedFirmSand: number; remainingVolume: number; volumeLabel: string; settingsVersion?: number | null } | null;
  };
  waterQuality: {
    readings: Array<{ station: string; stationKind: string; count: number; maxValue: number; unit: string; exceeding: number; withinLimit: number; notEvaluated: number; verdict: "exceeds" | "within limit" | "not evaluated" }>;
    exceedances: Array<{ station: string; at: string; value: number; unit: string }>;
    missedIntervals: Array<{ from: string; to: string }>;
    /**
     * The project's compliance stations when the day was compiled. None: sampling intervals are
     * not checked and no gap is listed (the report says no compliance station is set up). Absent on
     * reports signed before it was kept.
     */
    complianceStations?: string[];
  };
  interruptions: Array<{
    kind: DayInterruption["kind"]; reason: string; start: string; end: string | null; lostHours: number;
    /** A stop-work's agency notice: due by, and given (null: not yet). Absent on stand-downs and on reports signed before it was kept. */
    notifyBy?: string | null;
    agencyNotified?: { at: string; to: string; how: string } | null;
  }>;
  lostHours: number;
  finds: {
    byCategory: Record<string, number>;
    catalogueNumbers: string[];
    /**
     * The debris removed by hand: the day's basket lines, the items they counted and the volumes
     * they gave, added in litres (null when no line gave a volume). Present only when a basket load
     * was logged (and absent on reports signed before basket volumes).
     */
    byHand?: { lines: number; items: number; litres: number | null };
  };
  holds: { placed: string[]; lifted: string[] };
  entered: EnteredNotes;
  missing: string[];
}

/** Where a manager sets up compliance stations, in the app's own words. */
export const COMPLIANCE_STATION_SETTING = "Water quality › Setup › Monitoring stations";
export const NO_COMPLIANCE_STATION_MISSING = `no compliance station set up, so sampling is not checked (a manager adds one under ${COMPLIANCE_STATION_SETTING})`;

/** Cells in grid order, column then row ("D7 D8 D10 E7", never "D10 D7 D8"); an unreadable label by its text. */
export function byCell(a: string, b: string): number {
  const p = parseCellLabel(a);
  const q = parseCellLabel(b);
  if (!p || !q) return p ? -1 : q ? 1 : a.localeCompare(b);
  return p.col - q.col || p.row - q.row;
}

const round = (value: number, places: number) => Math.round(value * 10 ** places) / 10 ** places;

/**
 * A survey's figures since the one before it: the removed volume and cells at firm sand are
 * cumulative per survey, so the day's share is the difference (a cell can fall back from firm sand
 * when muck slumps in, which the difference nets out).
 */
export function surveySince(survey: DaySurvey | null): CompiledDay["production"]["survey"] {
  if (!survey) return null;
  const { today, previous } = survey;
  return {
    surveyedOn: today.surveyedOn,
    since: previous?.surveyedOn ?? null,
    removedVolume: round(today.removedVolume - (previous?.removedVolume ?? 0), 1),
    cellsReachedFirmSand: today.cellsAtFirmSand - (previous?.cellsAtFirmSand ?? 0),
    remainingVolume: round(today.remainingVolume, 1),
    volumeLabel: survey.volumeLabel,
    ...(survey.settingsVersion != null ? { settingsVersion: survey.settingsVersion } : {}),
  };
}

/** The day after a local date (calendar arithmetic, no zone). */
export function nextDay(date: string): string {
  const [year, month, day] = date.split("-").map(Number);
  return new Date(Date.UTC(year!, month! - 1, day! + 1)).toISOString().slice(0, 10);
}

/** The local day as instants `[start, end)`; 23 or 25 hours long across a daylight-saving change. */
export function localDayBounds(date: string, timeZone: string): { startMs: number; endMs: number } {
  return { startMs: instantOfLocal(date, 0, timeZone), endMs: instantOfLocal(nextDay(date), 0, timeZone) };
}

export function slurryM3(shift: DayShift): number {
  const perHourM3 = shift.slurryFlow.unit === "gpm" ? shift.slurryFlow.value * 60 * M3_PER_US_GALLON : shift.slurryFlow.value;
  return perHourM3 * shift.pumpHours;
}

export function compileDay(records: DayRecords): CompiledDay {
  const { date, timeZone } = records;
  const { startMs, endMs } = localDayBounds(date, timeZone);
  const clock = (ms: number) => localClockOf(ms, timeZone);

  const enteredCrews = records.entered.crews ?? [];
  const teamNames = [...new Set([...records.plannedTeams.map((team) => team.team), ...records.dives.map((dive) => dive.team), ...enteredCrews.map((crew) => crew.team)])].sort();
  const teams: TeamDay[] = teamNames.map((team) => {
    const own = records.dives.filter((dive) => dive.team === team);
    const flags = own.filter((dive) => dive.beyondNoDecompression).map((dive) => `${dive.diver}${dive.visitor ? " (visitor)" : ""}: bottom time ${dive.bottomMinutes} min at ${dive.maxDepth}${records.lengthLabel ? ` ${records.lengthLabel}` : ""} beyond the no-decompression figure`);
    // The day plan's roster first; a team that dove without a plan counts the divers its log names.
    const planned = records.plannedTeams.find((candidate) => candidate.team === team)?.headCount;
    const divers = new Set(own.map((dive) => dive.diver)).size;
    const compiledHeadCount = planned ?? (divers > 0 ? divers : null);
    const entered = enteredCrews.find((crew) => crew.team === team);
    return {
      team,
      headCount: entered ? entered.headCount : compiledHeadCount,
      compiledHeadCount,
      headCountSource: planned !== undefined ? ("day plan" as const) : divers > 0 ? ("dive log" as const) : null,
      enteredHeadCount: entered ? { headCount: entered.headCount, reason: entered.reason } : null,
      dives: own.length,
      bottomMinutes: own.reduce((sum, dive) => sum + dive.bottomMinutes, 0),
      maxDepth: own.length ? Math.max(...own.map((dive) => dive.maxDepth)) : null,
      cells: [...new Set(own.flatMap((dive) => dive.cells))].sort(byCell),
      flags,
      visitors: [...new Set(own.filter((dive) => dive.visitor).map((dive) => dive.diver))].sort(),
    };
  });

  const stations = [...new Set([...records.complianceStations, ...records.readings.map((reading) => reading.station)])].sort();
  const perStation = stations.map((station) => {
    const own = records.readings.filter((reading) => reading.station === station);
    const exceeding = own.filter((reading) => reading.exceeds === true).length;
    const withinLimit = own.filter((reading) => reading.exceeds === false).length;
    return {
      station,
      stationKind: own[0]?.stationKind ?? "compliance",
      count: own.length,
      maxValue: own.length ? Math.max(...own.map((reading) => reading.value)) : 0,
      unit: own[0]?.unit ?? "NTU",
      exceeding,
      withinLimit,
      notEvaluated: own.length - exceeding - withinLimit,
      verdict: exceeding > 0 ? ("exceeds" as const) : withinLimit > 0 ? ("within limit" as const) : ("not evaluated" as const),
    };
  });
  const worked = records.dives.length > 0 || records.shifts.length > 0;
  const complianceTimes = records.readings.filter((reading) => reading.stationKind === "compliance").map((reading) => reading.takenAtMs);
  // Without a compliance station there is nothing the routine could have sampled: no gaps are
  // listed, the report says plainly that no station is set up.
  const noComplianceStation = records.complianceStations.length === 0;
  const missed = worked && records.sampling && !noComplianceStation ? missedIntervals([date], complianceTimes, records.sampling, timeZone) : [];

  // Weather downtime is entered in local wall-clock times on the day (checked when entered).
  const weatherDowntime: DayInterruption[] = (records.entered.weatherDowntime ?? []).flatMap((spell) => {
    const from = instantOfClock(date, spell.start, timeZone);
    const to = instantOfClock(date, spell.end, timeZone);
    return from === null || to === null ? [] : [{ kind: "weather" as const, reason: spell.reason, startMs: from, endMs: to }];
  });
  const clipped = [...records.interruptions, ...weatherDowntime]
    .map((event) => {
      const from = Math.max(event.startMs, startMs);
      const to = Math.min(event.endMs ?? Math.min(records.nowMs, endMs), endMs);
      return { event, from, to, lostMs: Math.max(0, to - from) };
    })
    .filter(({ event }) => event.startMs < endMs && (event.endMs === null || event.endMs > startMs))
    .sort((a, b) => a.event.startMs - b.event.startMs);
  const interruptions = clipped
    .map(({ event, lostMs }) => ({
      kind: event.kind,
      reason: event.reason,
      start: new Date(event.startMs).toISOString(),
      end: event.endMs === null ? null : new Date(event.endMs).toISOString(),
      lostHours: round(lostMs / 3_600_000, 2),
      ...(event.kind === "stop-work" && event.notifyByMs !== undefined ? {
        notifyBy: event.notifyByMs === null ? null : new Date(event.notifyByMs).toISOString(),
        agencyNotified: event.agencyNotified ? { at: new Date(event.agencyNotified.atMs).toISOString(), to: event.agencyNotified.to, how: event.agencyNotified.how } : null,
      } : {}),
    }));

  const byCategory: Record<string, number> = {};
  for (const find of records.finds) byCategory[find.category] = (byCategory[find.category] ?? 0) + 1;
  const basketLines = records.finds.flatMap((find) => (find.basket ? [find.basket] : []));
  const measured = basketLines.filter((line) => line.volume !== null);
  const byHand = basketLines.length === 0 ? null : {
    lines: basketLines.length,
    items: basketLines.reduce((sum, line) => sum + (line.count ?? 0), 0),
    litres: measured.length === 0 ? null : round(measured.reduce((sum, line) => sum + litresFrom(line.volume!.value, line.volume!.unit), 0), 3),
  };
  const inDay = (ms: number | null) => ms !== null && ms >= startMs && ms < endMs;

  const missing: string[] = [];
  if (!records.entered.weather || !records.entered.weather.conditions.trim()) missing.push("no weather entered");
  if (records.dives.length === 0) missing.push("no dives logged");
  // A work day's equipment hours are a header item like the weather: blank is listed, not guessed at.
  if (worked && (records.entered.equipment ?? []).length === 0) missing.push("no equipment hours entered");
  // Weather tied to its effect on the work: downtime with no word on the effect is a blank.
  if (weatherDowntime.length > 0 && !records.entered.weather?.effect.trim()) missing.push("weather downtime entered, but not the weather's effect on the work");
  if (worked && noComplianceStation) missing.push(NO_COMPLIANCE_STATION_MISSING);
  if (worked) {
    for (const station of records.complianceStations) {
      if (!records.readings.some((reading) => reading.station === station)) missing.push(`compliance station ${station} not sampled`);
    }
    for (const gap of missed) missing.push(`compliance not sampled ${clock(gap.fromMs)}–${clock(gap.toMs)}`);
  }
  for (const team of teams) {
    // A team that dove always has a compiled count (its divers at least); the dive log names the
    // divers, not the tenders and the supervisor, so a crew counted only from it is confirmed by hand.
    if (team.headCountSource === "dive log" && !team.enteredHeadCount) missing.push(`head count of team ${team.team} only from the dive log (${team.compiledHeadCount} ${team.compiledHeadCount === 1 ? "diver" : "divers"}): enter the crew on site`);
  }
  for (const visitor of records.entered.visitors ?? []) if (!visitor.left) missing.push(`no time of leaving for ${visitor.name} (arrived ${visitor.arrived})`);

  const haulTickets = records.hauls.map((haul) => haul.ticketNumber).sort();
  return {
    date,
    dives: {
      count: records.dives.length,
      bottomMinutes: records.dives.reduce((sum, dive) => sum + dive.bottomMinutes, 0),
      maxDepth: records.dives.length ? Math.max(...records.dives.map((dive) => dive.maxDepth)) : null,
      flags: teams.flatMap((team) => team.flags),
    },
    teams,
    cells: [...new Set(records.dives.flatMap((dive) => dive.cells))].sort(byCell),
    production: {
      shifts: records.shifts.length,
      pumpHours: round(records.shifts.reduce((sum, shift) => sum + shift.pumpHours, 0), 2),
      slurryPumpedM3: round(records.shifts.reduce((sum, shift) => sum + slurryM3(shift), 0), 1),
      drySolidsKg: round(records.shifts.reduce((sum, shift) => sum + (shift.drySolidsKg ?? 0), 0), 1),
      neatPolymerKg: round(records.shifts.reduce((sum, shift) => sum + (shift.neatPolymerKg ?? 0), 0), 2),
      tubeFills: records.tubeFills,
      haulLoads: records.hauls.length,
      haulDrySolidsKg: round(records.hauls.reduce((sum, haul) => sum + haul.drySolidsKg, 0), 1),
      haulTickets,
      survey: surveySince(records.survey ?? null),
    },
    waterQuality: {
      readings: perStation,
      exceedances: records.readings
        .filter((reading) => reading.exceeds === true)
        .sort((a, b) => a.takenAtMs - b.takenAtMs)
        .map((reading) => ({ station: reading.station, at: new Date(reading.takenAtMs).toISOString(), value: reading.value, unit: reading.unit })),
      missedIntervals: missed.map((gap) => ({ from: new Date(gap.fromMs).toISOString(), to: new Date(gap.toMs).toISOString() })),
      complianceStations: [...records.complianceStations].sort(),
    },
    interruptions,
    // An hour lost to two causes at once is lost once (as in shared/progress/lost-hours.ts).
    lostHours: round(unionHours(clipped.map(({ from, to }) => ({ startMs: from, endMs: to }))), 2),
    finds: { byCategory, catalogueNumbers: records.finds.map((find) => find.catalogueNumber).sort(), ...(byHand ? { byHand } : {}) },
    holds: {
      placed: records.holds.filter((hold) => inDay(hold.placedAtMs)).map((hold) => hold.catalogueNumber).sort(),
      lifted: records.holds.filter((hold) => inDay(hold.liftedAtMs)).map((hold) => hold.catalogueNumber).sort(),
    },
    entered: records.entered,
    missing,
  };
}
