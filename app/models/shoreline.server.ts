import { Shoreline, getSequelize } from "~/lib/db.server";
import { ValidationError } from "~/lib/errors";
import { AUDIT_ACTIONS, recordAudit } from "~/lib/audit/audit.server";
import { findProject, type ProjectView } from "~/lib/auth/project-view.server";
import { checkShoreline, type LonLatLimit } from "./shoreline-geojson";
import type { UserView } from "~/lib/auth/users.server";

/** The project's optional shoreline (the map's water base layer): read, upload or replace, remove. */

export interface ShorelineView {
  fileName: string;
  uploadedAt: string;
  polygons: number;
  vertices: number;
}

function summarise(geoJson: string): { polygons: number; vertices: number } {
  const collection = JSON.parse(geoJson) as { features: Array<{ geometry: LonLatLimit }> };
  let polygons = 0, vertices = 0;
  for (const feature of collection.features) {
    const list = feature.geometry.type === "Polygon" ? [feature.geometry.coordinates] : feature.geometry.coordinates;
    polygons += list.length;
    for (const rings of list) for (const ring of rings) vertices += ring.length;
  }
  return { polygons, vertices };
}

export async function getShoreline(project: ProjectView): Promise<ShorelineView | null> {
  const row = await Shoreline.findOne({ where: { projectId: project.id } });
  if (!row) return null;
  return { fileName: row.fileName, uploadedAt: row.updatedAt.toISOString(), ...summarise(row.geoJson) };
}

async function workLimitOf(project: ProjectView): Promise<LonLatLimit | null> {
  const row = await findProject(project.id);
  return row?.workLimitGeoJson ? (JSON.parse(row.workLimitGeoJson) as LonLatLimit) : null;
}

const fileNameOf = (name: string) => name.replace(/[\\/]/g, "_").replace(/[^\x20-\x7e]/g, "_").slice(0, 255) || "shoreline.geojson";

/** Checks and stores a shoreline, replacing any earlier one; an audit entry records which. A shoreline that fails the check is a ValidationError. */
export async function saveShoreline(project: ProjectView, user: UserView, fileName: string, text: string, ip: string | null = null) {
  const check = checkShoreline(text, await workLimitOf(project));
  if (!check.ok) throw new ValidationError({ field: "shoreline", message: check.error });
  const name = fileNameOf(fileName);
  const geoJson = JSON.stringify(check.collection);
  let replaced: string | null = null;
  await getSequelize().transaction(async (transaction) => {
    const existing = await Shoreline.findOne({ where: { projectId: project.id }, transaction });
    replaced = existing?.fileName ?? null;
    if (existing) await existing.update({ geoJson, fileName: name, uploadedById: user.id }, { transaction });
    else await Shoreline.create({ projectId: project.id, geoJson, fileName: name, uploadedById: user.id }, { transaction });
    await recordAudit(
      {
        action: existing ? AUDIT_ACTIONS.shorelineReplaced : AUDIT_ACTIONS.shorelineUploaded,
        projectId: project.id, userId: user.id, ip,
        detail: { fileName: name, polygons: check.polygons, vertices: check.vertices, ...(replaced ? { replaced } : {}) },
      },
      transaction,
    );
  });
  return { replaced, polygons: check.polygons, vertices: check.vertices, fileName: name };
}

/** Removes the shoreline; false when there was none. */
export async function removeShoreline(project: ProjectView, user: UserView, ip: string | null = null): Promise<boolean> {
  return getSequelize().transaction(async (transaction) => {
    const existing = await Shoreline.findOne({ where: { projectId: project.id }, transaction });
    if (!existing) return false;
    await existing.destroy({ transaction });
    await recordAudit({ action: AUDIT_ACTIONS.shorelineRemoved, projectId: project.id, userId: user.id, ip, detail: { fileName: existing.fileName } }, transaction);
    return true;
  });
}
