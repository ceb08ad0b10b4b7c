import { Op, UniqueConstraintError } from "sequelize";
import { z } from "zod";
import type { ShiftSolids } from "../../shared/dewatering/charts";
import type { ShiftForAttribution } from "../../shared/dewatering/zone-attribution";
import { computeShiftFigures, shiftMeasurementsOf, type ShiftFigures } from "../../shared/dewatering/shift";
import { FILLABLE_TUBE_STATUSES, fillLevel, isNearCapacity, MIN_NEAR_CAPACITY_SHARE, theoreticalDiameter } from "../../shared/dewatering/tubes";
import { localDateIn } from "../../shared/progress/calendar-days";
import { cubicMetresPerHourFrom, flowUnitSchema, kilogramsFrom, kilogramsTo, LITRES_PER_US_GALLON, massUnitsFor, measureLabel, unitLabel, type FlowUnit } from "../../shared/units";
import { DewateringShift, GeotextileTube, Project, TubeFill, TUBE_STATUSES, distinctProjectDates, getSequelize, type TubeStatus } from "~/lib/db.server";
import { ConflictError, NotFoundError, ValidationError } from "~/lib/errors";
import { AUDIT_ACTIONS, recordAudit } from "~/lib/audit/audit.server";
import type { ProjectView } from "~/lib/auth/project-view.server";
import type { UserView } from "~/lib/auth/users.server";
import { workDateSchema } from "./assignments.server";
import { claimIdempotencyKey } from "~/lib/api/idempotency.server";
import { assertCurrentVersion, versionOf } from "~/lib/api/versions";
export { clockSchema, fillInputSchema, shiftInputSchema, solidsSpecificGravitySchema, tubeStatusSchema } from "~/lib/field-records/inputs";
import { fillInputSchema, shiftInputSchema, solidsSpecificGravitySchema, tubeStatusSchema } from "~/lib/field-records/inputs";
const text = (max: number) => z.string().trim().max(max);

/**
 * The dewatering operator's records: the shift log (flow, solids, polymer; its figures computed by
 * shared/dewatering/shift.ts) and the geotextile tube register with its fills. A shift that names
 * the tubes it filled records a fill in each, its dry solids and slurry shared equally among them.
 */

export const DEWATERING_CAUTION =
  "Handle polymer per its safety data sheet and the site's safety plan: spills are slick, and it harms eyes and skin. Lines under pressure can burst or whip; never open a coupling under pressure. A tube filled near its capacity can rupture: stop filling at the supplier's fill height and keep people clear of the seams. Polymer product and dose follow the permit and the approved product list. These figures are aids for the operator, not approval.";

export type ShiftInput = z.infer<typeof shiftInputSchema>;

/** The tube's centre on the laydown area, project CRS (easting x, northing y in the project's length unit). */
const tubePositionSchema = z.object({ x: z.number().finite("the easting is a number"), y: z.number().finite("the northing is a number") });
/** Which way the tube lies, degrees clockwise from grid north (0–180 says it all; up to 360 taken). */
const tubeBearingSchema = z.number().finite().min(0, "a bearing is 0 to 360 degrees").max(360, "a bearing is 0 to 360 degrees");
const bearingHasPosition = (tube: { position?: unknown; bearingDegrees?: number | null }) => tube.bearingDegrees == null || tube.position != null;
const bearingNeedsPosition = () => ({ path: ["position"], message: "give the tube's position (its centre) with its bearing" });

export const tubeInputSchema = z.object({
  name: text(60).min(1, "name the tube"),
  /** Project length unit. */
  circumference: z.number().finite().positive("the circumference is more than 0").max(1000),
  length: z.number().finite().positive("the length is more than 0").max(10_000),
  /** Project bulk mass (short tons or tonnes) per project length unit, from the supplier's sheet. */
  capacityDryMassPerLength: z.number().finite().positive("the capacity is more than 0").max(1000),
  status: z.enum(TUBE_STATUSES).default("filling"),
  notes: z.string().max(4000).default(""),
  position: tubePositionSchema.nullish(),
  bearingDegrees: tubeBearingSchema.nullish(),
}).refine(bearingHasPosition, bearingNeedsPosition());
export type TubeInput = z.infer<typeof tubeInputSchema>;

/**
 * A change to a registered tube: its status, or where it lies (a position of null takes it off the
 * map), or both. What is left out stays as it is.
 */
export const tubeEditSchema = z.object({
  status: tubeStatusSchema.shape.status.optional(),
  position: tubePositionSchema.nullable().optional(),
  bearingDegrees: tubeBearingSchema.nullish(),
})
  .refine((edit) => edit.status !== undefined || edit.position !== undefined, { path: ["status"], message: "give the tube's new status, or its position (null takes it off the map)" })
  .refine(bearingHasPosition, bearingNeedsPosition());
export type TubeEdit = z.infer<typeof tubeEditSchema>;

export type FillInput = z.infer<typeof fillInputSchema>;


export const dewateringSettingsSchema = z.object({
  solidsSpecificGravity: solidsSpecificGravitySchema,
  cakeSolidsByWeight: z.number().finite().gt(0, "cake solids are a share above 0").max(1, "cake solids are a share of 0 to 1 (0.30 for 30 %)").nullable(),
  /** The share of a tube's capacity at which it is flagged near capacity (the supplier's or the site plan's figure). */
  tubeNearCapacityShare: z.number().finite().min(MIN_NEAR_CAPACITY_SHARE, `flag a tube at ${MIN_NEAR_CAPACITY_SHARE * 100} % of its capacity or more`).max(1, "flag a tube at its capacity (100 %) at the latest"),
});

export interface DewateringSettings {
  solidsSpecificGravity: number;
  cakeSolidsByWeight: number | null;
  tubeNearCapacityShare: number;
}

/** Today in the project's time zone, the date a form starts from. */
export async function projectToday(project: ProjectView): Promise<string> {
  const row = await Project.findByPk(project.id, { attributes: ["timeZone"] });
  return localDateIn(row?.timeZone ?? "UTC");
}

export async function dewateringSettings(project: ProjectView): Promise<DewateringSettings> {
  const row = await Project.findByPk(project.id, { attributes: ["solidsSpecificGravity", "cakeSolidsByWeight", "tubeNearCapacityShare"] });
  if (!row) throw new NotFoundError("There is no such project.");
  return { solidsSpecificGravity: row.solidsSpecificGravity, cakeSolidsByWeight: row.cakeSolidsByWeight ?? null, tubeNearCapacityShare: row.tubeNearCapacityShare };
}

export async function updateDewateringSettings(project: ProjectView, user: UserView, settings: z.infer<typeof dewateringSettingsSchema>, ip: string | null = null): Promise<DewateringSettings> {
  await getSequelize().transaction(async (transaction) => {
    await Project.update({ solidsSpecificGravity: settings.solidsSpecificGravity, cakeSolidsByWeight: settings.cakeSolidsByWeight, tubeNearCapacityShare: settings.tubeNearCapacityShare }, { where: { id: project.id }, transaction });
    await recordAudit({ action: AUDIT_ACTIONS.dewateringSettingsChanged, projectId: project.id, userId: user.id, ip, detail: { ...settings } }, transaction);
  });
  return dewateringSettings(project);
}

export interface ShiftView {
  id: number;
  date: string;
  start: string;
  end: string;
  pumpHours: number;
  slurryFlow: { value: number; unit: FlowUnit; label: string };
  /** The readings the flow was worked out from, when it was. */
  totaliser: { start: number; end: number; unit: "gal" | "m3" } | null;
  solidsByWeight: number | null;
  slurrySpecificGravity: number | null;
  solidsSpecificGravity: number;
  polymer: { product: string; lot: string | null; doseMgPerL: number; stockPercent: number } | null;
  tubes: string[];
  notes: string;
  computed: ShiftFigures;
}

function presentShift(shift: DewateringShift, project: ProjectView): ShiftView {
  const polymer = shift.polymerProduct !== null && shift.doseMgPerL !== null && shift.stockPercent !== null
    ? { product: shift.polymerProduct, lot: shift.polymerLot, doseMgPerL: shift.doseMgPerL, stockPercent: shift.stockPercent }
    : null;
  const measured = {
    slurryFlow: { value: shift.slurryFlowValue, unit: shift.slurryFlowUnit },
    pumpHours: shift.pumpHours,
    solidsByWeight: shift.solidsByWeight,
    slurrySpecificGravity: shift.slurrySpecificGravity,
    solidsSpecificGravity: shift.solidsSpecificGravity,
    polymer,
  };
  return {
    id: shift.id,
    date: shift.shiftDate,
    start: shift.startAt,
    end: shift.endAt,
    pumpHours: shift.pumpHours,
    slurryFlow: { ...measured.slurryFlow, label: measureLabel(shift.slurryFlowUnit) },
    totaliser: shift.totaliserStart !== null && shift.totaliserEnd !== null && shift.totaliserUnit !== null ? { start: shift.totaliserStart, end: shift.totaliserEnd, unit: shift.totaliserUnit } : null,
    solidsByWeight: shift.solidsByWeight,
    slurrySpecificGravity: shift.slurrySpecificGravity,
    solidsSpecificGravity: shift.solidsSpecificGravity,
    polymer,
    tubes: (shift.fills ?? []).map((fill) => fill.tube?.name ?? "").filter(Boolean).sort(),
    notes: shift.notes,
    computed: computeShiftFigures(measured, project.lengthUnit),
  };
}

async function findShifts(project: ProjectView, where: { id?: number; from?: string; to?: string }): Promise<ShiftView[]> {
  const dates = { ...(where.from ? { [Op.gte]: where.from } : {}), ...(where.to ? { [Op.lte]: where.to } : {}) };
  const shifts = await DewateringShift.findAll({
    where: { projectId: project.id, ...(where.id !== undefined ? { id: where.id } : {}), ...(where.from || where.to ? { shiftDate: dates } : {}) },
    include: [{ model: TubeFill, as: "fills", attributes: ["id"], include: [{ model: GeotextileTube, as: "tube", attributes: ["name"] }] }],
    order: [["shiftDate", "DESC"], ["startAt", "DESC"], ["id", "DESC"]],
  });
  return shifts.map((shift) => presentShift(shift, project));
}

export function listShifts(project: ProjectView, range: { from?: string; to?: string } = {}): Promise<ShiftView[]> {
  return findShifts(project, range);
}

const FILLABLE = FILLABLE_TUBE_STATUSES;

function assertFillable(tube: GeotextileTube) {
  if (!FILLABLE.includes(tube.status)) {
    throw new ValidationError({ field: "tubes", message: `Tube ${tube.name} is ${tube.status.replace(/-/g, " ")}: only a tube that is filling or dewatering takes slurry.` });
  }
}

/**
 * Logs a shift and its figures; a fill in each named tube. With an idempotency key already used on
 * this project, answers the shift stored then (`replayed`), so a phone that sends twice logs once.
 */
export async function recordShift(project: ProjectView, user: UserView, input: ShiftInput, ip: string | null = null): Promise<{ shift: ShiftView; replayed: boolean }> {
  if (input.idempotencyKey) {
    const earlier = await DewateringShift.findOne({ where: { projectId: project.id, idempotencyKey: input.idempotencyKey }, attributes: ["id"] });
    if (earlier) return { shift: (await findShifts(project, { id: earlier.id }))[0], replayed: true };
  }
  const settings = await dewateringSettings(project);
  const solidsSpecificGravity = input.solidsSpecificGravity ?? settings.solidsSpecificGravity;
  if (input.slurrySpecificGravity != null && input.slurrySpecificGravity >= solidsSpecificGravity) {
    throw new ValidationError({ field: "slurrySpecificGravity", message: `A slurry is lighter than its solids: its specific gravity is below the solids' ${solidsSpecificGravity}.` });
  }
  // The schema has checked the span and the flow, so the measurements exist.
  const measured = shiftMeasurementsOf(input, settings.solidsSpecificGravity)!;
  const { pumpHours, slurryFlow } = measured;
  const figures = computeShiftFigures(measured, project.lengthUnit);
  const names = [...new Set(input.tubes.map((name) => name.toLowerCase()))];
  try {
    const id = await getSequelize().transaction(async (transaction) => {
      const idempotency = await claimIdempotencyKey(transaction);
      const tubes = names.length === 0 ? [] : await GeotextileTube.findAll({ where: { projectId: project.id }, transaction, lock: transaction.LOCK.UPDATE });
      const chosen = names.map((name) => tubes.find((tube) => tube.name.toLowerCase() === name));
      const unknown = input.tubes.filter((_, index) => !chosen[index]);
      if (unknown.length > 0) throw new ValidationError({ field: "tubes", message: `These tubes are not in the register: ${unknown.join(", ")}. Register them first.` });
      chosen.forEach((tube) => assertFillable(tube!));
      const shift = await DewateringShift.create(
        {
          projectId: project.id, shiftDate: input.date, startAt: input.start, endAt: input.end, pumpHours,
          slurryFlowValue: slurryFlow.value, slurryFlowUnit: slurryFlow.unit,
          totaliserStart: input.totaliser?.start ?? null, totaliserEnd: input.totaliser?.end ?? null, totaliserUnit: input.totaliser?.unit ?? null,
          solidsByWeight: input.solidsByWeight ?? null, slurrySpecificGravity: input.slurrySpecificGravity ?? null, solidsSpecificGravity,
          polymerProduct: input.polymer?.product ?? null, polymerLot: input.polymer?.lot || null, doseMgPerL: input.polymer?.doseMgPerL ?? null, stockPercent: input.polymer?.stockPercent ?? null,
          drySolidsKg: figures.drySolidsKg, neatPolymerKg: figures.neatPolymerForShiftKg, notes: input.notes, idempotencyKey: input.idempotencyKey || null, recordedById: user.id,
        },
        { transaction },
      );
      await idempotency.created(shift.id);
      if (chosen.length > 0) {
        // The shift's slurry and solids, shared equally among the tubes it filled (the log does not say more).
        const slurryM3 = cubicMetresPerHourFrom(slurryFlow.value, slurryFlow.unit) * pumpHours;
        await TubeFill.bulkCreate(
          chosen.map((tube) => ({
            projectId: project.id, tubeId: tube!.id, shiftId: shift.id, fillDate: input.date,
            slurryVolumeM3: slurryM3 / chosen.length, drySolidsKg: (figures.drySolidsKg ?? 0) / chosen.length, recordedById: user.id,
          })),
          { transaction },
        );
      }
      await recordAudit({ action: AUDIT_ACTIONS.dewateringShiftRecorded, projectId: project.id, userId: user.id, ip, detail: { date: input.date, start: input.start, end: input.end, tubes: chosen.map((tube) => tube!.name) } }, transaction);
      return shift.id;
    });
    return { shift: (await findShifts(project, { id }))[0], replayed: false };
  } catch (error) {
    // Two sends of one key at once: the second finds the first's row.
    if (error instanceof UniqueConstraintError && input.idempotencyKey) return recordShift(project, user, input, ip);
    throw error;
  }
}

export interface TubeView {
  id: number;
  name: string;
  circumference: number;
  length: number;
  capacityDryMassPerLength: number;
  /** C ÷ π, project length unit: for reference, the practical fill height is a fraction of it. */
  theoreticalDiameter: number;
  status: TubeStatus;
  notes: string;
  /** Its centre on the laydown area (project CRS) and bearing (degrees from grid north), when placed. */
  position: { x: number; y: number } | null;
  bearingDegrees: number;
  fills: Array<{ id: number; date: string; shiftId: number | null; slurryVolumeM3: number | null; drySolids: number }>;
  /** Dry solids delivered and the tube's capacity, project bulk mass unit. */
  drySolidsDelivered: number;
  capacity: number;
  /** Share of capacity, 0–1 and beyond. */
  fillLevel: number;
  nearCapacity: boolean;
  /** The record's version, for If-Match on an edit (app/lib/api/versions.ts). */
  version: string;
}

export interface TubeRegister {
  tubes: TubeView[];
  /** The project's CRS code, in which tube positions are given. */
  crs: string;
  lengthLabel: string;
  massLabel: string;
  nearCapacityShare: number;
}

function presentTube(tube: GeotextileTube, project: ProjectView, nearCapacityShare: number): TubeView {
  const bulk = massUnitsFor(project.lengthUnit).bulkMass;
  const fills = (tube.fills ?? []).map((fill) => ({ id: fill.id, date: fill.fillDate, shiftId: fill.shiftId, slurryVolumeM3: fill.slurryVolumeM3, drySolids: kilogramsTo(fill.drySolidsKg, bulk) }));
  const delivered = fills.reduce((sum, fill) => sum + fill.drySolids, 0);
  const level = fillLevel(delivered, tube.capacityDryMassPerLength, tube.length);
  const view = {
    id: tube.id, name: tube.name, circumference: tube.circumference, length: tube.length, capacityDryMassPerLength: tube.capacityDryMassPerLength,
    theoreticalDiameter: theoreticalDiameter(tube.circumference), status: tube.status, notes: tube.notes,
    position: tube.positionX !== null && tube.positionX !== undefined && tube.positionY !== null && tube.positionY !== undefined ? { x: tube.positionX, y: tube.positionY } : null,
    bearingDegrees: tube.bearingDegrees ?? 0, fills,
    drySolidsDelivered: delivered, capacity: tube.capacityDryMassPerLength * tube.length, fillLevel: level,
    nearCapacity: FILLABLE.includes(tube.status) && isNearCapacity(level, nearCapacityShare),
  };
  return { ...view, version: versionOf(view) };
}

export async function listTubes(project: ProjectView): Promise<TubeRegister> {
  const [tubes, settings] = await Promise.all([GeotextileTube.findAll({
    where: { projectId: project.id },
    include: [{ model: TubeFill, as: "fills" }],
    order: [["name", "ASC"], [{ model: TubeFill, as: "fills" }, "fillDate", "ASC"], [{ model: TubeFill, as: "fills" }, "id", "ASC"]],
  }), dewateringSettings(project)]);
  return {
    tubes: tubes.map((tube) => presentTube(tube, project, settings.tubeNearCapacityShare)),
    crs: project.crs,
    lengthLabel: unitLabel(project.lengthUnit),
    massLabel: measureLabel(massUnitsFor(project.lengthUnit).bulkMass),
    nearCapacityShare: settings.tubeNearCapacityShare,
  };
}

/** One tube of the register, with its fills, fill level and near-capacity flag (NotFoundError when not this project's). */
export async function findTube(project: ProjectView, tubeId: number): Promise<TubeView> {
  const register = await listTubes(project);
  const tube = register.tubes.find((candidate) => candidate.id === tubeId);
  if (!tube) throw new NotFoundError({ field: "tubeId", message: "There is no such tube on this project." });
  return tube;
}

export async function registerTube(project: ProjectView, user: UserView, input: TubeInput, ip: string | null = null): Promise<TubeView> {
  try {
    const id = await getSequelize().transaction(async (transaction) => {
      const idempotency = await claimIdempotencyKey(transaction);
      const tube = await GeotextileTube.create(
        {
          projectId: project.id, name: input.name, circumference: input.circumference, length: input.length, capacityDryMassPerLength: input.capacityDryMassPerLength, status: input.status, notes: input.notes,
          positionX: input.position?.x ?? null, positionY: input.position?.y ?? null, bearingDegrees: input.position ? (input.bearingDegrees ?? 0) : null, createdById: user.id,
        },
        { transaction },
      );
      await idempotency.created(tube.id);
      await recordAudit({ action: AUDIT_ACTIONS.tubeRegistered, projectId: project.id, userId: user.id, ip, detail: { name: input.name } }, transaction);
      return tube.id;
    });
    return findTube(project, id);
  } catch (error) {
    if (error instanceof UniqueConstraintError) throw new ConflictError({ field: "name", message: `A tube named ${input.name} is already in the register.` });
    throw error;
  }
}

export async function recordFill(project: ProjectView, user: UserView, tubeId: number, input: FillInput, ip: string | null = null): Promise<TubeView> {
  await getSequelize().transaction(async (transaction) => {
    const idempotency = await claimIdempotencyKey(transaction);
    const tube = await GeotextileTube.findOne({ where: { id: tubeId, projectId: project.id }, transaction, lock: transaction.LOCK.UPDATE });
    if (!tube) throw new NotFoundError({ field: "tubeId", message: "There is no such tube on this project." });
    assertFillable(tube);
    const slurryVolumeM3 = input.slurryVolume ? (input.slurryVolume.unit === "m3" ? input.slurryVolume.value : (input.slurryVolume.value * LITRES_PER_US_GALLON) / 1000) : null;
    const fill = await TubeFill.create(
      { projectId: project.id, tubeId: tube.id, shiftId: null, fillDate: input.date, slurryVolumeM3, drySolidsKg: kilogramsFrom(input.drySolids, massUnitsFor(project.lengthUnit).bulkMass), recordedById: user.id },
      { transaction },
    );
    await idempotency.created(fill.id);
    await recordAudit({ action: AUDIT_ACTIONS.tubeFilled, projectId: project.id, userId: user.id, ip, detail: { tube: tube.name, date: input.date, drySolids: input.drySolids } }, transaction);
  });
  return findTube(project, tubeId);
}

/**
 * Changes a tube's status or its place on the laydown area. With `ifMatch` (the versions an If-Match
 * header names), refuses with 412 and the tube as it is now when it changed since the client saw
 * it; the check and the change hold the tube's row lock, so no other edit slips in between. Each
 * part changed is audit-logged, a move with where the tube was and where it is now.
 */
export async function changeTube(project: ProjectView, user: UserView, tubeId: number, edit: TubeEdit, ip: string | null = null, ifMatch: string[] | "any" | null = null): Promise<TubeView> {
  const { tubeNearCapacityShare } = await dewateringSettings(project);
  await getSequelize().transaction(async (transaction) => {
    const tube = await GeotextileTube.findOne({ where: { id: tubeId, projectId: project.id }, transaction, lock: transaction.LOCK.UPDATE });
    if (!tube) throw new NotFoundError({ field: "tubeId", message: "There is no such tube on this project." });
    if (ifMatch !== null) {
      tube.fills = await TubeFill.findAll({ where: { tubeId: tube.id }, order: [["fillDate", "ASC"], ["id", "ASC"]], transaction });
      assertCurrentVersion(ifMatch, presentTube(tube, project, tubeNearCapacityShare), "tube");
    }
    if (edit.status !== undefined) {
      await tube.update({ status: edit.status }, { transaction });
      await recordAudit({ action: AUDIT_ACTIONS.tubeStatusChanged, projectId: project.id, userId: user.id, ip, detail: { tube: tube.name, status: edit.status } }, transaction);
    }
    if (edit.position !== undefined) {
      const placed = (x: number | null, y: number | null, bearing: number | null) => (x === null || y === null ? null : { x, y, bearingDegrees: bearing ?? 0 });
      const before = placed(tube.positionX, tube.positionY, tube.bearingDegrees);
      const position = edit.position;
      await tube.update({ positionX: position?.x ?? null, positionY: position?.y ?? null, bearingDegrees: position ? (edit.bearingDegrees ?? 0) : null }, { transaction });
      await recordAudit({ action: AUDIT_ACTIONS.tubeMoved, projectId: project.id, userId: user.id, ip, detail: { tube: tube.name, before, after: placed(tube.positionX, tube.positionY, tube.bearingDegrees) } }, transaction);
    }
  });
  return findTube(project, tubeId);
}

/** The local dates on which a dewatering shift was logged (work was active on shore). */
export function loggedShiftDates(projectId: number): Promise<string[]> {
  return distinctProjectDates(DewateringShift, "shiftDate", projectId);
}

/** Each shift's date, dry solids and neat polymer (kg), for the charts. */
export async function shiftSolids(project: ProjectView): Promise<ShiftSolids[]> {
  const rows = await DewateringShift.findAll({ attributes: ["shiftDate", "drySolidsKg", "neatPolymerKg"], where: { projectId: project.id }, raw: true });
  return rows.map((row) => ({ date: row.shiftDate, drySolidsKg: row.drySolidsKg === null ? null : Number(row.drySolidsKg), neatPolymerKg: row.neatPolymerKg === null ? null : Number(row.neatPolymerKg) }));
}

/** Records dated after `after` up to and including `through` (local dates), or all of them. */
export type DateSpan = { after: string; through: string } | null;
export const dateSpanWhere = (span: DateSpan) => (span ? { [Op.gt]: span.after, [Op.lte]: span.through } : { [Op.ne]: null });

/** Each shift's date, hours and dry solids (kg), within a span of dates when given: what the zone attribution shares out. */
export async function shiftsForAttribution(project: ProjectView, span: DateSpan = null): Promise<ShiftForAttribution[]> {
  const rows = await DewateringShift.findAll({ attributes: ["shiftDate", "startAt", "endAt", "drySolidsKg"], where: { projectId: project.id, shiftDate: dateSpanWhere(span) }, raw: true });
  return rows.map((row) => ({ date: row.shiftDate, start: row.startAt, end: row.endAt, drySolidsKg: row.drySolidsKg === null ? null : Number(row.drySolidsKg) }));
}

/** Dry solids pumped according to the shift logs, kg; within a span of dates when given. */
export async function pumpedDrySolidsKg(project: ProjectView, span: DateSpan = null): Promise<number> {
  const total = await DewateringShift.sum("drySolidsKg", { where: { projectId: project.id, shiftDate: dateSpanWhere(span) } });
  return Number(total ?? 0);
}
