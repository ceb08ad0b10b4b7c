import { cellIndex, parseCellLabel } from "../../shared/grid/cell-grid";
import { CELL_STATUSES } from "../../shared/cell-status";
import { CellResult, SurveySnapshot, Zone } from "~/lib/db.server";
import { getProjectSurfaces } from "~/lib/engine/engine-state.server";
import type { ProjectView } from "~/lib/auth/project-view.server";
import { cellAssignments } from "./assignments.server";
import { presentStoredCellFigures, type CellDetail } from "./cells-presenter";

/** One cell's figures, soundings, history across survey dates and its assignments; null when the cell has no figures. */
export async function getCellDetail(project: ProjectView, label: string): Promise<CellDetail | null> {
  const position = parseCellLabel(label);
  if (!position) return null;
  const cell = await CellResult.findOne({ where: { projectId: project.id, row: position.row, col: position.col }, include: [{ model: Zone, as: "zone", attributes: ["name"] }] });
  if (!cell) return null;
  const snapshots = await SurveySnapshot.findAll({ where: { projectId: project.id }, order: [["surveyedOn", "ASC"]] });
  const history = snapshots.map((snapshot) => {
    const localRow = position.row - snapshot.firstRow, localCol = position.col - snapshot.firstCol;
    const inside = localRow >= 0 && localRow < snapshot.cellRows && localCol >= 0 && localCol < snapshot.cellCols;
    const index = localRow * snapshot.cellCols + localCol;
    const float = (blob: Buffer) => (inside ? Number(blob.readFloatLE(index * 4).toFixed(1)) : 0);
    const code = inside ? snapshot.statuses[index] : 255;
    return { date: snapshot.surveyedOn, remainingVolume: float(snapshot.remainingVolumes), removedVolume: float(snapshot.removedVolumes), status: CELL_STATUSES[code] ?? null };
  });
  const surfaces = await getProjectSurfaces(project.id);
  const engineIndex = surfaces ? cellIndex(surfaces.result.cellGrid, position.row, position.col) : -1;
  const depth = engineIndex >= 0 ? surfaces!.cellMaxDepth[engineIndex] : Number.NaN;
  return {
    ...presentStoredCellFigures(cell),
    zone: (cell as CellResult & { zone?: Zone | null }).zone?.name ?? null,
    soundings: engineIndex >= 0 ? surfaces!.soundingsPerCell[engineIndex] : null,
    workingDepth: Number.isFinite(depth) ? Math.round(depth * 100) / 100 : null,
    history,
    assignments: await cellAssignments(project, cell.row, cell.col),
  };
}
