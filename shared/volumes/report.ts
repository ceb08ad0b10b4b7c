import { cellLabel, cellRowCol } from "../grid/cell-grid";
import { cubicToVolumeUnit, volumeUnitFor, type LengthUnit, type VolumeUnit } from "../units";
import type { EngineResult } from "../pipeline";
import { CELL_STATUSES, type MeasuredCellStatus } from "../cell-status";
import type { CellCounts, CellVolumes } from "./figure-totals";

/**
 * The plain-object shape of a volume computation, as the command line prints it and the app
 * shows it. Volumes are converted from the engine's cubic length unit to the project's volume
 * unit (cubic yards for feet projects, cubic metres for metre projects) here and only here.
 */
export interface CellReport extends CellVolumes {
  row: number;
  col: number;
  label: string;
  /** Project length unit; null when nothing in the cell was surveyed. */
  meanRemainingThickness: number | null;
  /** 0–1 share of the cell's in-limit area with data. */
  coverage: number;
  status: MeasuredCellStatus;
}

export interface VolumeReport {
  units: { length: LengthUnit; volume: VolumeUnit };
  totals: CellVolumes & Pick<CellCounts, "cells" | "cellsAtFirmSand">;
  cells: CellReport[];
}

export function volumeReport(result: EngineResult, unit: LengthUnit): VolumeReport {
  const volume = (cubicLength: number) => cubicToVolumeUnit(cubicLength, unit);
  const { cells, cellGrid, totals } = result;
  const rows: CellReport[] = [];
  for (let cell = 0; cell < cells.count; cell++) {
    if (!(cells.areaInLimit[cell] > 0)) continue; // grid cells wholly outside the work limit are not part of the job
    const { row, col } = cellRowCol(cellGrid, cell);
    const thickness = cells.meanRemainingThickness[cell];
    rows.push({
      row,
      col,
      label: cellLabel(row, col),
      plannedVolume: volume(cells.plannedVolumeCubicLength[cell]),
      removedVolume: volume(cells.removedVolumeCubicLength[cell]),
      depositedVolume: volume(cells.depositedVolumeCubicLength[cell]),
      remainingVolume: volume(cells.remainingVolumeCubicLength[cell]),
      meanRemainingThickness: Number.isNaN(thickness) ? null : thickness,
      coverage: cells.coverage[cell],
      status: CELL_STATUSES[cells.status[cell]] as MeasuredCellStatus,
    });
  }
  return {
    units: { length: unit, volume: volumeUnitFor(unit) },
    totals: {
      plannedVolume: volume(totals.plannedVolumeCubicLength),
      removedVolume: volume(totals.removedVolumeCubicLength),
      depositedVolume: volume(totals.depositedVolumeCubicLength),
      remainingVolume: volume(totals.remainingVolumeCubicLength),
      cells: totals.cells,
      cellsAtFirmSand: totals.cellsAtFirmSand,
    },
    cells: rows,
  };
}
