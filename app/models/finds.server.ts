import { Op, UniqueConstraintError, type Transaction } from "sequelize";
import { z } from "zod";
import { cellCentroid, cellIndexAt, cellRowCol, cellLabel as cellLabelOf } from "../../shared/grid/cell-grid";
import {
  agenciesToNotify, catalogueNumber, cellsWithinRadius, CUSTODY_PURPOSES, defaultCataloguePrefix, FIND_CATEGORIES, FIND_CATEGORY_LABELS, FIND_STATUSES, FIND_STATUS_LABELS,
  HOLD_CATEGORIES, instantToLocalDateTime, localYear, sortCellLabels,
  type CustodyPurpose, type FindCategory, type FindStatus,
} from "../../shared/finds/finds";
import { convertLength, measureLabel, unitLabel, type HandVolumeUnit } from "../../shared/units";
import { createCrs } from "../../shared/crs";
import type { LonLatWorkLimit } from "~/components/map/clip-cells";
import type { PositionFields } from "~/components/finds/provenience";
import { listDiveTeams } from "./dive-teams.server";
import { heldCellLabels } from "./holds.server";
import { csvLine } from "../../shared/csv-safe";
import { Dive, DiveTeam, Find, FindCustody, FindPhoto, FindSequence, getSequelize, Hold, HoldCell, HoldNotice, Project, type PhotoExif } from "~/lib/db.server";
import { ConflictError, NotFoundError, ValidationError } from "~/lib/errors";
import { can, type Access } from "~/lib/auth/permissions";
import { AUDIT_ACTIONS, recordAudit } from "~/lib/audit/audit.server";
import { keepPhoto, keptPhotoBytes, presentPhoto, type PhotoView as StoredPhotoView } from "~/lib/images/stored-photo.server";
import type { StoredObject } from "~/lib/storage/storage.server";
import type { StagedFile } from "~/lib/import/stage-upload.server";
import { cellLookup } from "./assignments.server";
import { getCellsPayload } from "./cells.server";
import type { ProjectView } from "~/lib/auth/project-view.server";
import type { UserView } from "~/lib/auth/users.server";
import { basketLoadInputSchema, custodyInputSchema, findInputSchema, optionalText, statusInputSchema } from "~/lib/field-records/inputs";
export { BASKET_CATEGORIES, basketLoadInputSchema, custodyInputSchema, findInputSchema, statusInputSchema, type BasketLoadInput, type CustodyInput, type FindInput } from "~/lib/field-records/inputs";
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
  /** How many; null for a basket line measured by volume alone. */
  count: number | null;
  /** A basket line's volume, as entered; null when none was given. */
  volume: HandVolume | null;
  /** A line of a basket load (debris removed by hand), not a find logged on its own. */
  fromBasket: boolean;
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
  /** The photo of the signed paper form (one of the find's photos), when there is one. */
  formPhotoId: number | null;
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

export interface HandVolume {
  value: number;
  unit: HandVolumeUnit;
}

function volumeOf(find: Find): HandVolume | null {
  return find.volumeValue !== null && find.volumeUnit !== null ? { value: find.volumeValue, unit: find.volumeUnit } : null;
}

function summaryOf(find: Find, custody: FindCustody[]): FindSummary {
  return {
    id: find.id,
    catalogueNumber: find.catalogueNumber,
    category: find.category,
    description: find.description,
    count: find.count,
    volume: volumeOf(find),
    fromBasket: find.fromBasket,
    status: find.status,
    foundAt: find.foundAt.toISOString(),
    currentHolder: currentHolder(find, custody),
  };
}

function custodyView(entry: FindCustody): CustodyView {
  return {
    id: entry.id, fromName: entry.fromName, toName: entry.toName, place: entry.place, purpose: entry.purpose,
    handedAt: entry.handedAt.toISOString(), receiverSignature: entry.receiverSignature, note: entry.note, formPhotoId: entry.formPhotoId ?? null,
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

/** What a catalogue entry holds, its provenience already checked (provenienceOf). */
interface FindFields {
  category: FindCategory; description: string; material?: string | null; count: number | null; volume?: HandVolume | null; fromBasket?: boolean; taxon?: string | null; element?: string | null; condition?: string | null;
  cell: { row: number; col: number } | null; position?: { x: number; y: number } | null; depthBelowSurface?: number | null; depthInMuck?: number | null;
  diveId: number | null; teamId: number | null; finder?: string | null; foundAt: Date; fieldTag?: string | null; idempotencyKey?: string | null;
}

/** Gives the next catalogue number of the find's local year and stores the find, under the project row's lock the caller holds. */
async function insertFind(projectRow: Project, user: UserView, fields: FindFields, transaction: Transaction): Promise<{ find: Find; number: string }> {
  const year = localYear(fields.foundAt, projectRow.timeZone);
  const { sequence, number } = await allocateCatalogueNumber(projectRow, year, transaction);
  const { cell } = fields;
  const find = await Find.create(
    {
      projectId: projectRow.id, catalogueNumber: number, catalogueYear: year, catalogueSequence: sequence,
      category: fields.category, description: fields.description, material: fields.material ?? "", count: fields.count,
      volumeValue: fields.volume?.value ?? null, volumeUnit: fields.volume?.unit ?? null, fromBasket: fields.fromBasket ?? false,
      taxon: fields.taxon ?? null, element: fields.element ?? null, condition: fields.condition ?? "",
      cellRow: cell?.row ?? null, cellCol: cell?.col ?? null, cellLabel: cell ? cellLabelOf(cell.row, cell.col) : null,
      positionX: fields.position?.x ?? null, positionY: fields.position?.y ?? null,
      depthBelowSurface: fields.depthBelowSurface ?? null, depthInMuck: fields.depthInMuck ?? null,
      diveId: fields.diveId, teamId: fields.teamId,
      finder: fields.finder ?? "", foundAt: fields.foundAt, fieldTag: fields.fieldTag ?? "",
      accessionNumber: null, statusNote: null, idempotencyKey: fields.idempotencyKey ?? null, loggedById: user.id,
    },
    { transaction },
  );
  return { find, number };
}

async function replayOf(projectId: number, key: string | null | undefined): Promise<FindLogged | null> {
  if (!key) return null;
  const existing = await Find.findOne({ where: { projectId, idempotencyKey: key } });
  if (!existing) return null;
  const hold = await Hold.findOne({ where: { findId: existing.id }, include: [{ model: HoldCell, as: "cells" }] });
  const ref = hold ? { id: hold.id, cells: sortCellLabels((hold.cells ?? []).map((cell) => cell.label)) } : undefined;
  return { id: existing.id, catalogueNumber: existing.catalogueNumber, ...(ref ? { hold: ref } : {}), notices: findNotices(ref), replayed: true };
}

/** Where and from which dive and team something came up, checked: shared by a find and a basket load. */
interface ProvenienceInput {
  cell?: string | null;
  position?: { x: number; y: number } | null;
  diveId?: number | null;
  teamId?: number | null;
}

/**
 * Checks a provenience: the cell must lie inside the work limit; a position, when given, fixes the
 * cell (and must agree with one given beside it); the dive and team must be this project's, and a
 * team named beside a dive must be the dive's.
 */
async function provenienceOf(project: ProjectView, raw: ProvenienceInput) {
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
    if (at < 0 || payload.status[at] < 0) throw new ValidationError({ field: "position", message: `The position (${+raw.position.x.toFixed(2)}, ${+raw.position.y.toFixed(2)} in ${project.crs}) lies outside the work limit.` });
    if (cellIndex !== null && at !== cellIndex) {
      const { row, col } = cellRowCol(grid!, at);
      throw new ValidationError({ field: "position", message: `The position lies in cell ${cellLabelOf(row, col)}, not in ${raw.cell!.toUpperCase()}.` });
    }
    cellIndex = at;
  }
  const cell = cellIndex !== null && grid ? { ...cellRowCol(grid, cellIndex), index: cellIndex } : null;

  let dive: Dive | null = null;
  if (raw.diveId) {
    dive = await Dive.findOne({ where: { id: raw.diveId, projectId: project.id } });
    if (!dive) throw new NotFoundError({ field: "diveId", message: `There is no dive #${raw.diveId} in this project's dive log.` });
  }
  let teamId: number | null = dive?.teamId ?? null;
  if (raw.teamId) {
    const team = await DiveTeam.findOne({ where: { id: raw.teamId, projectId: project.id }, attributes: ["id", "name"] });
    if (!team) throw new NotFoundError({ field: "teamId", message: `There is no dive team #${raw.teamId} in this project.` });
    if (dive && dive.teamId !== null && dive.teamId !== team.id) throw new ValidationError({ field: "teamId", message: `Dive #${dive.id} was made by another team than ${team.name}: leave the team to the dive.` });
    teamId = team.id;
  }
  return { payload, grid, cell, dive, teamId };
}

/**
 * Logs a find. The cell must lie inside the work limit; a position, when given, fixes the cell (and
 * must agree with one given beside it). A cultural find or human remains needs its cell, and places
 * a hold on every cell within the project's hold radius of the position (or of the cell's centre).
 */
/**
 * When a find came up, refused more than 5 minutes ahead of the server's clock (the slack readings
 * and sightings allow a phone's clock): a find logged in the future would place a hold that could
 * not be lifted until then.
 */
function foundAtNotAhead(text: string): Date {
  const foundAt = new Date(text);
  if (foundAt.getTime() > Date.now() + 5 * 60_000) {
    throw new ValidationError({ field: "foundAt", message: "The find time is in the future: give when it came up (a phone whose clock runs ahead needs setting)." });
  }
  return foundAt;
}

export async function logFind(project: ProjectView, user: UserView, raw: z.output<typeof findInputSchema>, ip: string | null = null): Promise<FindLogged> {
  const replay = await replayOf(project.id, raw.idempotencyKey);
  if (replay) return replay;

  const { payload, grid, cell, dive, teamId } = await provenienceOf(project, raw);
  const holds = HOLD_CATEGORIES.includes(raw.category);
  if (holds && cell === null) {
    throw new ValidationError({ field: "cell", message: "A cultural find or human remains needs the cell it came from: the stop-work hold is placed around it." });
  }
  const foundAt = foundAtNotAhead(raw.foundAt);

  try {
    return await getSequelize().transaction(async (transaction) => {
      const idempotency = await claimIdempotencyKey(transaction);
      // The project row's lock makes logging finds one at a time per project, so the counter row
      // is created once and each number is handed out once.
      const projectRow = await Project.findByPk(project.id, { lock: transaction.LOCK.UPDATE, transaction });
      if (!projectRow) throw new NotFoundError("There is no such project.");
      const { find, number } = await insertFind(projectRow, user, { ...raw, foundAt, cell, diveId: dive?.id ?? null, teamId }, transaction);
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

// ——— Basket loads.

export interface BasketLogged {
  /** One catalogue entry per line, in the order of the lines. */
  finds: Array<{ id: number; catalogueNumber: string; category: FindCategory; count: number | null; volume: HandVolume | null }>;
  replayed: boolean;
}

const basketKey = (key: string, line: number) => `${key}:${line}`;

async function basketReplayOf(projectId: number, key: string | null | undefined): Promise<BasketLogged | null> {
  if (!key) return null;
  const first = await Find.findOne({ where: { projectId, idempotencyKey: basketKey(key, 0) }, attributes: ["id"] });
  if (!first) return null;
  const rows = await Find.findAll({ where: { projectId, idempotencyKey: { [Op.startsWith]: `${key}:` } }, attributes: ["id", "catalogueNumber", "category", "count", "volumeValue", "volumeUnit", "idempotencyKey"] });
  // LIKE treats _ and % in a key as wildcards: keep only this key's lines.
  const line = (find: Find) => (find.idempotencyKey!.startsWith(`${key}:`) && /^\d+$/.test(find.idempotencyKey!.slice(key.length + 1)) ? Number(find.idempotencyKey!.slice(key.length + 1)) : -1);
  const lines = rows.filter((find) => line(find) >= 0).sort((a, b) => line(a) - line(b));
  return { finds: lines.map((find) => ({ id: find.id, catalogueNumber: find.catalogueNumber, category: find.category, count: find.count, volume: volumeOf(find) })), replayed: true };
}

/**
 * Logs a basket load: what a diver's basket brought up, a line per kind with its count, its volume
 * (as measured: gallons, cubic feet, litres, cubic metres) or both, sharing one
 * provenience (dive, team, cell, position, depths, time, finder, tag). Each line is a catalogue
 * entry of its own (numbers handed out in order, never reused), all in one transaction: a refused
 * line stores nothing. Cultural finds and human remains are refused here: each is logged on its own.
 */
export async function logBasketLoad(project: ProjectView, user: UserView, raw: z.output<typeof basketLoadInputSchema>, ip: string | null = null): Promise<BasketLogged> {
  const replay = await basketReplayOf(project.id, raw.idempotencyKey);
  if (replay) return replay;
  const { cell, dive, teamId } = await provenienceOf(project, raw);
  const foundAt = foundAtNotAhead(raw.foundAt);
  try {
    return await getSequelize().transaction(async (transaction) => {
      const idempotency = await claimIdempotencyKey(transaction);
      const projectRow = await Project.findByPk(project.id, { lock: transaction.LOCK.UPDATE, transaction });
      if (!projectRow) throw new NotFoundError("There is no such project.");
      const finds: BasketLogged["finds"] = [];
      for (const [index, line] of raw.lines.entries()) {
        const { find, number } = await insertFind(
          projectRow, user,
          { ...line, count: line.count ?? null, volume: line.volume ?? null, fromBasket: true, condition: raw.condition, cell, position: raw.position, depthBelowSurface: raw.depthBelowSurface, depthInMuck: raw.depthInMuck, diveId: dive?.id ?? null, teamId, finder: raw.finder, foundAt, fieldTag: raw.fieldTag, idempotencyKey: raw.idempotencyKey ? basketKey(raw.idempotencyKey, index) : null },
          transaction,
        );
        if (index === 0) await idempotency.created(find.id);
        finds.push({ id: find.id, catalogueNumber: number, category: find.category, count: find.count, volume: volumeOf(find) });
        await recordAudit({ action: AUDIT_ACTIONS.findLogged, projectId: project.id, userId: user.id, ip, detail: { findId: find.id, catalogueNumber: number, category: find.category, basketLine: index + 1, basketLines: raw.lines.length } }, transaction);
      }
      return { finds, replayed: false };
    });
  } catch (error) {
    if (error instanceof UniqueConstraintError) {
      const again = await basketReplayOf(project.id, raw.idempotencyKey);
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

/**
 * Adds the photo of a handover's signed paper form: kept like any photo of the find (checked,
 * re-encoded without metadata, stored with its thumbnail) and named on the handover, in one
 * transaction. One per handover: a second is refused (409) and stores nothing.
 */
export async function addCustodyFormPhoto(project: ProjectView, user: UserView, findId: number, custodyId: number, staged: StagedFile, ip: string | null = null): Promise<{ id: number }> {
  const find = await findInProject(project, findId);
  const entry = await FindCustody.findOne({ where: { id: custodyId, findId: find.id, projectId: project.id } });
  if (!entry) throw new NotFoundError("There is no such handover of this find.");
  const already = (photoId: number) => new ConflictError({ message: `The handover of ${entry.handedAt.toISOString().slice(0, 10)} to ${entry.toName} has its form's photo already (photo #${photoId}).` });
  if (entry.formPhotoId) throw already(entry.formPhotoId);
  return keepPhoto(staged, ["projects", project.id, "finds", find.id, "photos"], async (photo, transaction) => {
    const idempotency = await claimIdempotencyKey(transaction);
    const locked = await FindCustody.findOne({ where: { id: entry.id }, lock: transaction.LOCK.UPDATE, transaction });
    if (!locked) throw new NotFoundError("There is no such handover of this find.");
    if (locked.formPhotoId) throw already(locked.formPhotoId);
    const created = await FindPhoto.create({ ...photo, findId: find.id, projectId: project.id, uploadedById: user.id }, { transaction });
    await locked.update({ formPhotoId: created.id }, { transaction });
    await idempotency.created(created.id);
    await recordAudit({ action: AUDIT_ACTIONS.findPhotoAdded, projectId: project.id, userId: user.id, ip, detail: { findId: find.id, photoId: created.id, custodyId: entry.id, sizeBytes: created.sizeBytes } }, transaction);
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

/**
 * The latest dives, for the log form's dive picker (a find's cell defaults to its dive's first
 * cell), and the dive `include` names when it is older (the form opened from that dive's log entry).
 */
export async function recentDivesForFinds(project: ProjectView, limit = 40, include: number | null = null): Promise<Array<{ id: number; label: string; cells: string[]; teamId: number | null }>> {
  const options = {
    include: [{ model: DiveTeam, as: "team", attributes: ["name"] }, { association: "cells", attributes: ["label"] }],
    order: [["diveDate", "DESC"], ["id", "DESC"]] as Array<[string, string]>,
  };
  const dives = await Dive.findAll({ where: { projectId: project.id }, ...options, limit });
  if (include !== null && !dives.some((dive) => dive.id === include)) {
    const named = await Dive.findOne({ where: { id: include, projectId: project.id }, include: options.include });
    if (named) dives.unshift(named);
  }
  return dives.map((dive) => ({
    id: dive.id,
    teamId: dive.teamId ?? null,
    label: `${dive.diveDate} · ${dive.team?.name ?? "team"} · ${dive.diverName}${dive.diverIsVisitor ? " (visitor)" : ""}`,
    cells: sortCellLabels((dive.cells ?? []).map((cell) => cell.label)),
  }));
}

/**
 * A latitude and longitude (WGS 84, as a phone gives them) in the project's coordinates, for the
 * log form's position; logFind then checks it against the work limit.
 */
export async function projectPositionOf(project: ProjectView, lat: number, lon: number): Promise<{ x: number; y: number }> {
  const payload = await getCellsPayload(project);
  const [x, y] = createCrs(payload.crs.definition).fromLonLat(lon, lat);
  return { x, y };
}

/** The position the form's fields give, in the project's coordinates (none when left empty). */
export async function positionFromFields(project: ProjectView, fields: PositionFields): Promise<{ x: number; y: number } | undefined> {
  if (fields.positionIn === "grid" && fields.easting !== undefined && fields.northing !== undefined) return { x: fields.easting, y: fields.northing };
  if (fields.positionIn === "latlon" && fields.latitude !== undefined && fields.longitude !== undefined) return projectPositionOf(project, fields.latitude, fields.longitude);
  return undefined;
}

/**
 * What the find forms offer (dives, teams, cells, held cells, the work limit) and what the address
 * prefills: a dive from its log entry (with its team and cells), or a team and its cells from the day plan.
 */
export async function findFormOptions(project: ProjectView, prefill: { dive?: number; team?: number; cells?: string }) {
  const [dives, cells, teams, heldCells, row] = await Promise.all([
    recentDivesForFinds(project, 40, prefill.dive ?? null), cellLabelsInside(project), listDiveTeams(project), heldCellLabels(project.id), Project.findByPk(project.id, { attributes: ["workLimitGeoJson"] }),
  ]);
  const inside = new Set(cells);
  const dive = dives.find((candidate) => candidate.id === prefill.dive) ?? null;
  const team = teams.find((candidate) => candidate.id === (dive?.teamId ?? prefill.team)) ?? null;
  const planCells = (prefill.cells ?? "").split(",").map((label) => label.trim().toUpperCase()).filter((label) => inside.has(label));
  return {
    projectId: project.id, lengthLabel: unitLabel(project.lengthUnit), lengthUnit: project.lengthUnit, timeZone: project.timeZone, crsCode: project.crs,
    now: instantToLocalDateTime(new Date(), project.timeZone).replace(" ", "T"), dives, cells, heldCells,
    teams: teams.map((candidate) => ({ id: candidate.id, name: candidate.name })),
    // Lon/lat, as stored: the picker frames it and clips the cells along it.
    workLimit: row?.workLimitGeoJson ? (JSON.parse(row.workLimitGeoJson) as LonLatWorkLimit) : null,
    prefill: { diveId: dive?.id ?? null, teamId: team?.id ?? null, cells: dive ? dive.cells : planCells },
  };
}
export type FindFormOptions = Awaited<ReturnType<typeof findFormOptions>>;

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
      "catalogue number", "category", "description", "material", "count", "volume", "volume unit", "basket line", "taxon", "element", "condition", "cell", "position x", "position y",
      `depth below surface (${length})`, `depth in muck (${length})`, "found at", "finder", "field tag", "status", "accession number", "held by", "place",
    ]),
    ...finds.map((find) => {
      const more = byId.get(find.id);
      return csvLine([
        find.catalogueNumber, FIND_CATEGORY_LABELS[find.category], find.description, more?.material ?? "", find.count, find.volume?.value ?? null, find.volume ? measureLabel(find.volume.unit) : null, find.fromBasket ? "yes" : "no", more?.taxon ?? null, more?.element ?? null, more?.condition ?? "",
        find.cell ?? null, find.position?.x ?? null, find.position?.y ?? null, find.depthBelowSurface ?? null, find.depthInMuck ?? null,
        instantToLocalDateTime(new Date(find.foundAt), project.timeZone), more?.finder ?? "", more?.fieldTag ?? "", FIND_STATUS_LABELS[find.status],
        more?.accessionNumber ?? null, find.currentHolder.name, find.currentHolder.place,
      ], 2);
    }),
  ];
  await recordFindsExport(project, user, "csv", finds.length, ip);
  return lines.join("");
}
