import { UniqueConstraintError, type Transaction } from "sequelize";
import { z } from "zod";
import type { HaulSolids } from "../../shared/dewatering/charts";
import { CAKE_SOLIDS_MISSING, cakeSolidsInForce, haulDryMassKg } from "../../shared/dewatering/haul";
import { cubicMetresPerVolumeUnit, kilogramsFrom, kilogramsTo, massUnitsFor, measureLabel, unitLabel, volumeUnitFor } from "../../shared/units";
import { Haul, HaulPhoto, HaulSite, HAUL_SITE_KINDS, getSequelize } from "~/lib/db.server";
import { ConflictError, NotFoundError, ValidationError } from "~/lib/errors";
import { AUDIT_ACTIONS, recordAudit } from "~/lib/audit/audit.server";
import type { ProjectView } from "~/lib/auth/project-view.server";
import type { UserView } from "~/lib/auth/users.server";
import type { StagedFile } from "~/lib/import/stage-upload.server";
import { keepPhoto, keptPhotoBytes, presentPhoto, type KeptPhoto, type PhotoView } from "~/lib/images/stored-photo.server";
import type { StoredObject } from "~/lib/storage/storage.server";
import { workDateSchema } from "./assignments.server";
import { dateSpanWhere, dewateringSettings, type DateSpan } from "./dewatering.server";
import { claimIdempotencyKey } from "~/lib/api/idempotency.server";
export { haulInputSchema } from "~/lib/field-records/inputs";
import { haulInputSchema } from "~/lib/field-records/inputs";

/**
 * Haul tickets and the sites they go to. Each ticket's dry solids are counted once, when it is
 * recorded: its load (weighed wet, or the truck body's volume) times its cake solids, or the
 * project's default cake solids when the ticket has no sample of its own. A ticket keeps photos of
 * the paper ticket (app/lib/images/stored-photo.server.ts, like every photo).
 */

const text = (max: number) => z.string().trim().max(max);

export const haulSiteInputSchema = z.object({
  name: text(120).min(1, "name the site"),
  kind: z.enum(HAUL_SITE_KINDS, { message: "a site is for reuse or disposal" }),
  permitNumber: text(120).min(1, "give the site's permit or agreement number"),
});

export type HaulInput = z.infer<typeof haulInputSchema>;

export interface HaulSiteView {
  id: number;
  name: string;
  kind: (typeof HAUL_SITE_KINDS)[number];
  permitNumber: string;
}

export interface HaulView {
  id: number;
  date: string;
  ticketNumber: string;
  truck: string;
  site: HaulSiteView;
  load: { value: number; unit: string; label: string; measured: "scale" | "truck body" };
  cakeSolidsByWeight: number;
  cakeSolidsFrom: "sample" | "project default";
  drySolids: { value: number; unit: string; label: string };
  notes: string;
  photos: PhotoView[];
}

const presentSite = (site: HaulSite): HaulSiteView => ({ id: site.id, name: site.name, kind: site.kind, permitNumber: site.permitNumber });

function presentHaul(haul: Haul, project: ProjectView): HaulView {
  const units = massUnitsFor(project.lengthUnit);
  const load = haul.loadWetMass !== null
    ? { value: haul.loadWetMass, unit: units.bulkMass, label: `wet ${measureLabel(units.bulkMass)}`, measured: "scale" as const }
    : { value: haul.loadVolume ?? 0, unit: volumeUnitFor(project.lengthUnit), label: unitLabel(project.lengthUnit, "volume"), measured: "truck body" as const };
  return {
    id: haul.id, date: haul.haulDate, ticketNumber: haul.ticketNumber, truck: haul.truck, site: presentSite(haul.site!), load,
    cakeSolidsByWeight: haul.cakeSolidsByWeight, cakeSolidsFrom: haul.cakeSolidsFromSample ? "sample" : "project default",
    drySolids: { value: kilogramsTo(haul.drySolidsKg, units.bulkMass), unit: units.bulkMass, label: `dry ${measureLabel(units.bulkMass)}` },
    notes: haul.notes,
    photos: (haul.photos ?? []).map(presentPhoto),
  };
}

export async function listHaulSites(project: ProjectView): Promise<HaulSiteView[]> {
  return (await HaulSite.findAll({ where: { projectId: project.id }, order: [["name", "ASC"]] })).map(presentSite);
}

export async function addHaulSite(project: ProjectView, user: UserView, input: z.infer<typeof haulSiteInputSchema>, ip: string | null = null): Promise<HaulSiteView> {
  try {
    return await getSequelize().transaction(async (transaction) => {
      const site = await HaulSite.create({ projectId: project.id, ...{ name: input.name, kind: input.kind, permitNumber: input.permitNumber } }, { transaction });
      await recordAudit({ action: AUDIT_ACTIONS.haulSiteAdded, projectId: project.id, userId: user.id, ip, detail: { name: input.name, kind: input.kind, permitNumber: input.permitNumber } }, transaction);
      return presentSite(site);
    });
  } catch (error) {
    if (error instanceof UniqueConstraintError) throw new ConflictError({ field: "name", message: `A site named ${input.name} is already listed.` });
    throw error;
  }
}

async function findHauls(project: ProjectView, id?: number): Promise<HaulView[]> {
  const hauls = await Haul.findAll({
    where: { projectId: project.id, ...(id !== undefined ? { id } : {}) },
    include: [{ model: HaulSite, as: "site" }, { model: HaulPhoto, as: "photos" }],
    order: [["haulDate", "DESC"], ["id", "DESC"], [{ model: HaulPhoto, as: "photos" }, "id", "ASC"]],
  });
  return hauls.map((haul) => presentHaul(haul, project));
}

export function listHauls(project: ProjectView): Promise<HaulView[]> {
  return findHauls(project);
}

/**
 * Records a ticket, with a photo of it when one is sent (checked first: a refused photo stores
 * nothing of the ticket either); the same idempotency key again answers the ticket stored then (`replayed`).
 */
export async function recordHaul(project: ProjectView, user: UserView, input: HaulInput, ip: string | null = null, photo: StagedFile | null = null): Promise<{ haul: HaulView; replayed: boolean }> {
  if (input.idempotencyKey) {
    const earlier = await Haul.findOne({ where: { projectId: project.id, idempotencyKey: input.idempotencyKey }, attributes: ["id"] });
    if (earlier) return { haul: (await findHauls(project, earlier.id))[0], replayed: true };
  }
  const sites = await HaulSite.findAll({ where: { projectId: project.id } });
  const site = sites.find((candidate) => (typeof input.site === "number" ? candidate.id === input.site : candidate.name.toLowerCase() === input.site.toLowerCase()));
  if (!site) throw new NotFoundError({ field: "site", message: `There is no destination "${input.site}" on this project's list of sites.` });
  const settings = await dewateringSettings(project);
  const inForce = cakeSolidsInForce(input.cakeSolidsByWeight, settings.cakeSolidsByWeight);
  if (inForce === null) throw new ValidationError({ field: "cakeSolidsByWeight", message: CAKE_SOLIDS_MISSING });
  const cakeSolids = inForce.cakeSolidsByWeight;
  const units = massUnitsFor(project.lengthUnit);
  const isMass = input.load.unit === "short-ton" || input.load.unit === "t";
  // Stored in the project's units; computed in SI.
  const wetMassKg = isMass ? kilogramsFrom(input.load.value, input.load.unit as "short-ton" | "t") : null;
  const volumeM3 = isMass ? null : input.load.value * (input.load.unit === "m3" ? 1 : cubicMetresPerVolumeUnit("ft"));
  const drySolidsKg = haulDryMassKg(wetMassKg !== null ? { wetMassKg } : { volumeM3: volumeM3! }, cakeSolids, settings.solidsSpecificGravity);
  try {
    const write = async (transaction: Transaction, kept: KeptPhoto | null) => {
      const idempotency = await claimIdempotencyKey(transaction);
      const haul = await Haul.create(
        {
          projectId: project.id, haulDate: input.date, ticketNumber: input.ticketNumber, truck: input.truck, siteId: site.id,
          loadWetMass: wetMassKg === null ? null : kilogramsTo(wetMassKg, units.bulkMass),
          loadVolume: volumeM3 === null ? null : volumeM3 / cubicMetresPerVolumeUnit(project.lengthUnit),
          cakeSolidsByWeight: cakeSolids, cakeSolidsFromSample: inForce.fromSample, solidsSpecificGravity: settings.solidsSpecificGravity,
          drySolidsKg, notes: input.notes, idempotencyKey: input.idempotencyKey || null, recordedById: user.id,
        },
        { transaction },
      );
      await idempotency.created(haul.id);
      await recordAudit({ action: AUDIT_ACTIONS.haulRecorded, projectId: project.id, userId: user.id, ip, detail: { date: input.date, ticketNumber: input.ticketNumber, site: site.name } }, transaction);
      if (kept) await createPhotoRow(project, user, haul.id, kept, transaction, ip);
      return haul.id;
    };
    const id = photo ? await keepPhoto(photo, photoFolder(project), (kept, transaction) => write(transaction, kept)) : await getSequelize().transaction((transaction) => write(transaction, null));
    return { haul: (await findHauls(project, id))[0], replayed: false };
  } catch (error) {
    if (error instanceof UniqueConstraintError) {
      if (input.idempotencyKey && (await Haul.count({ where: { projectId: project.id, idempotencyKey: input.idempotencyKey } })) > 0) return recordHaul(project, user, input, ip);
      throw new ConflictError({ field: "ticketNumber", message: `Ticket ${input.ticketNumber} is already recorded.` });
    }
    throw error;
  }
}

const photoFolder = (project: ProjectView) => ["projects", project.id, "hauls", "tickets"];

async function createPhotoRow(project: ProjectView, user: UserView, haulId: number, photo: KeptPhoto, transaction: Transaction, ip: string | null): Promise<number> {
  const created = await HaulPhoto.create({ ...photo, haulId, projectId: project.id, uploadedById: user.id }, { transaction });
  await recordAudit({ action: AUDIT_ACTIONS.haulPhotoAdded, projectId: project.id, userId: user.id, ip, detail: { haulId, photoId: created.id, sizeBytes: created.sizeBytes } }, transaction);
  return created.id;
}

/** Adds a photo of a ticket from a staged upload (checked and stripped of metadata); NotFoundError when not this project's. */
export async function addHaulPhoto(project: ProjectView, user: UserView, haulId: number, staged: StagedFile, ip: string | null = null): Promise<{ id: number }> {
  const haul = await Haul.findOne({ where: { id: haulId, projectId: project.id }, attributes: ["id"] });
  if (!haul) throw new NotFoundError({ field: "haulId", message: "There is no such haul ticket on this project." });
  return { id: await keepPhoto(staged, photoFolder(project), async (kept, transaction) => {
    const idempotency = await claimIdempotencyKey(transaction);
    const photoId = await createPhotoRow(project, user, haul.id, kept, transaction, ip);
    await idempotency.created(photoId);
    return photoId;
  }) };
}

/** A ticket photo's bytes (or its thumbnail's), after the caller's access to the project was checked. */
export async function haulPhotoBytes(project: ProjectView, haulId: number, photoId: number, size: "full" | "thumb"): Promise<StoredObject> {
  const photo = await HaulPhoto.findOne({ where: { id: photoId, haulId, projectId: project.id } });
  if (!photo) throw new NotFoundError("There is no such photo of this haul ticket.");
  return keptPhotoBytes(photo, size);
}

/** Each ticket's date and dry solids (kg), for the charts. */
export async function haulSolids(project: ProjectView): Promise<HaulSolids[]> {
  const rows = await Haul.findAll({ attributes: ["haulDate", "drySolidsKg"], where: { projectId: project.id }, raw: true });
  return rows.map((row) => ({ date: row.haulDate, drySolidsKg: Number(row.drySolidsKg) }));
}

/** Dry solids hauled according to the tickets, kg; within a span of dates when given. */
export async function hauledDrySolidsKg(project: ProjectView, span: DateSpan = null): Promise<number> {
  return Number((await Haul.sum("drySolidsKg", { where: { projectId: project.id, haulDate: dateSpanWhere(span) } })) ?? 0);
}
