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

/** A number as JSON.stringify writes it (NaN and ±Infinity as null). */
function jsonNumber(value: number): string {
  return Number.isFinite(value) ? String(value) : "null";
}

/**
 * `JSON.stringify(volumeReport(result, unit))`, character for character, written straight from
 * the engine's per-cell arrays: no object per cell (a large bay has about 100,000 of them). The
 * command line prints this; a test holds it to the object form.
 */
export function volumeReportJson(result: EngineResult, unit: LengthUnit): string {
  const parts: string[] = [];
  writeVolumeReportJson(result, unit, (part) => parts.push(part));
  return parts.join("");
}

/** `volumeReportJson` piece by piece (about 64 KB each), so a caller can write it out as it goes. */
export function writeVolumeReportJson(result: EngineResult, unit: LengthUnit, write: (part: string) => void): void {
  const volume = (cubicLength: number) => jsonNumber(cubicToVolumeUnit(cubicLength, unit));
  const { cells, cellGrid, totals } = result;
  const head =
    `{"units":{"length":${JSON.stringify(unit)},"volume":${JSON.stringify(volumeUnitFor(unit))}},"totals":{` +
    `"plannedVolume":${volume(totals.plannedVolumeCubicLength)},"removedVolume":${volume(totals.removedVolumeCubicLength)},` +
    `"depositedVolume":${volume(totals.depositedVolumeCubicLength)},"remainingVolume":${volume(totals.remainingVolumeCubicLength)},` +
    `"cells":${jsonNumber(totals.cells)},"cellsAtFirmSand":${jsonNumber(totals.cellsAtFirmSand)}},"cells":[`;
  let chunk = head;
  let first = true;
  for (let cell = 0; cell < cells.count; cell++) {
    if (!(cells.areaInLimit[cell] > 0)) continue;
    const row = Math.floor(cell / cellGrid.cols) + cellGrid.firstRow;
    const col = (cell % cellGrid.cols) + cellGrid.firstCol;
    const thickness = cells.meanRemainingThickness[cell];
    chunk +=
      `${first ? "" : ","}{"row":${row},"col":${col},"label":${JSON.stringify(cellLabel(row, col))}` +
      `,"plannedVolume":${volume(cells.plannedVolumeCubicLength[cell])},"removedVolume":${volume(cells.removedVolumeCubicLength[cell])}` +
      `,"depositedVolume":${volume(cells.depositedVolumeCubicLength[cell])},"remainingVolume":${volume(cells.remainingVolumeCubicLength[cell])}` +
      `,"meanRemainingThickness":${Number.isNaN(thickness) ? "null" : jsonNumber(thickness)},"coverage":${jsonNumber(cells.coverage[cell])}` +
      `,"status":"${CELL_STATUSES[cells.status[cell]]}"}`;
    first = false;
    if (chunk.length > 1 << 16) {
      write(chunk);
      chunk = "";
    }
  }
  write(`${chunk}]}`);
}
