import { AUDIT_ACTIONS, recordAudit } from "~/lib/audit/audit.server";
import type { ProjectView } from "~/lib/auth/project-view.server";
import type { UserView } from "~/lib/auth/users.server";
import { getSequelize, Project, User } from "~/lib/db.server";
import { ConflictError, NotFoundError } from "~/lib/errors";

/**
 * Archiving a finished project and restoring it. An archived project is read-only everywhere: the
 * access check (`projectAccess`, with `can` in the permission table) refuses every changing
 * request to it, so nothing here touches its records; it stays readable and exportable. Both
 * steps are audited. Who may do which is the permission table's ("project.archive": the manager;
 * "project.restore": a site admin).
 */

export interface ArchiveState {
  archivedAt: string | null;
  /** Who archived it (null when open, or when that account is gone). */
  archivedBy: string | null;
}

export async function archiveStateOf(project: ProjectView): Promise<ArchiveState> {
  if (!project.archivedAt) return { archivedAt: null, archivedBy: null };
  const row = await Project.findByPk(project.id, { attributes: ["id", "archivedById"] });
  const by = row?.archivedById ? await User.findByPk(row.archivedById, { attributes: ["name"] }) : null;
  return { archivedAt: project.archivedAt, archivedBy: by?.name ?? null };
}

function change(project: ProjectView, actor: UserView, archive: boolean, ip: string | null): Promise<ArchiveState> {
  return getSequelize().transaction(async (transaction) => {
    const row = await Project.findByPk(project.id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!row) throw new NotFoundError("There is no such project.");
    // Checked again under the row's lock: two clicks, or an archive racing a restore, change it once.
    if (archive && row.archivedAt) throw new ConflictError(`${row.name} is already archived.`);
    if (!archive && !row.archivedAt) throw new ConflictError(`${row.name} is not archived; there is nothing to restore.`);
    const archivedSince = row.archivedAt;
    row.set(archive ? { archivedAt: new Date(), archivedById: actor.id } : { archivedAt: null, archivedById: null });
    await row.save({ transaction });
    await recordAudit(
      {
        action: archive ? AUDIT_ACTIONS.projectArchived : AUDIT_ACTIONS.projectRestored,
        projectId: project.id, userId: actor.id, ip,
        detail: archive ? { archivedAt: row.archivedAt!.toISOString() } : { archivedSince: archivedSince!.toISOString() },
      },
      transaction,
    );
    return { archivedAt: row.archivedAt ? row.archivedAt.toISOString() : null, archivedBy: archive ? actor.name : null };
  });
}

/** Archives an open project (ConflictError when it is archived already). */
export function archiveProject(project: ProjectView, actor: UserView, options: { ip?: string | null } = {}): Promise<ArchiveState> {
  return change(project, actor, true, options.ip ?? null);
}

/** Reopens an archived project (ConflictError when it is open). */
export function restoreProject(project: ProjectView, actor: UserView, options: { ip?: string | null } = {}): Promise<ArchiveState> {
  return change(project, actor, false, options.ip ?? null);
}
