import { cellCentroid, cellIndex, createCellGrid, type CellGrid } from "../../shared/grid/cell-grid";
import { isInsideWorkLimit } from "../../shared/grid/work-limit";
import { CELL_STATUSES, type CellStatus } from "../../shared/cell-status";
import { presentCellsPayload, presentStoredCellFigures, type CellDetail, type CellsPayload } from "./cells-presenter";
export type { CellDetail } from "./cells-presenter";
import { CellResult, Project, SurveySnapshot, Zone } from "~/lib/db.server";
import { createHash } from "node:crypto";
import { getProjectSurfaces, projectRecomputeStamp } from "~/lib/engine/engine-state.server";
import { BoundedCache } from "~/lib/cache/bounded-cache";
import { precompress, type PrecompressedBody } from "~/lib/http/precompressed.server";
import { resolveCrsDefinition } from "~/lib/geo/epsg.server";
import { loadProjectGeometry } from "~/lib/engine/project-geometry.server";
import type { ProjectView } from "~/lib/auth/project-view.server";

export type { CellsPayload } from "./cells-presenter";

/**
 * What the cells payload depends on, hashed: the recompute stamp, the zones (names, order) and the
 * project settings that shape the grid. Cheap (four small queries), so the map can poll it.
 */
export async function cellsVersion(project: ProjectView): Promise<string> {
  const [stamp, row, zones] = await Promise.all([
    projectRecomputeStamp(project.id),
    // The work limit is not in the view; its edits touch the project row.
    Project.findByPk(project.id, { attributes: ["updatedAt"], raw: true }),
    Zone.findAll({ where: { projectId: project.id }, attributes: ["id", "name", "sortOrder", "updatedAt"], order: [["id", "ASC"]], raw: true }),
  ]);
  const zoneText = zones.map((zone) => `${zone.id}/${zone.name}/${zone.sortOrder}/${new Date(zone.updatedAt).getTime()}`).join(",");
  const settings = `${JSON.stringify(project)}|${row ? new Date(row.updatedAt).getTime() : 0}`;
  return createHash("sha256").update(`${stamp}|${zoneText}|${settings}`).digest("base64url").slice(0, 22);
}

export async function projectCellGrid(project: ProjectView): Promise<CellGrid | null> {
  const geometry = await loadProjectGeometry(project.id);
  if (!geometry.workLimit) return null;
  const { settings } = geometry;
  return createCellGrid(geometry.workLimit, {
    cellSize: settings.cellSize,
    originX: settings.originX,
    originY: settings.originY,
    rotationDegrees: settings.rotationDegrees,
  });
}

// The serialised payload per project and cells version: reading and shaping a 100,000-cell bay's
// rows takes 0.6–0.75 s, and every member's map reads the same payload until the next recompute.
// A few projects' worth (about 3 MB of JSON each at bay scale).
// Kept with its gzip, so 50 members polling the map cost no compression each.
const payloadCache = new BoundedCache<PrecompressedBody>(4);

/** `getCellsPayload` as JSON text and its gzip, cached under the version (`cellsVersion`) it was read at. */
export function getCellsPayloadBody(project: ProjectView, version: string): Promise<PrecompressedBody> {
  return payloadCache.getOrCompute(`${project.id}:${version}`, async () => precompress(JSON.stringify(await getCellsPayload(project))));
}

export async function getCellsPayload(project: ProjectView): Promise<CellsPayload> {
  const grid = await projectCellGrid(project);
  const zones = await Zone.findAll({ where: { projectId: project.id }, order: [["sortOrder", "ASC"], ["id", "ASC"]], attributes: ["id", "name"] });
  const cells = grid
    ? await CellResult.findAll({
        where: { projectId: project.id },
        attributes: ["row", "col", "status", "meanRemainingThickness", "removedVolume", "remainingVolume", "plannedVolume", "coverage", "zoneId", "computedAt"],
        raw: true,
      })
    : [];
  const payload = presentCellsPayload({
    projectId: project.id,
    crs: { code: project.crs, definition: resolveCrsDefinition(project.crs).definition },
    lengthUnit: project.lengthUnit,
    grid,
    zones: zones.map((row) => ({ id: row.id, name: row.name })),
    cells,
  });
  if (grid && cells.length === 0) await markCellsInLimit(project, grid, payload.status);
  return payload;
}

/** Before the first computation, every cell whose centre lies inside the work limit is `no-data`. */
async function markCellsInLimit(project: ProjectView, grid: CellGrid, status: number[]) {
  const geometry = await loadProjectGeometry(project.id);
  if (!geometry.workLimit) return;
  const noData = CELL_STATUSES.indexOf("no-data");
  for (let localRow = 0; localRow < grid.rows; localRow++) {
    for (let localCol = 0; localCol < grid.cols; localCol++) {
      const [easting, northing] = cellCentroid(grid, grid.firstRow + localRow, grid.firstCol + localCol);
      if (isInsideWorkLimit(geometry.workLimit, easting, northing)) status[localRow * grid.cols + localCol] = noData;
    }
  }
}
