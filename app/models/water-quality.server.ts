import { Op, type Transaction } from "sequelize";
import { z } from "zod";
import { localDayOf, minutesOfClock } from "../../shared/local-time";
import { missedIntervals, type MissedInterval, type SampleGapRule, type SamplingRoutine } from "../../shared/water-quality/missed-samples";
import { pairBackground } from "../../shared/water-quality/pairing";
import { DEFAULT_SHUTDOWN_DISTANCE_FT, DEFAULT_STAND_DOWN_SOURCE, DEFAULT_STAND_DOWN_WAIT_MINUTES } from "../../shared/water-quality/stand-down";
import { evaluateTurbidity, TURBIDITY_RULE_KINDS, TURBIDITY_UNITS, verdictInWords, type TurbidityEvaluation, type TurbidityRule, type TurbidityUnit } from "../../shared/water-quality/turbidity-rule";
import { convertLength } from "../../shared/units";
import { ALERT_ROLE_CHOICES, DEPTH_RULES, STATION_KINDS, WATER_QUALITY_CAUTION } from "../../shared/water-quality/wording";
import { getSequelize, Membership, MonitoringStation, Project, StopWorkEvent, TurbidityRuleRecord, User, WaterQualityReading, WaterQualityReadingPhoto, WaterQualitySettings } from "~/lib/db.server";
import type { StagedFile } from "~/lib/import/stage-upload.server";
import { keepPhoto, keptPhotoBytes, presentPhoto, type KeptPhoto, type PhotoView } from "~/lib/images/stored-photo.server";
import type { StoredObject } from "~/lib/storage/storage.server";
import { ConflictError, NotFoundError, ValidationError } from "~/lib/errors";
import { AUDIT_ACTIONS, recordAudit } from "~/lib/audit/audit.server";
import { queueMail } from "~/lib/mail/outbox.server";
import type { ProjectView } from "~/lib/auth/project-view.server";
import type { UserView } from "~/lib/auth/users.server";
import type { Role } from "~/lib/auth/roles";
import { loggedShiftDates } from "./dewatering.server";
import { loggedDiveDates } from "./dives.server";
import { instantSchema, ntu, readingInputSchema } from "~/lib/field-records/inputs";
export { readingInputSchema } from "~/lib/field-records/inputs";
import { claimIdempotencyKey } from "~/lib/api/idempotency.server";
import { readingNotices } from "../../shared/field-notices";

/**
 * Water quality the permit allows: monitoring stations, the permit's turbidity rules, readings
 * evaluated on save against the paired background, and the stop-work event an exceedance opens.
 * Readings support the permit's monitoring; the permit, the agency and licensed practice decide
 * compliance.
 */

// ---- Settings -------------------------------------------------------------------------------

/** Every 6 hours over a 07:00–19:00 work day: an example from state permits, to be set from the permit. */
const DEFAULT_SAMPLING = { samplingIntervalMinutes: 360, workdayStartMinutes: 7 * 60, workdayEndMinutes: 19 * 60, samplingSource: "Example routine (every 6 h while work is active); set it from the permit's monitoring condition." };
const DEFAULT_SPECIES = ["manatee", "sea turtle", "alligator"];

export { ALERT_ROLE_CHOICES } from "../../shared/water-quality/wording";
const DEFAULT_ALERT_ROLES: Role[] = ["manager", "dive-supervisor", "dewatering"];

export interface AlertRecipientsView {
  /** Every member with one of these roles. */
  roles: Role[];
  /** Members chosen by name (their user ids), whatever their role. */
  userIds: number[];
  /** Addresses outside the project (the agency's duty inbox, the permit holder). */
  addresses: string[];
}

export interface WaterQualitySettingsView {
  /** "interval": a compliance sample every `samplingIntervalMinutes`; "per-day": `samplesPerDay`, `minimumGapHours` apart as `gapRule` says. */
  samplingMode: "interval" | "per-day";
  samplesPerDay: number | null;
  minimumGapHours: number | null;
  /** Per-day routines: "at-least" so long apart or more, "at-most" no more than so long apart; null for an interval. */
  gapRule: SampleGapRule | null;
  alertRecipients: AlertRecipientsView;
  samplingIntervalMinutes: number;
  workdayStart: string;
  workdayEnd: string;
  samplingSource: string;
  /** Project length unit. */
  shutdownDistance: number;
  standDownWaitMinutes: number;
  standDownSource: string;
  species: string[];
  /** True while the settings are the offered defaults (nothing saved yet). */
  isDefault: boolean;
}

const clockOf = (minutes: number) => `${String(Math.floor(minutes / 60)).padStart(2, "0")}:${String(minutes % 60).padStart(2, "0")}`;
const clockSchema = z.string().trim().regex(/^([01]\d|2[0-3]):[0-5]\d$/, "write the time as HH:MM (24-hour clock)");

const addressList = z.preprocess(
  (value) => (typeof value === "string" ? value.split(/[\n,;]/) : value),
  z.array(z.string().trim().max(254)).transform((addresses) => [...new Set(addresses.filter(Boolean).map((address) => address.toLowerCase()))])
    .pipe(z.array(z.email({ message: "write each outside address as name@domain, one a line" })).max(20, "at most 20 outside addresses")),
);
const idList = z.preprocess((value) => (value === undefined ? [] : Array.isArray(value) ? value : [value]), z.array(z.coerce.number().int().positive()).max(200));
const roleList = z.preprocess((value) => (value === undefined ? [] : Array.isArray(value) ? value : [value]), z.array(z.enum(ALERT_ROLE_CHOICES, { message: `a role is one of ${ALERT_ROLE_CHOICES.join(", ")}` })));

export const settingsInputSchema = z
  .object({
    samplingMode: z.enum(["interval", "per-day"], { message: "the routine is an interval or so many samples a day" }).default("interval"),
    samplesPerDay: z.preprocess((value) => (value === "" ? null : value), z.coerce.number().int("a whole number of samples").min(1, "at least 1 sample a day").max(24, "at most 24 samples a day").nullish()),
    minimumGapHours: z.preprocess((value) => (value === "" ? null : value), z.coerce.number().finite().min(0, "0 hours or more").max(24, "at most 24 hours").nullish()),
    gapRule: z.enum(["at-least", "at-most"], { message: "the spacing is at least or no more than so many hours apart" }).default("at-least"),
    alertRoles: roleList,
    alertUserIds: idList,
    alertAddresses: addressList.default([]),
    samplingIntervalMinutes: z.coerce.number().int("whole minutes").min(15, "at least 15 minutes").max(1440, "at most 24 hours"),
    workdayStart: clockSchema,
    workdayEnd: clockSchema,
    samplingSource: z.string().trim().min(1, "name the permit condition the routine comes from").max(2000),
    shutdownDistance: z.coerce.number().finite().positive("more than 0").max(5000),
    standDownWaitMinutes: z.coerce.number().int("whole minutes").min(0).max(1440),
    standDownSource: z.string().trim().min(1, "name the permit condition the distance and wait come from").max(2000),
    species: z.preprocess(
      (value) => (typeof value === "string" ? value.split(/[\n,]/) : value),
      z.array(z.string().trim().max(120)).transform((names) => [...new Set(names.filter(Boolean))]).pipe(z.array(z.string()).min(1, "list at least one species").max(50)),
    ),
  })
  .refine((input) => minutesOfClock(input.workdayEnd) > minutesOfClock(input.workdayStart), { path: ["workdayEnd"], message: "the work day ends after it starts" })
  .refine((input) => input.samplingMode !== "per-day" || input.samplesPerDay != null, { path: ["samplesPerDay"], message: "give how many samples a day the permit asks for" })
  .refine(
    (input) => input.samplingMode !== "per-day" || input.gapRule !== "at-least" || input.samplesPerDay == null || ((input.samplesPerDay - 1) * (input.minimumGapHours ?? 0) * 60) <= minutesOfClock(input.workdayEnd) - minutesOfClock(input.workdayStart),
    { path: ["minimumGapHours"], message: "that many samples that far apart do not fit in the work day" },
  )
  .refine(
    (input) => input.samplingMode !== "per-day" || input.gapRule !== "at-most" || (input.minimumGapHours ?? 0) > 0,
    { path: ["minimumGapHours"], message: "give how many hours apart the samples may be at most (more than 0)" },
  )
  .refine((input) => input.alertRoles.length + input.alertUserIds.length + input.alertAddresses.length > 0, { path: ["alertRoles"], message: "alert someone: choose a role, a member or an outside address" });
export type SettingsInput = z.infer<typeof settingsInputSchema>;

/** The routine the missed-sample computation reads (compliance page, daily report). */
export function samplingRoutineOf(settings: WaterQualitySettingsView): SamplingRoutine {
  return {
    intervalMinutes: settings.samplingIntervalMinutes, workdayStartMinutes: minutesOfClock(settings.workdayStart), workdayEndMinutes: minutesOfClock(settings.workdayEnd),
    samplesPerDay: settings.samplingMode === "per-day" ? settings.samplesPerDay : null,
    minimumGapMinutes: settings.samplingMode === "per-day" ? Math.round((settings.minimumGapHours ?? 0) * 60) : null,
    gapRule: settings.samplingMode === "per-day" ? settings.gapRule : null,
  };
}

/** The routine in words, as the compliance page states it. */
export function samplingRoutineInWords(settings: WaterQualitySettingsView): string {
  const when = settings.samplingMode === "per-day"
    ? `${settings.samplesPerDay} compliance sample${settings.samplesPerDay === 1 ? "" : "s"} a day${settings.minimumGapHours ? `, ${settings.gapRule === "at-most" ? "no more than" : "at least"} ${settings.minimumGapHours} h apart` : ""}`
    : `every ${settings.samplingIntervalMinutes} min`;
  return `${when}, from ${settings.workdayStart} to ${settings.workdayEnd}`;
}

export async function getWaterQualitySettings(project: ProjectView): Promise<WaterQualitySettingsView> {
  const row = await WaterQualitySettings.findOne({ where: { projectId: project.id } });
  if (!row) {
    const shutdownFt = DEFAULT_SHUTDOWN_DISTANCE_FT;
    return {
      samplingIntervalMinutes: DEFAULT_SAMPLING.samplingIntervalMinutes,
      workdayStart: clockOf(DEFAULT_SAMPLING.workdayStartMinutes),
      workdayEnd: clockOf(DEFAULT_SAMPLING.workdayEndMinutes),
      samplingSource: DEFAULT_SAMPLING.samplingSource,
      // The default is stated in feet; a metric project sees it converted.
      shutdownDistance: Math.round(convertLength(shutdownFt, "ft", project.lengthUnit) * 10) / 10,
      standDownWaitMinutes: DEFAULT_STAND_DOWN_WAIT_MINUTES,
      standDownSource: DEFAULT_STAND_DOWN_SOURCE,
      species: DEFAULT_SPECIES,
      samplingMode: "interval",
      samplesPerDay: null,
      minimumGapHours: null,
      gapRule: null,
      alertRecipients: { roles: DEFAULT_ALERT_ROLES, userIds: [], addresses: [] },
      isDefault: true,
    };
  }
  const recipients = row.alertRecipients;
  return {
    samplingMode: row.samplesPerDay != null ? "per-day" : "interval",
    samplesPerDay: row.samplesPerDay ?? null,
    minimumGapHours: row.samplesPerDay != null ? (row.minimumGapMinutes ?? 0) / 60 : null,
    gapRule: row.samplesPerDay != null ? (row.gapRule ?? "at-least") : null,
    alertRecipients: recipients ? { roles: recipients.roles as Role[], userIds: recipients.userIds, addresses: recipients.addresses } : { roles: DEFAULT_ALERT_ROLES, userIds: [], addresses: [] },
    samplingIntervalMinutes: row.samplingIntervalMinutes,
    workdayStart: clockOf(row.workdayStartMinutes),
    workdayEnd: clockOf(row.workdayEndMinutes),
    samplingSource: row.samplingSource,
    shutdownDistance: row.shutdownDistance,
    standDownWaitMinutes: row.standDownWaitMinutes,
    standDownSource: row.standDownSource,
    species: row.species,
    isDefault: false,
  };
}

export async function saveWaterQualitySettings(project: ProjectView, user: UserView, input: SettingsInput, ip: string | null = null): Promise<WaterQualitySettingsView> {
  const values = {
    samplingIntervalMinutes: input.samplingIntervalMinutes,
    workdayStartMinutes: minutesOfClock(input.workdayStart),
    workdayEndMinutes: minutesOfClock(input.workdayEnd),
    samplingSource: input.samplingSource,
    shutdownDistance: input.shutdownDistance,
    standDownWaitMinutes: input.standDownWaitMinutes,
    standDownSource: input.standDownSource,
    species: input.species,
    samplesPerDay: input.samplingMode === "per-day" ? input.samplesPerDay! : null,
    minimumGapMinutes: input.samplingMode === "per-day" ? Math.round((input.minimumGapHours ?? 0) * 60) : null,
    gapRule: input.samplingMode === "per-day" ? input.gapRule : null,
    alertRecipients: { roles: input.alertRoles, userIds: input.alertUserIds, addresses: input.alertAddresses },
    updatedById: user.id,
  };
  await getSequelize().transaction(async (transaction) => {
    // Chosen people must be members of the project (an id from elsewhere is refused, naming it).
    if (input.alertUserIds.length > 0) {
      const members = await Membership.findAll({ where: { projectId: project.id, userId: input.alertUserIds }, attributes: ["userId"], transaction });
      const strangers = input.alertUserIds.filter((id) => !members.some((member) => member.userId === id));
      if (strangers.length > 0) throw new ValidationError({ field: "alertUserIds", message: `Only members of the project can be chosen to be alerted (not user ${strangers.join(", ")}).` });
    }
    const row = await WaterQualitySettings.findOne({ where: { projectId: project.id }, transaction, lock: transaction.LOCK.UPDATE });
    if (row) await row.update(values, { transaction });
    else await WaterQualitySettings.create({ projectId: project.id, ...values }, { transaction });
    await recordAudit({ action: AUDIT_ACTIONS.waterQualityConfigured, projectId: project.id, userId: user.id, ip, detail: { ...values, updatedById: undefined } }, transaction);
  });
  return getWaterQualitySettings(project);
}

// ---- Rules ----------------------------------------------------------------------------------

export const ruleInputSchema = z
  .object({
    kind: z.enum(TURBIDITY_RULE_KINDS, { message: `a rule is one of ${TURBIDITY_RULE_KINDS.join(", ")}` }),
    /** NTU: over background (above-background) or the ceiling itself (absolute). */
    limit: ntu.nullish(),
    /** The unit the permit states the rule in; figures are compared as numbers with readings of either unit (the verdict says when they differ). */
    unit: z.enum(TURBIDITY_UNITS, { message: "the rule's unit is NTU or FNU" }).default("NTU"),
    inclusive: z.boolean().default(true),
    percent: z.number().finite().positive("more than 0 %").max(1000).nullish(),
    floor: ntu.nullish(),
    cap: ntu.nullish(),
    pairingWindowMinutes: z.number().int("whole minutes").min(1).max(1440).default(60),
    notifyWithinHours: z.number().finite().positive().max(720).default(24),
    source: z.string().trim().min(1, "name the permit number and condition the rule comes from").max(2000),
  })
  .superRefine((input, context) => {
    if (input.kind !== "percent-over-background" && input.limit == null) context.addIssue({ code: "custom", path: ["limit"], message: `give the limit in NTU for a rule of kind ${input.kind}` });
    if (input.kind === "percent-over-background") {
      if (input.percent == null) context.addIssue({ code: "custom", path: ["percent"], message: "give the allowed increase as a percent of background" });
      if (input.floor != null && input.cap != null && input.cap < input.floor) context.addIssue({ code: "custom", path: ["cap"], message: "the cap is at least the floor" });
    }
  });
/** A rule as the schema gives it; `unit` may be left out by services' callers (seeders, tests): NTU. */
export type RuleInput = Omit<z.infer<typeof ruleInputSchema>, "unit"> & { unit?: TurbidityUnit };

export interface RuleView {
  id: number;
  kind: TurbidityRule["kind"];
  unit: TurbidityUnit;
  limit: number | null;
  inclusive: boolean;
  percent: number | null;
  floor: number | null;
  cap: number | null;
  pairingWindowMinutes: number;
  notifyWithinHours: number;
  source: string;
  createdAt: string;
  /** The project's rule in force (the newest); stations may name their own. */
  inForce: boolean;
  /** The rule in words. */
  summary: string;
}

function ruleOf(record: TurbidityRuleRecord): TurbidityRule {
  return { kind: record.kind, limitNtu: record.limitNtu, inclusive: record.inclusive, percent: record.percent, floorNtu: record.floorNtu, capNtu: record.capNtu };
}

export function ruleSummary(rule: TurbidityRule, unit: TurbidityUnit = "NTU"): string {
  const edge = rule.inclusive ? "not more than" : "less than";
  switch (rule.kind) {
    case "above-background":
      return rule.limitNtu === 0 ? `No increase over background${rule.inclusive ? "" : " (equal counts as over)"}` : `${edge} ${rule.limitNtu} ${unit} above the paired background`;
    case "absolute":
      return `${edge} ${rule.limitNtu} ${unit}; where background is already above it, no increase over background`;
    case "percent-over-background":
      return `${edge} ${rule.percent} % over background${rule.floorNtu != null ? `, at least +${rule.floorNtu} ${unit}` : ""}${rule.capNtu != null ? `, at most +${rule.capNtu} ${unit}` : ""}`;
  }
}

function presentRule(record: TurbidityRuleRecord, inForceId: number | null): RuleView {
  return {
    id: record.id, kind: record.kind, unit: record.unit ?? "NTU", limit: record.limitNtu, inclusive: record.inclusive, percent: record.percent, floor: record.floorNtu, cap: record.capNtu,
    pairingWindowMinutes: record.pairingWindowMinutes, notifyWithinHours: record.notifyWithinHours, source: record.source, createdAt: record.createdAt.toISOString(),
    inForce: record.id === inForceId, summary: ruleSummary(ruleOf(record), record.unit ?? "NTU"),
  };
}

export async function listRules(project: ProjectView): Promise<RuleView[]> {
  const rules = await TurbidityRuleRecord.findAll({ where: { projectId: project.id }, order: [["id", "DESC"]] });
  return rules.map((rule) => presentRule(rule, rules[0]?.id ?? null));
}

export async function createRule(project: ProjectView, user: UserView, input: RuleInput, ip: string | null = null): Promise<{ id: number }> {
  return getSequelize().transaction(async (transaction) => {
    const rule = await TurbidityRuleRecord.create(
      {
        projectId: project.id, kind: input.kind, limitNtu: input.kind === "percent-over-background" ? null : input.limit!, inclusive: input.inclusive,
        percent: input.kind === "percent-over-background" ? input.percent! : null, floorNtu: input.kind === "percent-over-background" ? (input.floor ?? null) : null,
        capNtu: input.kind === "percent-over-background" ? (input.cap ?? null) : null, pairingWindowMinutes: input.pairingWindowMinutes,
        notifyWithinHours: input.notifyWithinHours, source: input.source, unit: input.unit ?? "NTU", createdById: user.id,
      },
      { transaction },
    );
    await recordAudit({ action: AUDIT_ACTIONS.turbidityRuleAdded, projectId: project.id, userId: user.id, ip, detail: { id: rule.id, kind: input.kind, unit: input.unit ?? "NTU", summary: ruleSummary(ruleOf(rule), input.unit ?? "NTU"), source: input.source } }, transaction);
    return { id: rule.id };
  });
}

// ---- Stations -------------------------------------------------------------------------------

export const stationInputSchema = z.object({
  name: z.string().trim().min(1, "name the station").max(120),
  kind: z.enum(STATION_KINDS, { message: `a station is one of ${STATION_KINDS.join(", ")}` }),
  /** Easting and northing in the project CRS. */
  position: z.object({ x: z.number().finite(), y: z.number().finite() }).nullish(),
  depth: z.enum(DEPTH_RULES, { message: `the depth rule is one of ${DEPTH_RULES.join(", ")}` }).nullish(),
  /** A rule of the station's own (its id); none follows the project's rule in force. */
  rule: z.number().int().positive().nullish(),
});
export type StationInput = z.infer<typeof stationInputSchema>;

export interface StationView {
  id: number;
  name: string;
  kind: (typeof STATION_KINDS)[number];
  position: { x: number; y: number } | null;
  depth: (typeof DEPTH_RULES)[number] | null;
  ruleId: number | null;
}

function presentStation(station: MonitoringStation): StationView {
  return {
    id: station.id, name: station.name, kind: station.kind,
    position: station.positionX !== null && station.positionY !== null ? { x: station.positionX, y: station.positionY } : null,
    depth: station.depthRule, ruleId: station.ruleId ?? null,
  };
}

export async function listStations(project: ProjectView): Promise<StationView[]> {
  const stations = await MonitoringStation.findAll({ where: { projectId: project.id }, order: [["kind", "ASC"], ["name", "ASC"]] });
  return stations.map(presentStation);
}

export async function createStation(project: ProjectView, user: UserView, input: StationInput, ip: string | null = null): Promise<{ id: number }> {
  return getSequelize().transaction(async (transaction) => {
    const existing = await MonitoringStation.findOne({ where: { projectId: project.id, name: input.name }, transaction });
    if (existing) throw new ConflictError({ field: "name", message: `There is already a station named "${input.name}".` });
    if (input.rule != null && !(await TurbidityRuleRecord.findOne({ where: { projectId: project.id, id: input.rule }, transaction }))) {
      throw new NotFoundError({ field: "rule", message: `There is no rule ${input.rule} on this project.` });
    }
    const station = await MonitoringStation.create(
      { projectId: project.id, name: input.name, kind: input.kind, positionX: input.position?.x ?? null, positionY: input.position?.y ?? null, depthRule: input.depth ?? null, ruleId: input.rule ?? null },
      { transaction },
    );
    await recordAudit({ action: AUDIT_ACTIONS.monitoringStationAdded, projectId: project.id, userId: user.id, ip, detail: { id: station.id, name: input.name, kind: input.kind } }, transaction);
    return { id: station.id };
  });
}

// ---- Readings -------------------------------------------------------------------------------

export type ReadingInput = z.infer<typeof readingInputSchema>;

export interface StopWorkRef {
  id: number;
  notifyBy: string;
}

export interface ReadingRecorded {
  id: number;
  /** Compliance readings only; null for background, outfall and other stations. */
  evaluation: TurbidityEvaluation | null;
  /** The verdict in words, shown at once. */
  verdict: string;
  stopWork?: StopWorkRef;
  /** Who was e-mailed about the exceedance. */
  alerted?: string[];
  /** The photo sent with the reading (a page's form), when one was. */
  photoId?: number;
  /** Safety notices in plain sentences (an exceedance and its stop-work); empty when none apply. */
  notices: string[];
  /**
   * A background reading only: the compliance readings that were waiting for a background in
   * their pairing window (recorded before it, unpaired, no verdict) and are judged now with it.
   */
  judged?: LateVerdict[];
}

/** A compliance reading judged when a background in its pairing window was entered after it. */
export interface LateVerdict {
  id: number;
  station: string;
  takenAt: string;
  evaluation: TurbidityEvaluation;
  verdict: string;
}

export interface ReadingView {
  id: number;
  station: string;
  stationKind: StationView["kind"];
  takenAt: string;
  localDay: string;
  value: number;
  unit: TurbidityUnit;
  depth: number | null;
  instrument: string;
  calibratedAt: string | null;
  sampledBy: string;
  note: string;
  ph: number | null;
  dissolvedOxygen: number | null;
  temperature: number | null;
  evaluation: TurbidityEvaluation | null;
  verdict: string | null;
  /** Photos of the reading (the sample, the instrument's display, the water at the station), oldest first; the camera's data is not shown. */
  photos: PhotoView[];
}

function evaluationOf(reading: WaterQualityReading): TurbidityEvaluation | null {
  if (reading.paired === null) return null;
  return { paired: reading.paired, background: reading.backgroundNtu, difference: reading.differenceNtu, limit: reading.limitNtu, exceeds: reading.exceeds };
}

function presentReading(reading: WaterQualityReading): ReadingView {
  const evaluation = evaluationOf(reading);
  return {
    id: reading.id, station: reading.station?.name ?? "", stationKind: reading.station?.kind ?? "other", takenAt: reading.takenAt.toISOString(), localDay: reading.localDay,
    value: reading.value, unit: reading.unit, depth: reading.depth, instrument: reading.instrument, calibratedAt: reading.calibratedAt?.toISOString() ?? null,
    sampledBy: reading.sampledBy, note: reading.note, ph: reading.ph, dissolvedOxygen: reading.dissolvedOxygenMgL, temperature: reading.temperatureC,
    evaluation, verdict: evaluation ? verdictInWords(evaluation, reading.unit, reading.rule?.unit ?? "NTU") : null,
    photos: (reading.photos ?? []).map(presentPhoto),
  };
}

async function findStation(project: ProjectView, station: string | number, transaction?: Transaction): Promise<MonitoringStation> {
  const found = await MonitoringStation.findOne({ where: { projectId: project.id, ...(typeof station === "number" ? { id: station } : { name: station }) }, transaction });
  if (!found) throw new NotFoundError({ field: "station", message: `There is no monitoring station "${station}" on this project.` });
  return found;
}

/** The rule a station's compliance readings are held to: its own, else the project's newest. */
async function ruleFor(project: ProjectView, station: MonitoringStation, transaction?: Transaction): Promise<TurbidityRuleRecord | null> {
  if (station.ruleId) return TurbidityRuleRecord.findByPk(station.ruleId, { transaction });
  return TurbidityRuleRecord.findOne({ where: { projectId: project.id }, order: [["id", "DESC"]], transaction });
}

/**
 * Records a reading. A compliance reading is evaluated against its rule with the nearest
 * background reading (same unit) within the rule's pairing window; an exceedance opens a
 * stop-work event (unless one is already open at that station) and e-mails the manager, the dive
 * supervisor and the dewatering operator at once, with the figures.
 */
export async function recordReading(project: ProjectView, user: UserView, input: ReadingInput, ip: string | null = null, options: { alert?: boolean; photo?: StagedFile | null } = {}): Promise<ReadingRecorded> {
  const takenAt = new Date(input.takenAt);
  if (takenAt.getTime() > Date.now() + 5 * 60_000) throw new ValidationError({ field: "takenAt", message: "The sample time is in the future." });
  if (input.idempotencyKey) {
    const earlier = await WaterQualityReading.findOne({ where: { projectId: project.id, idempotencyKey: input.idempotencyKey } });
    if (earlier) return replayOf(project, earlier);
  }
  // A photo sent with the reading is checked first: a refused photo stores nothing of the reading either.
  const write = async (transaction: Transaction, kept: KeptPhoto | null) => {
    const idempotency = await claimIdempotencyKey(transaction);
    // The project row's lock first: an assignment for today waits on it before looking for open
    // stop-work events (assignments.server.ts), so one opened here is never slipped past.
    await Project.findByPk(project.id, { attributes: ["id"], lock: transaction.LOCK.UPDATE, transaction });
    const station = await findStation(project, input.station, transaction);
    // Serialise evaluations of one project so two exceedances at once open one event.
    await MonitoringStation.findAll({ where: { projectId: project.id }, transaction, lock: transaction.LOCK.UPDATE });
    let evaluation: TurbidityEvaluation | null = null;
    let rule: TurbidityRuleRecord | null = null;
    let backgroundId: number | null = null;
    if (station.kind === "compliance") {
      rule = await ruleFor(project, station, transaction);
      if (!rule) throw new ValidationError({ field: "station", message: "No turbidity rule is set for this project yet: the manager sets the permit's rule before compliance readings can be judged." });
      const windowMs = rule.pairingWindowMinutes * 60_000;
      const candidates = await WaterQualityReading.findAll({
        where: { projectId: project.id, unit: input.unit, takenAt: { [Op.between]: [new Date(takenAt.getTime() - windowMs), new Date(takenAt.getTime() + windowMs)] } },
        include: [{ model: MonitoringStation, as: "station", where: { kind: "background" }, attributes: ["id"] }],
        transaction,
      });
      const background = pairBackground(takenAt.getTime(), candidates.map((reading) => ({ id: reading.id, takenAtMs: reading.takenAt.getTime(), value: reading.value })), rule.pairingWindowMinutes);
      backgroundId = background?.id ?? null;
      evaluation = evaluateTurbidity(ruleOf(rule), input.value, background?.value ?? null);
    }
    const reading = await WaterQualityReading.create(
      {
        projectId: project.id, stationId: station.id, takenAt, localDay: localDayOf(takenAt.getTime(), project.timeZone), value: input.value, unit: input.unit,
        depth: input.depth ?? null, instrument: input.instrument ?? "", calibratedAt: input.calibratedAt ? new Date(input.calibratedAt) : null,
        sampledBy: input.sampledBy || user.name, note: input.note ?? "", ph: input.ph ?? null, dissolvedOxygenMgL: input.dissolvedOxygen ?? null, temperatureC: input.temperature ?? null,
        ruleId: rule?.id ?? null, backgroundReadingId: backgroundId, paired: evaluation?.paired ?? null, backgroundNtu: evaluation?.background ?? null,
        differenceNtu: evaluation?.difference ?? null, limitNtu: evaluation?.limit ?? null, exceeds: evaluation?.exceeds ?? null,
        idempotencyKey: input.idempotencyKey ?? null, recordedById: user.id,
      },
      { transaction },
    );
    await idempotency.created(reading.id);
    await recordAudit({ action: AUDIT_ACTIONS.waterQualityReadingRecorded, projectId: project.id, userId: user.id, ip, detail: { id: reading.id, station: station.name, takenAt: input.takenAt, value: input.value, unit: input.unit, exceeds: evaluation?.exceeds ?? null } }, transaction);
    const photoId = kept ? await createReadingPhotoRow(project, user, reading.id, kept, transaction, ip) : null;
    let stopWork: StopWorkEvent | null = null;
    let opened = false;
    const late = station.kind === "background" ? await judgeWaitingReadings(project, user, reading, ip, transaction) : [];
    if (evaluation?.exceeds) {
      stopWork = await StopWorkEvent.findOne({ where: { projectId: project.id, stationId: station.id, resumedAt: null }, transaction });
      if (!stopWork) {
        stopWork = await StopWorkEvent.create(
          { projectId: project.id, stationId: station.id, readingId: reading.id, openedAt: takenAt, notifyBy: new Date(takenAt.getTime() + rule!.notifyWithinHours * 3_600_000) },
          { transaction },
        );
        opened = true;
        await recordAudit({ action: AUDIT_ACTIONS.stopWorkOpened, projectId: project.id, userId: user.id, ip, detail: { id: stopWork.id, station: station.name, readingId: reading.id } }, transaction);
      }
    }
    return { reading, station, evaluation, stopWork, opened, late, photoId, ruleUnit: (rule?.unit ?? "NTU") as TurbidityUnit };
  };
  const outcome = options.photo
    ? await keepPhoto(options.photo, readingPhotoFolder(project), (kept, transaction) => write(transaction, kept))
    : await getSequelize().transaction((transaction) => write(transaction, null));
  const result: ReadingRecorded = {
    id: outcome.reading.id,
    evaluation: outcome.evaluation,
    verdict: outcome.evaluation ? verdictInWords(outcome.evaluation, input.unit, outcome.ruleUnit) : "Recorded (only compliance readings are judged against the rule).",
    notices: [],
  };
  if (outcome.stopWork) result.stopWork = { id: outcome.stopWork.id, notifyBy: outcome.stopWork.notifyBy.toISOString() };
  if (outcome.photoId !== null) result.photoId = outcome.photoId;
  result.notices = readingNotices({ verdict: result.verdict, exceeds: outcome.evaluation?.exceeds ?? null, stopWork: result.stopWork });
  if (outcome.opened && outcome.evaluation && options.alert !== false) result.alerted = await alertExceedance(project, outcome.station.name, input, outcome.evaluation, outcome.stopWork!);
  if (outcome.late.length > 0) {
    result.judged = outcome.late.map(lateVerdictOf);
    const event = outcome.late.find((judged) => judged.stopWork)?.stopWork;
    if (event) result.stopWork = { id: event.id, notifyBy: event.notifyBy.toISOString() };
    result.notices = [...result.notices, ...lateNotices(result.judged, result.stopWork)];
    const alerted = new Set<string>();
    for (const judged of outcome.late) {
      if (!judged.opened || options.alert === false) continue;
      const { reading } = judged;
      const figures = { value: reading.value, unit: reading.unit, takenAt: reading.takenAt.toISOString(), sampledBy: reading.sampledBy, lateBackgroundAt: outcome.reading.takenAt.toISOString() };
      for (const to of await alertExceedance(project, judged.stationName, figures, judged.evaluation, judged.stopWork!)) alerted.add(to);
    }
    if (alerted.size > 0) result.alerted = [...alerted];
  }
  return result;
}

// ---- Reading photos -------------------------------------------------------------------------

const readingPhotoFolder = (project: ProjectView) => ["projects", project.id, "water-quality", "readings"];

async function createReadingPhotoRow(project: ProjectView, user: UserView, readingId: number, photo: KeptPhoto, transaction: Transaction, ip: string | null): Promise<number> {
  const created = await WaterQualityReadingPhoto.create({ ...photo, readingId, projectId: project.id, uploadedById: user.id }, { transaction });
  await recordAudit({ action: AUDIT_ACTIONS.waterQualityReadingPhotoAdded, projectId: project.id, userId: user.id, ip, detail: { readingId, photoId: created.id, sizeBytes: created.sizeBytes } }, transaction);
  return created.id;
}

/**
 * Adds a photo to a reading already recorded (checked, re-encoded without the camera's data, a
 * thumbnail made); NotFoundError naming `readingId` when the reading is not this project's.
 */
export async function addReadingPhoto(project: ProjectView, user: UserView, readingId: number, staged: StagedFile, ip: string | null = null): Promise<{ id: number }> {
  const reading = await WaterQualityReading.findOne({ where: { id: readingId, projectId: project.id }, attributes: ["id"] });
  if (!reading) throw new NotFoundError({ field: "readingId", message: "There is no such reading on this project." });
  return { id: await keepPhoto(staged, readingPhotoFolder(project), async (kept, transaction) => {
    const idempotency = await claimIdempotencyKey(transaction);
    const photoId = await createReadingPhotoRow(project, user, reading.id, kept, transaction, ip);
    await idempotency.created(photoId);
    return photoId;
  }) };
}

/** A reading photo's bytes (or its thumbnail's), after the caller's access to the project was checked. */
export async function readingPhotoBytes(project: ProjectView, readingId: number, photoId: number, size: "full" | "thumb"): Promise<StoredObject> {
  const photo = await WaterQualityReadingPhoto.findOne({ where: { id: photoId, readingId, projectId: project.id } });
  if (!photo) throw new NotFoundError("There is no such photo of this reading.");
  return keptPhotoBytes(photo, size);
}

interface JudgedLater {
  ruleUnit: TurbidityUnit;
  reading: WaterQualityReading;
  stationName: string;
  evaluation: TurbidityEvaluation;
  stopWork: StopWorkEvent | null;
  opened: boolean;
}

const lateVerdictOf = (judged: { reading: WaterQualityReading; stationName: string; evaluation: TurbidityEvaluation; ruleUnit: TurbidityUnit }): LateVerdict => ({
  id: judged.reading.id, station: judged.stationName, takenAt: judged.reading.takenAt.toISOString(), evaluation: judged.evaluation, verdict: verdictInWords(judged.evaluation, judged.reading.unit, judged.ruleUnit),
});

function lateNotices(judged: LateVerdict[], stopWork: StopWorkRef | undefined): string[] {
  const exceeded = judged.filter((verdict) => verdict.evaluation.exceeds);
  const lines = [`This background gave ${judged.length === 1 ? "a verdict" : "verdicts"} to ${judged.length} compliance reading${judged.length === 1 ? "" : "s"} waiting for one: ${judged.map((verdict) => `#${verdict.id} at ${verdict.station}, ${verdict.evaluation.exceeds ? "exceeds" : "within"}`).join("; ")}.`];
  if (exceeded.length > 0 && stopWork) lines.push(`Stop-work event #${stopWork.id} is open: stop the work causing the exceedance, notify the agency by ${stopWork.notifyBy}, and resample until within the limit.`);
  return lines;
}

/**
 * A background entered after compliance readings that were waiting for one (unpaired, so no
 * verdict under a relative rule): each compliance reading of the same unit whose rule's pairing
 * window reaches this background is paired now with its nearest background and judged with the
 * rule it was recorded under. An exceedance found so opens the station's stop-work event like one
 * found on save (or joins the open one), once: a judged reading never waits again. The event opens
 * when both samples existed (the later of the two times), the earliest the exceedance could be
 * known, and the agency deadline counts from then. Readings that already have a verdict (an
 * absolute rule judges an unpaired reading against its limit) keep it.
 */
async function judgeWaitingReadings(project: ProjectView, user: UserView, background: WaterQualityReading, ip: string | null, transaction: Transaction): Promise<JudgedLater[]> {
  const takenAtMs = background.takenAt.getTime();
  const widestMs = 1440 * 60_000; // the widest pairing window a rule may set
  const waiting = await WaterQualityReading.findAll({
    where: { projectId: project.id, unit: background.unit, paired: false, exceeds: null, id: { [Op.lt]: background.id }, takenAt: { [Op.between]: [new Date(takenAtMs - widestMs), new Date(takenAtMs + widestMs)] } },
    include: [{ model: MonitoringStation, as: "station", where: { kind: "compliance" }, attributes: ["id", "name"] }],
    order: [["takenAt", "ASC"], ["id", "ASC"]],
    transaction,
  });
  const judged: JudgedLater[] = [];
  for (const reading of waiting) {
    const rule = reading.ruleId ? await TurbidityRuleRecord.findByPk(reading.ruleId, { transaction }) : null;
    if (!rule || Math.abs(reading.takenAt.getTime() - takenAtMs) > rule.pairingWindowMinutes * 60_000) continue;
    const windowMs = rule.pairingWindowMinutes * 60_000;
    const candidates = await WaterQualityReading.findAll({
      where: { projectId: project.id, unit: reading.unit, takenAt: { [Op.between]: [new Date(reading.takenAt.getTime() - windowMs), new Date(reading.takenAt.getTime() + windowMs)] } },
      include: [{ model: MonitoringStation, as: "station", where: { kind: "background" }, attributes: ["id"] }],
      transaction,
    });
    const paired = pairBackground(reading.takenAt.getTime(), candidates.map((candidate) => ({ id: candidate.id, takenAtMs: candidate.takenAt.getTime(), value: candidate.value })), rule.pairingWindowMinutes);
    if (!paired) continue;
    const evaluation = evaluateTurbidity(ruleOf(rule), reading.value, paired.value);
    await reading.update(
      { backgroundReadingId: paired.id, paired: evaluation.paired, backgroundNtu: evaluation.background, differenceNtu: evaluation.difference, limitNtu: evaluation.limit, exceeds: evaluation.exceeds },
      { transaction },
    );
    const stationName = reading.station?.name ?? "";
    await recordAudit({ action: AUDIT_ACTIONS.waterQualityReadingJudged, projectId: project.id, userId: user.id, ip, detail: { id: reading.id, station: stationName, backgroundReadingId: paired.id, exceeds: evaluation.exceeds } }, transaction);
    let stopWork: StopWorkEvent | null = null;
    let opened = false;
    if (evaluation.exceeds) {
      stopWork = await StopWorkEvent.findOne({ where: { projectId: project.id, stationId: reading.stationId, resumedAt: null }, transaction });
      if (!stopWork) {
        const openedAt = new Date(Math.max(reading.takenAt.getTime(), paired.takenAtMs));
        stopWork = await StopWorkEvent.create(
          { projectId: project.id, stationId: reading.stationId, readingId: reading.id, openedAt, notifyBy: new Date(openedAt.getTime() + rule.notifyWithinHours * 3_600_000) },
          { transaction },
        );
        opened = true;
        await recordAudit({ action: AUDIT_ACTIONS.stopWorkOpened, projectId: project.id, userId: user.id, ip, detail: { id: stopWork.id, station: stationName, readingId: reading.id, judgedWithBackground: paired.id } }, transaction);
      }
    }
    judged.push({ reading, stationName, evaluation, stopWork, opened, ruleUnit: rule.unit ?? "NTU" });
  }
  return judged;
}

async function replayOf(project: ProjectView, reading: WaterQualityReading): Promise<ReadingRecorded> {
  const late = await replayedLateVerdicts(project, reading);
  if (late) return late;
  const evaluation = evaluationOf(reading);
  const stopWork = evaluation?.exceeds ? await StopWorkEvent.findOne({ where: { projectId: project.id, stationId: reading.stationId, readingId: { [Op.lte]: reading.id } }, order: [["id", "DESC"]] }) : null;
  const rule = reading.ruleId ? await TurbidityRuleRecord.findByPk(reading.ruleId, { attributes: ["unit"] }) : null;
  const verdict = evaluation ? verdictInWords(evaluation, reading.unit, rule?.unit ?? "NTU") : "Recorded (only compliance readings are judged against the rule).";
  const stopWorkRef = stopWork ? { id: stopWork.id, notifyBy: stopWork.notifyBy.toISOString() } : undefined;
  return { id: reading.id, evaluation, verdict, ...(stopWorkRef ? { stopWork: stopWorkRef } : {}), notices: readingNotices({ verdict, exceeds: evaluation?.exceeds ?? null, stopWork: stopWorkRef }) };
}

/** A background's stored answer again: the readings it judged (recorded before it, paired with it) and the stop-work one of them opened. */
async function replayedLateVerdicts(project: ProjectView, background: WaterQualityReading): Promise<ReadingRecorded | null> {
  const station = await MonitoringStation.findByPk(background.stationId);
  if (station?.kind !== "background") return null;
  const readings = await WaterQualityReading.findAll({
    where: { projectId: project.id, backgroundReadingId: background.id, id: { [Op.lt]: background.id } },
    include: [{ model: MonitoringStation, as: "station", attributes: ["name"] }, { model: TurbidityRuleRecord, as: "rule", attributes: ["unit"] }],
    order: [["takenAt", "ASC"], ["id", "ASC"]],
  });
  const verdict = "Recorded (only compliance readings are judged against the rule).";
  if (readings.length === 0) return { id: background.id, evaluation: null, verdict, notices: [] };
  const judged = readings.map((reading) => lateVerdictOf({ reading, stationName: reading.station?.name ?? "", evaluation: evaluationOf(reading)!, ruleUnit: reading.rule?.unit ?? "NTU" }));
  const event = await StopWorkEvent.findOne({ where: { projectId: project.id, readingId: readings.map((reading) => reading.id) }, order: [["id", "ASC"]] });
  const stopWork = event ? { id: event.id, notifyBy: event.notifyBy.toISOString() } : undefined;
  return { id: background.id, evaluation: null, verdict, ...(stopWork ? { stopWork } : {}), judged, notices: lateNotices(judged, stopWork) };
}

/**
 * Who the exceedance e-mail goes to, from the settings: every member of the chosen roles, the
 * members chosen by name (while they are still members), and the outside addresses; never a
 * disabled account. Unset: the manager, the dive supervisor and the dewatering operator.
 */
export async function alertAddressesOf(project: ProjectView): Promise<string[]> {
  const { alertRecipients } = await getWaterQualitySettings(project);
  const members = await Membership.findAll({
    where: { projectId: project.id, [Op.or]: [{ role: alertRecipients.roles }, { userId: alertRecipients.userIds }] },
    include: [{ model: User, as: "user", attributes: ["email", "disabledAt"] }],
  });
  const memberAddresses = members.filter((member) => member.user && !member.user.disabledAt).map((member) => member.user!.email.toLowerCase());
  return [...new Set([...memberAddresses, ...alertRecipients.addresses])];
}

/** The exceedance e-mail, at once, to the project's managers, dive supervisors and dewatering operators, through the outbox (sent within seconds, retried while the mail server is away); it never unrecords the reading. */
async function alertExceedance(
  project: ProjectView,
  stationName: string,
  input: { value: number; unit: string; takenAt: string; sampledBy?: string | null; lateBackgroundAt?: string },
  evaluation: TurbidityEvaluation,
  event: StopWorkEvent,
): Promise<string[]> {
  const recipients = await alertAddressesOf(project);
  const text = [
    `${project.name}: turbidity exceedance at ${stationName} — STOP the work causing it.`,
    "",
    `Reading: ${input.value} ${input.unit} taken ${input.takenAt}${input.sampledBy ? ` by ${input.sampledBy}` : ""}.`,
    ...(input.lateBackgroundAt ? [`Judged when the background reading taken ${input.lateBackgroundAt} was entered (the reading had waited for a background in its pairing window).`] : []),
    evaluation.background !== null ? `Paired background: ${evaluation.background} ${input.unit}; difference ${evaluation.difference} ${input.unit}.` : "No paired background (judged against the absolute limit).",
    `Limit for this reading: ${evaluation.limit} ${input.unit}.`,
    `Notify the agency by ${event.notifyBy.toISOString()} (the rule's deadline), and resample at ${stationName} until within the limit.`,
    "Work resumes only when a manager or the resource monitor records the resumption after an in-limit resample.",
    "",
    WATER_QUALITY_CAUTION,
  ].join("\n");
  await getSequelize().transaction(async (transaction) => {
    for (const to of recipients) await queueMail({ to, subject: `STOP WORK: turbidity exceedance at ${stationName} (${project.name})`, text, ref: `stop-work:${event.id}` }, transaction);
  });
  return recipients;
}

export const readingQuerySchema = z.object({
  from: z.iso.date({ message: "give from as YYYY-MM-DD" }).optional(),
  to: z.iso.date({ message: "give to as YYYY-MM-DD" }).optional(),
  station: z.string().trim().min(1).max(120).optional(),
});

/** Readings by local day (from and to inclusive) and station (name or id), oldest first; `latest` keeps only the newest so many. */
export async function listReadings(project: ProjectView, query: z.infer<typeof readingQuerySchema> = {}, options: { latest?: number } = {}): Promise<ReadingView[]> {
  const stationWhere = query.station === undefined ? undefined : /^\d+$/.test(query.station) ? { [Op.or]: [{ id: Number(query.station) }, { name: query.station }] } : { name: query.station };
  const readings = await WaterQualityReading.findAll({
    where: {
      projectId: project.id,
      ...(query.from || query.to ? { localDay: { ...(query.from ? { [Op.gte]: query.from } : {}), ...(query.to ? { [Op.lte]: query.to } : {}) } } : {}),
    },
    include: [
      { model: MonitoringStation, as: "station", attributes: ["name", "kind"], ...(stationWhere ? { where: stationWhere } : {}) },
      { model: TurbidityRuleRecord, as: "rule", attributes: ["unit"] },
      // Read apart (one query for the readings listed), so the newest-so-many limit counts readings, not photos.
      { model: WaterQualityReadingPhoto, as: "photos", attributes: ["id", "readingId", "sizeBytes", "widthPx", "heightPx", "originalFileName", "createdAt"], separate: true, order: [["id", "ASC"]] },
    ],
    order: options.latest ? [["takenAt", "DESC"], ["id", "DESC"]] : [["takenAt", "ASC"], ["id", "ASC"]],
    ...(options.latest ? { limit: options.latest } : {}),
  });
  const oldestFirst = options.latest ? readings.reverse() : readings;
  return oldestFirst.map(presentReading);
}

// ---- Stop-work events -----------------------------------------------------------------------

export interface StopWorkView {
  id: number;
  station: string;
  openedAt: string;
  notifyBy: string;
  reading: { id: number; value: number; unit: string; limit: number | null; background: number | null };
  agencyNotified: { at: string; to: string; how: string } | null;
  resumedAt: string | null;
  resumeNote: string | null;
  resampleReadingId: number | null;
  open: boolean;
  /** Hours stopped, to the resumption or to now while open. */
  durationHours: number;
}

function presentStopWork(event: StopWorkEvent, nowMs: number): StopWorkView {
  const endMs = event.resumedAt?.getTime() ?? nowMs;
  return {
    id: event.id, station: event.station?.name ?? "", openedAt: event.openedAt.toISOString(), notifyBy: event.notifyBy.toISOString(),
    reading: { id: event.readingId, value: event.reading?.value ?? NaN, unit: event.reading?.unit ?? "NTU", limit: event.reading?.limitNtu ?? null, background: event.reading?.backgroundNtu ?? null },
    agencyNotified: event.agencyNotifiedAt ? { at: event.agencyNotifiedAt.toISOString(), to: event.agencyNotifiedTo ?? "", how: event.agencyNotifiedHow ?? "" } : null,
    resumedAt: event.resumedAt?.toISOString() ?? null, resumeNote: event.resumeNote, resampleReadingId: event.resampleReadingId, open: event.resumedAt === null,
    durationHours: Math.round(((endMs - event.openedAt.getTime()) / 3_600_000) * 100) / 100,
  };
}

const stopWorkInclude = [
  { model: MonitoringStation, as: "station", attributes: ["name"] },
  { model: WaterQualityReading, as: "reading", attributes: ["value", "unit", "limitNtu", "backgroundNtu"] },
];

export async function listStopWork(project: ProjectView, options: { openOnly?: boolean } = {}, nowMs = Date.now()): Promise<StopWorkView[]> {
  const events = await StopWorkEvent.findAll({ where: { projectId: project.id, ...(options.openOnly ? { resumedAt: null } : {}) }, include: stopWorkInclude, order: [["openedAt", "DESC"], ["id", "DESC"]] });
  return events.map((event) => presentStopWork(event, nowMs));
}

export const resumeInputSchema = z.object({ note: z.string().trim().min(1, "say in a note why work may resume (the resample, what changed)").max(4000) });

/**
 * Records the resumption: refused (ConflictError, 409) while no compliance reading at the same
 * station, taken after the exceedance, is within the limit.
 */
export async function resumeStopWork(project: ProjectView, user: UserView, eventId: number, note: string, ip: string | null = null, options: { at?: Date } = {}): Promise<StopWorkView> {
  // `at` is for the demo seed, which records a past resumption; people resume now.
  const resumedAt = options.at ?? new Date();
  await getSequelize().transaction(async (transaction) => {
    const idempotency = await claimIdempotencyKey(transaction);
    const event = await StopWorkEvent.findOne({ where: { projectId: project.id, id: eventId }, transaction, lock: transaction.LOCK.UPDATE });
    if (!event) throw new NotFoundError(`There is no stop-work event ${eventId} on this project.`);
    await idempotency.created(event.id);
    if (event.resumedAt) throw new ConflictError(`Work already resumed on ${event.resumedAt.toISOString()}.`);
    const resample = await WaterQualityReading.findOne({
      where: { projectId: project.id, stationId: event.stationId, exceeds: false, takenAt: { [Op.gt]: event.openedAt, [Op.lte]: resumedAt } },
      order: [["takenAt", "DESC"]],
      transaction,
    });
    if (!resample) throw new ConflictError("No resample at this station is within the limit yet: take a resample (with its background) and record it first.", { code: "no-in-limit-resample" });
    await event.update({ resumedAt, resumedById: user.id, resumeNote: note, resampleReadingId: resample.id }, { transaction });
    await recordAudit({ action: AUDIT_ACTIONS.stopWorkResumed, projectId: project.id, userId: user.id, ip, detail: { id: event.id, resampleReadingId: resample.id, note } }, transaction);
  });
  const event = await StopWorkEvent.findOne({ where: { projectId: project.id, id: eventId }, include: stopWorkInclude });
  return presentStopWork(event!, Date.now());
}

export const agencyNoticeInputSchema = z.object({
  notifiedAt: instantSchema("when the agency was told"),
  to: z.string().trim().min(1, "name whom at the agency was told").max(200),
  how: z.string().trim().min(1, "say how (telephone, e-mail, the agency's form)").max(200),
});

export async function recordAgencyNotice(project: ProjectView, user: UserView, eventId: number, input: z.infer<typeof agencyNoticeInputSchema>, ip: string | null = null): Promise<StopWorkView> {
  await getSequelize().transaction(async (transaction) => {
    const idempotency = await claimIdempotencyKey(transaction);
    const event = await StopWorkEvent.findOne({ where: { projectId: project.id, id: eventId }, transaction, lock: transaction.LOCK.UPDATE });
    if (!event) throw new NotFoundError(`There is no stop-work event ${eventId} on this project.`);
    await idempotency.created(event.id);
    await event.update({ agencyNotifiedAt: new Date(input.notifiedAt), agencyNotifiedTo: input.to, agencyNotifiedHow: input.how, notifiedById: user.id }, { transaction });
    await recordAudit({ action: AUDIT_ACTIONS.stopWorkAgencyNotified, projectId: project.id, userId: user.id, ip, detail: { id: event.id, ...input } }, transaction);
  });
  const event = await StopWorkEvent.findOne({ where: { projectId: project.id, id: eventId }, include: stopWorkInclude });
  return presentStopWork(event!, Date.now());
}

// ---- Compliance summary ---------------------------------------------------------------------

export interface StationCompliance {
  station: StationView;
  readings: ReadingView[];
  exceedances: number;
  unpaired: number;
}

export interface ComplianceView {
  stations: StationCompliance[];
  missed: Array<MissedInterval & { from: string; to: string }>;
  rules: RuleView[];
  settings: WaterQualitySettingsView;
}

/**
 * Per station, its readings and verdicts; the sampling intervals missed on days work was active:
 * a dive or a dewatering shift was logged that day (the pumps return water without a dive too).
 */
export async function complianceSummary(project: ProjectView, query: z.infer<typeof readingQuerySchema> = {}): Promise<ComplianceView> {
  const [stations, readings, rules, settings, diveDays, shiftDays] = await Promise.all([
    listStations(project), listReadings(project, { from: query.from, to: query.to }), listRules(project), getWaterQualitySettings(project), loggedDiveDates(project.id), loggedShiftDates(project.id),
  ]);
  const workDays = [...new Set([...diveDays, ...shiftDays])];
  const inRange = workDays.filter((day) => (!query.from || day >= query.from) && (!query.to || day <= query.to));
  const complianceTimes = readings.filter((reading) => reading.stationKind === "compliance").map((reading) => Date.parse(reading.takenAt));
  const missed = missedIntervals(inRange, complianceTimes, samplingRoutineOf(settings), project.timeZone);
  return {
    stations: stations.map((station) => {
      const own = readings.filter((reading) => reading.station === station.name);
      return { station, readings: own, exceedances: own.filter((reading) => reading.evaluation?.exceeds === true).length, unpaired: own.filter((reading) => reading.evaluation?.exceeds === null).length };
    }),
    missed: missed.map((gap) => ({ ...gap, from: new Date(gap.fromMs).toISOString(), to: new Date(gap.toMs).toISOString() })),
    rules,
    settings,
  };
}
