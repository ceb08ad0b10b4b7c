import { Op, type Transaction } from "sequelize";
import { z } from "zod";
import { HOLD_AGENCIES, HOLD_AGENCY_LABELS, instantToLocalDateTime, sortCellLabels, type FindCategory, type HoldAgency } from "../../shared/finds/finds";
import { Find, getSequelize, Hold, HoldCell, HoldNotice } from "~/lib/db.server";
import { ConflictError, NotFoundError, ValidationError } from "~/lib/errors";
import { claimIdempotencyKey } from "~/lib/api/idempotency.server";
import { can, type Access } from "~/lib/auth/permissions";
import { AUDIT_ACTIONS, recordAudit } from "~/lib/audit/audit.server";
import type { ProjectView } from "~/lib/auth/project-view.server";
import type { UserView } from "~/lib/auth/users.server";
import { cachedReadFor } from "~/lib/cache/read-cache.server";
import { oncePerRequest } from "~/lib/http/request-scope.server";

/**
 * Stop-work holds around cultural finds and human remains (placed by logFind in finds.server.ts):
 * the list, the notices to the agencies, the lift with who authorised resuming, and the held cells
 * the dive plans refuse. Roles that may not see find locations get a hold's id, cells and dates
 * only: never the find it belongs to.
 */

const name = (label: string, max: number) => z.string().trim().min(1, `write the ${label}`).max(max, `the ${label} is at most ${max} characters`);
const optionalText = (max: number) => z.string().trim().max(max, `at most ${max} characters`).nullish().transform((value) => value || null);

export const liftInputSchema = z.object({
  authorisedBy: name("name and office of who authorised resuming", 200),
  note: optionalText(2000),
  /** When work was allowed to resume, if earlier than now (a lift recorded after the fact). */
  liftedAt: z.iso.datetime({ offset: true, message: "liftedAt is a date and time with its offset, e.g. 2026-11-04T08:15:00-05:00" }).nullish(),
});

export const noticeInputSchema = z.object({
  agency: z.enum(HOLD_AGENCIES, { message: `the agency is one of ${HOLD_AGENCIES.join(", ")}` }),
  toldAt: z.iso.datetime({ offset: true, message: "toldAt is a date and time with its offset" }),
  note: optionalText(2000),
});


export interface HoldView {
  id: number;
  cells: string[];
  placedAt: string;
  lifted: boolean;
  /** Only for roles that may see locations: the find, the radius, the notices and the lift. */
  find?: { id: number; catalogueNumber: string; category: FindCategory };
  radiusM?: number;
  radiusSource?: string;
  notices?: Array<{ agency: HoldAgency; toldAt: string | null; note: string | null }>;
  liftedAt?: string | null;
  authorisedBy?: string | null;
  liftNote?: string | null;
}

export async function listHolds(project: ProjectView, access: Access): Promise<HoldView[]> {
  const holds = await Hold.findAll({
    where: { projectId: project.id },
    include: [{ model: HoldCell, as: "cells" }, { model: HoldNotice, as: "notices" }, { model: Find, as: "find", attributes: ["id", "catalogueNumber", "category"] }],
    order: [["placedAt", "DESC"], ["id", "DESC"]],
  });
  const locations = can(access, "finds.locations.read");
  return holds.map((hold) => {
    const view: HoldView = { id: hold.id, cells: sortCellLabels((hold.cells ?? []).map((cell) => cell.label)), placedAt: hold.placedAt.toISOString(), lifted: hold.liftedAt !== null };
    if (!locations) return view;
    return {
      ...view,
      find: hold.find ? { id: hold.find.id, catalogueNumber: hold.find.catalogueNumber, category: hold.find.category } : undefined,
      radiusM: hold.radiusM,
      radiusSource: hold.radiusSource,
      notices: (hold.notices ?? []).map((notice) => ({ agency: notice.agency, toldAt: notice.toldAt?.toISOString() ?? null, note: notice.note })),
      liftedAt: hold.liftedAt?.toISOString() ?? null,
      authorisedBy: hold.authorisedBy,
      liftNote: hold.liftNote,
    };
  });
}

async function openHold(project: ProjectView, holdId: number, transaction: Transaction): Promise<Hold> {
  const hold = await Hold.findOne({ where: { id: holdId, projectId: project.id }, lock: transaction.LOCK.UPDATE, transaction });
  if (!hold) throw new NotFoundError("There is no such hold in this project.");
  return hold;
}

/** How far ahead of the server's clock a lift time may be (a phone's clock a little fast). */
const CLOCK_SLACK_MS = 2 * 60_000;

/**
 * Lifts a hold, now or at the time entered (back-dated: the authorisation came before it was
 * recorded), never before the hold was placed nor in the future. The audit keeps both times.
 */
export async function liftHold(project: ProjectView, user: UserView, holdId: number, input: z.output<typeof liftInputSchema>, ip: string | null = null): Promise<{ liftedAt: string }> {
  return getSequelize().transaction(async (transaction) => {
    const idempotency = await claimIdempotencyKey(transaction);
    const hold = await openHold(project, holdId, transaction);
    if (hold.liftedAt) throw new ConflictError({ message: `Hold #${hold.id} was lifted already, at ${instantToLocalDateTime(hold.liftedAt, project.timeZone)} (${project.timeZone}).` });
    const recordedAt = new Date();
    const liftedAt = input.liftedAt ? new Date(input.liftedAt) : recordedAt;
    const local = (instant: Date) => `${instantToLocalDateTime(instant, project.timeZone)} (${project.timeZone})`;
    if (liftedAt.getTime() > recordedAt.getTime() + CLOCK_SLACK_MS) throw new ValidationError({ field: "liftedAt", message: `The lift cannot be in the future (it is now ${local(recordedAt)}).` });
    const at = liftedAt.getTime() > recordedAt.getTime() ? recordedAt : liftedAt;
    // One rule for the time stored, entered or "now": a hold is never lifted before it was placed
    // (a find logged from a phone whose clock runs ahead places its hold in the server's future).
    if (at.getTime() < hold.placedAt.getTime()) {
      const message = input.liftedAt
        ? `The lift cannot come before the hold was placed, at ${local(hold.placedAt)}.`
        : `The lift cannot come before the hold was placed, at ${local(hold.placedAt)}, and it is only ${local(recordedAt)} now: check the time the find came up, or lift once that time has passed.`;
      throw new ValidationError({ field: "liftedAt", message });
    }
    await hold.update({ liftedAt: at, liftedById: user.id, authorisedBy: input.authorisedBy, liftNote: input.note }, { transaction });
    await idempotency.created(hold.id);
    await recordAudit({ action: AUDIT_ACTIONS.holdLifted, projectId: project.id, userId: user.id, ip, detail: { holdId: hold.id, authorisedBy: input.authorisedBy, liftedAt: at.toISOString(), recordedAt: recordedAt.toISOString() } }, transaction);
    return { liftedAt: at.toISOString() };
  });
}

export interface NoticeView {
  agency: HoldAgency;
  toldAt: string | null;
  note: string | null;
}

/** A hold's notices to the agencies: who must be told and when each was (for roles that may see locations). */
export async function listHoldNotices(project: ProjectView, holdId: number): Promise<NoticeView[]> {
  const hold = await Hold.findOne({ where: { id: holdId, projectId: project.id }, include: [{ model: HoldNotice, as: "notices" }] });
  if (!hold) throw new NotFoundError("There is no such hold in this project.");
  const order = (agency: HoldAgency) => HOLD_AGENCIES.indexOf(agency);
  return (hold.notices ?? []).sort((a, b) => order(a.agency) - order(b.agency)).map((notice) => ({ agency: notice.agency, toldAt: notice.toldAt?.toISOString() ?? null, note: notice.note }));
}

/**
 * Records when an agency was told of a hold: not before the hold was placed, not in the future, and
 * once (a notice already recorded is refused, naming when it was told).
 */
export async function recordHoldNotice(project: ProjectView, user: UserView, holdId: number, input: z.output<typeof noticeInputSchema>, ip: string | null = null): Promise<NoticeView> {
  return getSequelize().transaction(async (transaction) => {
    const idempotency = await claimIdempotencyKey(transaction);
    const hold = await openHold(project, holdId, transaction);
    const notice = await HoldNotice.findOne({ where: { holdId: hold.id, agency: input.agency }, transaction });
    if (!notice) throw new ValidationError({ field: "agency", message: `This hold does not list ${HOLD_AGENCY_LABELS[input.agency]}: it lists ${(await HoldNotice.findAll({ where: { holdId: hold.id }, transaction })).map((listed) => HOLD_AGENCY_LABELS[listed.agency]).join(", ")}.` });
    const local = (instant: Date) => `${instantToLocalDateTime(instant, project.timeZone)} (${project.timeZone})`;
    if (notice.toldAt) throw new ConflictError({ field: "agency", message: `${HOLD_AGENCY_LABELS[input.agency]} was recorded as told already, at ${local(notice.toldAt)}.` });
    const toldAt = new Date(input.toldAt);
    if (toldAt.getTime() < hold.placedAt.getTime()) throw new ValidationError({ field: "toldAt", message: `The notice cannot come before the hold was placed, at ${local(hold.placedAt)}.` });
    if (toldAt.getTime() > Date.now() + CLOCK_SLACK_MS) throw new ValidationError({ field: "toldAt", message: `The notice cannot be in the future (it is now ${local(new Date())}).` });
    await notice.update({ toldAt, toldById: user.id, note: input.note }, { transaction });
    await idempotency.created(notice.id);
    await recordAudit({ action: AUDIT_ACTIONS.holdNoticeRecorded, projectId: project.id, userId: user.id, ip, detail: { holdId: hold.id, agency: input.agency, toldAt: toldAt.toISOString() } }, transaction);
    return { agency: notice.agency, toldAt: toldAt.toISOString(), note: notice.note };
  });
}

/** The open holds covering any of `cells` (grid row/col), each with the cells it holds among them. */
export async function openHoldsOn(projectId: number, cells: Array<{ row: number; col: number }>, transaction?: Transaction): Promise<Array<{ holdId: number; cells: string[] }>> {
  if (cells.length === 0) return [];
  const rows = await HoldCell.findAll({
    where: { projectId, [Op.or]: cells.map(({ row, col }) => ({ row, col })) },
    include: [{ model: Hold, as: "hold", where: { liftedAt: null }, attributes: ["id"] }],
    order: [["label", "ASC"]],
    transaction,
  });
  const byHold = new Map<number, string[]>();
  for (const row of rows) byHold.set(row.holdId, [...(byHold.get(row.holdId) ?? []), row.label]);
  return [...byHold].map(([holdId, labels]) => ({ holdId, cells: labels }));
}

/** `heldCellLabels` for a page's loaders, under one key of the read cache, once per request (the layout's count and the map's cells share it). */
export function heldCellLabelsFor(request: Request, projectId: number): Promise<string[]> {
  const key = `held-cells:${projectId}`;
  return oncePerRequest(request, key, () => cachedReadFor(request, key, () => heldCellLabels(projectId)));
}

/** Labels of every cell under an open hold (the map's "held" cells; no details). */
export async function heldCellLabels(projectId: number): Promise<string[]> {
  const rows = await HoldCell.findAll({
    where: { projectId },
    include: [{ model: Hold, as: "hold", where: { liftedAt: null }, attributes: [] }],
    attributes: ["label"],
  });
  return sortCellLabels(new Set(rows.map((row) => row.label)));
}
