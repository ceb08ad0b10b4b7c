import { Op, UniqueConstraintError, type Transaction } from "sequelize";
import { z } from "zod";
import { cellCentroid, cellIndexAt, cellRowCol, cellLabel as cellLabelOf } from "../../shared/grid/cell-grid";
import {
  agenciesToNotify, catalogueNumber, cellsWithinRadius, CUSTODY_PURPOSES, defaultCataloguePrefix, FIND_CATEGORIES, FIND_CATEGORY_LABELS, FIND_STATUSES, FIND_STATUS_LABELS,
  HOLD_CATEGORIES, instantToLocalDateTime, localYear, sortCellLabels,
  type CustodyPurpose, type FindCategory, type FindStatus,
} from "../../shared/finds/finds";
import { convertLength, unitLabel } from "../../shared/units";
import { csvLine } from "../../shared/csv-safe";
import { Dive, DiveTeam, Find, FindCustody, FindPhoto, FindSequence, getSequelize, Hold, HoldCell, HoldNotice, Project, type PhotoExif } from "~/lib/db.server";
import { NotFoundError, ValidationError } from "~/lib/errors";
import { can, type Access } from "~/lib/auth/permissions";
import { AUDIT_ACTIONS, recordAudit } from "~/lib/audit/audit.server";
import { keepPhoto, keptPhotoBytes, presentPhoto, type PhotoView as StoredPhotoView } from "~/lib/images/stored-photo.server";
import type { StoredObject } from "~/lib/storage/storage.server";
import type { StagedFile } from "~/lib/import/stage-upload.server";
import { cellLookup } from "./assignments.server";
import { getCellsPayload } from "./cells.server";
import type { ProjectView } from "~/lib/auth/project-view.server";
import type { UserView } from "~/lib/auth/users.server";
import { custodyInputSchema, findInputSchema, optionalText, statusInputSchema } from "~/lib/field-records/inputs";
export { custodyInputSchema, findInputSchema, statusInputSchema, type CustodyInput, type FindInput } from "~/lib/field-records/inputs";
import { claimIdempotencyKey } from "~/lib/api/idempotency.server";
import { assertCurrentVersion, versionOf } from "~/lib/api/versions";
import { findNotices } from "../../shared/field-notices";

/**
 * Finds: logging them (catalogue number from a locked per-year counter, never reused), their
 * photos (through the one object store), custody handovers and status, and the stop-work hold a
 * cultural find or human remains places on the cells around it.
 *
 * Confidential locations: every read takes the caller's access and the presenters leave the
 * location fields out entirely (not null) unless the table allows "finds.locations.read".
 */


// ——— Presenters.

export interface FindLocation {
  cell: string | null;
  position: { x: number; y: number } | null;
  depthBelowSurface: number | null;
  depthInMuck: number | null;
  diveId: number | null;
  team: string | null;
}

export interface FindSummary {
  id: number;
  catalogueNumber: string;
  category: FindCategory;
  description: string;
  count: number;
  status: FindStatus;
  foundAt: string;
  currentHolder: { name: string; place: string };
}

export type FindListItem = FindSummary & Partial<FindLocation>;

export interface PhotoView extends StoredPhotoView {
  exif?: PhotoExif | null;
}

export interface CustodyView {
  id: number;
  fromName: string;
  toName: string;
  place: string;
  purpose: CustodyPurpose;
  handedAt: string;
  receiverSignature: string;
  note: string | null;
}

export interface FindDetail extends FindSummary, Partial<FindLocation> {
  /** The record's version, for If-Match on an edit (app/lib/api/versions.ts). */
  version: string;
  material: string;
  taxon: string | null;
  element: string | null;
  condition: string;
  finder: string;
  fieldTag: string;
  accessionNumber: string | null;
  statusNote: string | null;
  photos: PhotoView[];
  custody: CustodyView[];
  hold?: { id: number; cells: string[]; lifted: boolean };
}

export function seesLocations(access: Access): boolean {
  return can(access, "finds.locations.read");
}

/** Where the find is and who has it: the last handover's receiver and place, else the finder in the field. */
function currentHolder(find: Find, custody: FindCustody[]): { name: string; place: string } {
  const last = custody.at(-1);
  return last ? { name: last.toName, place: last.place } : { name: find.finder || "the finder", place: "in the field" };
}

function locationOf(find: Find): FindLocation {
  return {
    cell: find.cellLabel,
    position: find.positionX !== null && find.positionY !== null ? { x: find.positionX, y: find.positionY } : null,
    depthBelowSurface: find.depthBelowSurface,
    depthInMuck: find.depthInMuck,
    diveId: find.diveId ?? null,
    team: find.team?.name ?? null,
  };
}

function summaryOf(find: Find, custody: FindCustody[]): FindSummary {
  return {
    id: find.id,
    catalogueNumber: find.catalogueNumber,
    category: find.category,
    description: find.description,
    count: find.count,
    status: find.status,
    foundAt: find.foundAt.toISOString(),
    currentHolder: currentHolder(find, custody),
  };
}

function custodyView(entry: FindCustody): CustodyView {
  return {
    id: entry.id, fromName: entry.fromName, toName: entry.toName, place: entry.place, purpose: entry.purpose,
    handedAt: entry.handedAt.toISOString(), receiverSignature: entry.receiverSignature, note: entry.note,
  };
}

function photoView(photo: FindPhoto, locations: boolean): PhotoView {
  const view: PhotoView = presentPhoto(photo);
  if (locations) view.exif = photo.exif;
  return view;
}

const byTime = (a: FindCustody, b: FindCustody) => a.handedAt.getTime() - b.handedAt.getTime() || a.id - b.id;

// ——— Reads.

export async function listFinds(project: ProjectView, access: Access): Promise<FindListItem[]> {
  const finds = await Find.findAll({
    where: { projectId: project.id },
    include: [{ model: FindCustody, as: "custody" }, { model: DiveTeam, as: "team", attributes: ["name"] }],
    order: [["catalogueYear", "DESC"], ["catalogueSequence", "DESC"]],
  });
  const locations = seesLocations(access);
  return finds.map((find) => {
    const custody = [...(find.custody ?? [])].sort(byTime);
    return locations ? { ...summaryOf(find, custody), ...locationOf(find) } : summaryOf(find, custody);
  });
}

/** What the field page keeps of a find: enough to name it, hand it over and change its status offline (with its version for If-Match). */
export interface FieldFind {
  id: number;
  catalogueNumber: string;
  category: FindCategory;
  description: string;
  status: FindStatus;
  foundAt: string;
  currentHolder: { name: string; place: string };
  version: string;
}

/** The project's finds still in custody (not released), latest first, for the field page. */
export async function fieldFinds(project: ProjectView, limit = 300): Promise<FieldFind[]> {
  const finds = await Find.findAll({
    where: { projectId: project.id, status: { [Op.ne]: "released" } },
    // The team as findInProject reads it, so the row digested for the version is the same.
    include: [{ model: DiveTeam, as: "team", attributes: ["name"] }, { model: FindCustody, as: "custody" }],
    order: [["catalogueYear", "DESC"], ["catalogueSequence", "DESC"]],
    limit,
  });
  const photos = finds.length === 0 ? [] : await FindPhoto.findAll({ where: { findId: finds.map((find) => find.id) }, attributes: ["id", "findId"] });
  return finds.map((find) => {
    const custody = [...(find.custody ?? [])].sort(byTime);
    const { id, catalogueNumber, category, description, status, foundAt, currentHolder } = summaryOf(find, custody);
    // The version getFind answers (its own query, so the find's row is read without its includes).
    const row = find.get({ plain: true }) as Record<string, unknown>;
    delete row.custody;
    const version = versionOf({ find: row, custody: custody.map((entry) => entry.id).sort((a, b) => a - b), photos: photos.filter((photo) => photo.findId === find.id).map((photo) => photo.id).sort((a, b) => a - b) });
    return { id, catalogueNumber, category, description, status, foundAt, currentHolder, version };
  });
}

async function findInProject(project: ProjectView, findId: number, transaction?: Transaction): Promise<Find> {
  const find = await Find.findOne({ where: { id: findId, projectId: project.id }, include: [{ model: DiveTeam, as: "team", attributes: ["name"] }], transaction });
  if (!find) throw new NotFoundError("There is no such find in this project.");
  return find;
}

/**
 * A find's version: a digest of its row, its custody entries and its photos, the same whoever asks
 * (the detail a role sees differs, the version does not).
 */
function findVersion(find: Find, custodyIds: number[], photoIds: number[]): string {
  return versionOf({ find: find.get({ plain: true }), custody: [...custodyIds].sort((a, b) => a - b), photos: [...photoIds].sort((a, b) => a - b) });
}

export async function getFind(project: ProjectView, access: Access, findId: number): Promise<FindDetail> {
  const find = await findInProject(project, findId);
  const [photos, custody, hold] = await Promise.all([
    FindPhoto.findAll({ where: { findId: find.id }, order: [["id", "ASC"]] }),
    FindCustody.findAll({ where: { findId: find.id } }),
    Hold.findOne({ where: { findId: find.id }, include: [{ model: HoldCell, as: "cells" }] }),
  ]);
  custody.sort(byTime);
  const locations = seesLocations(access);
  const detail: FindDetail = {
    ...summaryOf(find, custody),
    ...(locations ? locationOf(find) : {}),
    material: find.material,
    taxon: find.taxon,
    element: find.element,
    condition: find.condition,
    finder: find.finder,
    fieldTag: find.fieldTag,
    accessionNumber: find.accessionNumber,
    statusNote: find.statusNote,
    photos: photos.map((photo) => photoView(photo, locations)),
    custody: custody.map(custodyView),
    version: findVersion(find, custody.map((entry) => entry.id), photos.map((photo) => photo.id)),
  };
  // A hold's cells say where the find is: only for those who may see locations.
  if (locations && hold) detail.hold = { id: hold.id, cells: sortCellLabels((hold.cells ?? []).map((cell) => cell.label)), lifted: hold.liftedAt !== null };
  return detail;
}

// ——— Logging a find.

export interface FindLogged {
  id: number;
  catalogueNumber: string;
  hold?: { id: number; cells: string[] };
  /** Safety notices in plain sentences (the hold the find placed); empty when none. */
  notices: string[];
  /** True when the idempotency key named a find already logged: nothing new was stored. */
  replayed: boolean;
}

/** The next catalogue number for the project's year, under the project row's lock (one writer at a time). */
async function allocateCatalogueNumber(projectRow: Project, year: number, transaction: Transaction): Promise<{ sequence: number; number: string }> {
  const counter = await FindSequence.findOne({ where: { projectId: projectRow.id, year }, lock: transaction.LOCK.UPDATE, transaction });
  const sequence = (counter?.lastSequence ?? 0) + 1;
  if (counter) await FindSequence.update({ lastSequence: sequence }, { where: { projectId: projectRow.id, year }, transaction });
  else await FindSequence.create({ projectId: projectRow.id, year, lastSequence: sequence }, { transaction });
  const prefix = projectRow.findCataloguePrefix || defaultCataloguePrefix(projectRow.slug);
  return { sequence, number: catalogueNumber(prefix, year, sequence) };
}

async function replayOf(projectId: number, key: string | null | undefined): Promise<FindLogged | null> {
  if (!key) return null;
  const existing = await Find.findOne({ where: { projectId, idempotencyKey: key } });
  if (!existing) return null;
  const hold = await Hold.findOne({ where: { findId: existing.id }, include: [{ model: HoldCell, as: "cells" }] });
  const ref = hold ? { id: hold.id, cells: sortCellLabels((hold.cells ?? []).map((cell) => cell.label)) } : undefined;
  return { id: existing.id, catalogueNumber: existing.catalogueNumber, ...(ref ? { hold: ref } : {}), notices: findNotices(ref), replayed: true };
}

/**
 * Logs a find. The cell must lie inside the work limit; a position, when given, fixes the cell (and
 * must agree with one given beside it). A cultural find or human remains needs its cell, and places
 * a hold on every cell within the project's hold radius of the position (or of the cell's centre).
 */
export async function logFind(project: ProjectView, user: UserView, raw: z.output<typeof findInputSchema>, ip: string | null = null): Promise<FindLogged> {
  const replay = await replayOf(project.id, raw.idempotencyKey);
  if (replay) return replay;

  const payload = await getCellsPayload(project);
  const grid = payload.grid;
  const lookup = cellLookup(payload);
  let cellIndex: number | null = null;
  if (raw.cell) {
    cellIndex = lookup(raw.cell);
    if (cellIndex === null) throw new ValidationError({ field: "cell", message: `Cell ${raw.cell} is not inside the work limit.` });
  }
  if (raw.position) {
    const at = grid ? cellIndexAt(grid, raw.position.x, raw.position.y) : -1;
    if (at < 0 || payload.status[at] < 0) throw new ValidationError({ field: "position", message: "The position lies outside the work limit (project coordinates expected)." });
    if (cellIndex !== null && at !== cellIndex) {
      const { row, col } = cellRowCol(grid!, at);
      throw new ValidationError({ field: "position", message: `The position lies in cell ${cellLabelOf(row, col)}, not in ${raw.cell!.toUpperCase()}.` });
    }
    cellIndex = at;
  }
  const holds = HOLD_CATEGORIES.includes(raw.category);
  if (holds && cellIndex === null) {
    throw new ValidationError({ field: "cell", message: "A cultural find or human remains needs the cell it came from: the stop-work hold is placed around it." });
  }
  const cell = cellIndex !== null && grid ? { ...cellRowCol(grid, cellIndex), index: cellIndex } : null;

  let dive: Dive | null = null;
  if (raw.diveId) {
    dive = await Dive.findOne({ where: { id: raw.diveId, projectId: project.id } });
    if (!dive) throw new NotFoundError({ field: "diveId", message: `There is no dive #${raw.diveId} in this project's dive log.` });
  }
  const foundAt = new Date(raw.foundAt);

  try {
    return await getSequelize().transaction(async (transaction) => {
      const idempotency = await claimIdempotencyKey(transaction);
      // The project row's lock makes logging finds one at a time per project, so the counter row
      // is created once and each number is handed out once.
      const projectRow = await Project.findByPk(project.id, { lock: transaction.LOCK.UPDATE, transaction });
      if (!projectRow) throw new NotFoundError("There is no such project.");
      const year = localYear(foundAt, projectRow.timeZone);
      const { sequence, number } = await allocateCatalogueNumber(projectRow, year, transaction);
      const find = await Find.create(
        {
          projectId: project.id, catalogueNumber: number, catalogueYear: year, catalogueSequence: sequence,
          category: raw.category, description: raw.description, material: raw.material ?? "", count: raw.count,
          taxon: raw.taxon, element: raw.element, condition: raw.condition ?? "",
          cellRow: cell?.row ?? null, cellCol: cell?.col ?? null, cellLabel: cell ? cellLabelOf(cell.row, cell.col) : null,
          positionX: raw.position?.x ?? null, positionY: raw.position?.y ?? null,
          depthBelowSurface: raw.depthBelowSurface ?? null, depthInMuck: raw.depthInMuck ?? null,
          diveId: dive?.id ?? null, teamId: dive?.teamId ?? null,
          finder: raw.finder ?? "", foundAt, fieldTag: raw.fieldTag ?? "",
          accessionNumber: null, statusNote: null, idempotencyKey: raw.idempotencyKey ?? null, loggedById: user.id,
        },
        { transaction },
      );
      await idempotency.created(find.id);
      let hold: FindLogged["hold"];
      if (holds && cell && grid) {
        const [x, y] = raw.position ? [raw.position.x, raw.position.y] : cellCentroid(grid, cell.row, cell.col);
        const radius = convertLength(projectRow.holdRadiusM, "m", project.lengthUnit);
        const cells = cellsWithinRadius(grid, x, y, radius, (index) => payload.status[index] >= 0);
        // The hold runs from the moment the find came up, which is when work there stopped.
        const placed = await Hold.create({ projectId: project.id, findId: find.id, radiusM: projectRow.holdRadiusM, radiusSource: projectRow.holdRadiusSource, placedAt: foundAt, liftedAt: null, liftedById: null, authorisedBy: null, liftNote: null }, { transaction });
        await HoldCell.bulkCreate(cells.map((held) => ({ holdId: placed.id, projectId: project.id, row: held.row, col: held.col, label: held.label })), { transaction });
        await HoldNotice.bulkCreate(agenciesToNotify(raw.category).map((agency) => ({ holdId: placed.id, agency, toldAt: null, toldById: null, note: null })), { transaction });
        hold = { id: placed.id, cells: sortCellLabels(cells.map((held) => held.label)) };
        await recordAudit({ action: AUDIT_ACTIONS.holdPlaced, projectId: project.id, userId: user.id, ip, detail: { holdId: placed.id, findId: find.id, cellCount: cells.length, radiusM: projectRow.holdRadiusM } }, transaction);
      }
      await recordAudit({ action: AUDIT_ACTIONS.findLogged, projectId: project.id, userId: user.id, ip, detail: { findId: find.id, catalogueNumber: number, category: raw.category } }, transaction);
      return { id: find.id, catalogueNumber: number, ...(hold ? { hold } : {}), notices: findNotices(hold), replayed: false };
    });
  } catch (error) {
    // The same idempotency key sent twice at once: the second insert meets the unique index.
    if (error instanceof UniqueConstraintError) {
      const again = await replayOf(project.id, raw.idempotencyKey);
      if (again) return again;
    }
    throw error;
  }
}

// ——— Photos.

/**
 * Adds a photo from a staged upload: checked and re-encoded without metadata (app/lib/images),
 * stored with its thumbnail through the object store, then recorded. A refused file stores nothing;
 * objects stored before a failed record are removed again.
 */
export async function addFindPhoto(project: ProjectView, user: UserView, findId: number, staged: StagedFile, ip: string | null = null): Promise<{ id: number }> {
  const find = await findInProject(project, findId);
  return keepPhoto(staged, ["projects", project.id, "finds", find.id, "photos"], async (photo, transaction) => {
    const idempotency = await claimIdempotencyKey(transaction);
    const created = await FindPhoto.create({ ...photo, findId: find.id, projectId: project.id, uploadedById: user.id }, { transaction });
    await idempotency.created(created.id);
    await recordAudit({ action: AUDIT_ACTIONS.findPhotoAdded, projectId: project.id, userId: user.id, ip, detail: { findId: find.id, photoId: created.id, sizeBytes: created.sizeBytes } }, transaction);
    return { id: created.id };
  });
}

/** A photo's bytes (or its thumbnail's), after the caller's access to the find was checked. */
export async function findPhotoBytes(project: ProjectView, findId: number, photoId: number, size: "full" | "thumb"): Promise<StoredObject> {
  const photo = await FindPhoto.findOne({ where: { id: photoId, findId, projectId: project.id } });
  if (!photo) throw new NotFoundError("There is no such photo of this find.");
  return keptPhotoBytes(photo, size);
}

// ——— Custody and status.

/** The status a handover moves a find to, when it does. */
const STATUS_AFTER: Partial<Record<CustodyPurpose, FindStatus>> = { "to-site-store": "site-store", "to-state-lab": "at-lab" };

export async function recordCustody(project: ProjectView, user: UserView, findId: number, input: z.output<typeof custodyInputSchema>, ip: string | null = null): Promise<{ id: number; status: FindStatus }> {
  return getSequelize().transaction(async (transaction) => {
    const idempotency = await claimIdempotencyKey(transaction);
    const find = await findInProject(project, findId, transaction);
    const handedAt = new Date(input.handedAt);
    if (handedAt.getTime() < find.foundAt.getTime()) throw new ValidationError({ field: "handedAt", message: "A handover cannot come before the find was found." });
    const entry = await FindCustody.create(
      { findId: find.id, projectId: project.id, fromName: input.fromName, toName: input.toName, place: input.place, purpose: input.purpose, handedAt, receiverSignature: input.receiverSignature, note: input.note, formPhotoId: null, recordedById: user.id },
      { transaction },
    );
    await idempotency.created(entry.id);
    const next = STATUS_AFTER[input.purpose];
    if (next && (find.status === "in-field" || find.status === "site-store")) await find.update({ status: next }, { transaction });
    await recordAudit({ action: AUDIT_ACTIONS.findCustodyRecorded, projectId: project.id, userId: user.id, ip, detail: { findId: find.id, custodyId: entry.id, purpose: input.purpose, to: input.toName } }, transaction);
    return { id: entry.id, status: find.status };
  });
}

/**
 * Sets a find's status. With `options.ifMatch` (the versions an If-Match header names), refuses with
 * 412 and the find as `options.access` sees it now when it changed since the client saw it; the
 * check and the change hold the find's row lock.
 */
export async function setFindStatus(
  project: ProjectView, user: UserView, findId: number, input: z.output<typeof statusInputSchema>, ip: string | null = null,
  options: { ifMatch?: string[] | "any" | null; access?: Access } = {},
): Promise<void> {
  await getSequelize().transaction(async (transaction) => {
    const ifMatch = options.ifMatch ?? null;
    if (ifMatch !== null) await Find.findOne({ where: { id: findId, projectId: project.id }, attributes: ["id"], lock: transaction.LOCK.UPDATE, transaction });
    const find = await findInProject(project, findId, transaction);
    if (ifMatch !== null && ifMatch !== "any") {
      const [custody, photos] = await Promise.all([
        FindCustody.findAll({ where: { findId: find.id }, attributes: ["id"], transaction }),
        FindPhoto.findAll({ where: { findId: find.id }, attributes: ["id"], transaction }),
      ]);
      const version = findVersion(find, custody.map((entry) => entry.id), photos.map((photo) => photo.id));
      if (!ifMatch.includes(version)) assertCurrentVersion(ifMatch, await getFind(project, options.access ?? { role: null, isSiteAdmin: false }, findId), "find");
    }
    if (input.status === "released" && !["faunal", "modern-debris", "historic-debris"].includes(find.category)) {
      throw new ValidationError({ field: "status", message: "Only faunal finds and debris the lab does not keep are released; cultural finds and human remains stay in custody." });
    }
    await find.update({ status: input.status, accessionNumber: input.status === "curated" ? input.accessionNumber : find.accessionNumber, statusNote: input.note ?? find.statusNote }, { transaction });
    await recordAudit({ action: AUDIT_ACTIONS.findStatusChanged, projectId: project.id, userId: user.id, ip, detail: { findId: find.id, status: input.status } }, transaction);
  });
}

/** The latest dives, for the log form's dive picker (a find's cell defaults to its dive's first cell). */
export async function recentDivesForFinds(project: ProjectView, limit = 40): Promise<Array<{ id: number; label: string; cells: string[] }>> {
  const dives = await Dive.findAll({
    where: { projectId: project.id },
    include: [{ model: DiveTeam, as: "team", attributes: ["name"] }, { association: "cells", attributes: ["label"] }],
    order: [["diveDate", "DESC"], ["id", "DESC"]],
    limit,
  });
  return dives.map((dive) => ({
    id: dive.id,
    label: `${dive.diveDate} · ${dive.team?.name ?? "team"} · ${dive.diverName}${dive.diverIsVisitor ? " (visitor)" : ""}`,
    cells: sortCellLabels((dive.cells ?? []).map((cell) => cell.label)),
  }));
}

/** Labels of the cells inside the work limit, for the log form's cell list. */
export async function cellLabelsInside(project: ProjectView): Promise<string[]> {
  const payload = await getCellsPayload(project);
  const grid = payload.grid;
  if (!grid) return [];
  const labels: string[] = [];
  payload.status.forEach((code, index) => {
    if (code < 0) return;
    const { row, col } = cellRowCol(grid, index);
    labels.push(cellLabelOf(row, col));
  });
  return labels;
}

/**
 * The catalogue with locations as CSV, for the lab: only for roles that may see locations (the
 * route asks the table), and every export is written to the audit log. Text is formula-safe.
 */
/** Records an export of the catalogue with locations (the CSV, the printable catalogue) in the audit log. */
export async function recordFindsExport(project: ProjectView, user: UserView, format: "csv" | "printable", findCount: number, ip: string | null = null): Promise<void> {
  await recordAudit({ action: AUDIT_ACTIONS.findsExported, projectId: project.id, userId: user.id, ip, detail: { format, findCount } });
}

export async function findsCatalogueCsv(project: ProjectView, access: Access, user: UserView, ip: string | null = null): Promise<string> {
  const finds = await listFinds(project, access);
  const details = await Find.findAll({ where: { projectId: project.id }, attributes: ["id", "material", "taxon", "element", "condition", "finder", "fieldTag", "accessionNumber"] });
  const byId = new Map(details.map((find) => [find.id, find]));
  const length = unitLabel(project.lengthUnit);
  const lines = [
    csvLine(["Firmsand finds catalogue: CONFIDENTIAL site locations"]),
    csvLine(["Project", project.name]),
    csvLine(["Coordinate reference system", project.crs]),
    csvLine(["Times", `local, ${project.timeZone}`]),
    csvLine(["Generated", new Date().toISOString()]),
    "\r\n",
    csvLine([
      "catalogue number", "category", "description", "material", "count", "taxon", "element", "condition", "cell", "position x", "position y",
      `depth below surface (${length})`, `depth in muck (${length})`, "found at", "finder", "field tag", "status", "accession number", "held by", "place",
    ]),
    ...finds.map((find) => {
      const more = byId.get(find.id);
      return csvLine([
        find.catalogueNumber, FIND_CATEGORY_LABELS[find.category], find.description, more?.material ?? "", find.count, more?.taxon ?? null, more?.element ?? null, more?.condition ?? "",
        find.cell ?? null, find.position?.x ?? null, find.position?.y ?? null, find.depthBelowSurface ?? null, find.depthInMuck ?? null,
        instantToLocalDateTime(new Date(find.foundAt), project.timeZone), more?.finder ?? "", more?.fieldTag ?? "", FIND_STATUS_LABELS[find.status],
        more?.accessionNumber ?? null, find.currentHolder.name, find.currentHolder.place,
      ], 2);
    }),
  ];
  await recordFindsExport(project, user, "csv", finds.length, ip);
  return lines.join("");
}
