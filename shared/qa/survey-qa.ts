import { createCellGrid, fromGridFrame } from "../grid/cell-grid";
import { isInsideWorkLimit, type ProjectedMultiPolygon } from "../grid/work-limit";
import { crossingDifferences, linesByHeading } from "./crossings";
import { soundingDensity } from "./density";
import { findSpikes } from "./spikes";
import { allowedTvu, type SurveyOrder } from "./tvu";
import type { LengthUnit } from "../units";
import { finiteValues } from "../typed/finite";

/**
 * The QA figures shown before a commit and kept with the survey: soundings per cell over the work
 * limit, spikes against neighbours, and crossing-line differences against the IHO S-44 ed. 6.0.0
 * TVU allowance of the chosen order. Pure: project-coordinate arrays in, plain figures out.
 */
export interface SurveyQa {
  order: SurveyOrder;
  /** Fewest soundings a cell needs to count as well sounded (practice: four, one per quarter). */
  minimumPerCell: number;
  cellsInLimit: number;
  cellsWithSoundings: number;
  /** Cells with soundings but fewer than the minimum. */
  sparseCells: number;
  medianPerCell: number | null;
  /** cellsWithSoundings ÷ cellsInLimit. */
  coverage: number | null;
  spikes: { count: number; rows: number[]; threshold: number; radius: number; unjudged: number };
  crossings: { comparisons: number; withinAllowanceShare: number | null; meanDifference: number | null; rmsDifference: number | null; radius: number };
  /** TVU allowance at the survey's median depth (project length unit). */
  allowanceAtMedianDepth: number | null;
  medianDepth: number | null;
}

export interface SurveyQaInput {
  easting: Float64Array;
  northing: Float64Array;
  /** Water depth (project unit), NaN where the file gives only elevations. */
  depth: Float64Array;
  elevation: Float64Array;
  sourceRow: Uint32Array;
  workLimit: ProjectedMultiPolygon | null;
  grid: { cellSize: number; originX: number; originY: number; rotationDegrees: number };
  unit: LengthUnit;
  order: SurveyOrder;
}

export const MINIMUM_SOUNDINGS_PER_CELL = 4;
/** Neighbours a spike is judged against (practice). */
export const SPIKE_NEIGHBOURS = 12;

function medianOf(values: ArrayLike<number>): number | null {
  // A typed copy, sorted in place (numerically): no list of a million numbers grown by pushes.
  const finite = finiteValues(values).sort();
  return finite.length === 0 ? null : finite[Math.floor(finite.length / 2)];
}

const nullable = (value: number) => (Number.isFinite(value) ? value : null);

export function surveyQa(input: SurveyQaInput): SurveyQa {
  const { easting, northing, unit, order } = input;
  const medianDepth = medianOf(input.depth);
  const allowance = medianDepth === null ? null : allowedTvu(order, medianDepth, unit);

  let cellsInLimit = 0;
  let cellsWithSoundings = 0;
  let sparse = 0;
  let medianPerCell: number | null = null;
  if (input.workLimit && easting.length > 0) {
    const cellGrid = createCellGrid(input.workLimit, input.grid);
    const [originX, originY] = fromGridFrame(cellGrid, cellGrid.firstCol * cellGrid.cellSize, cellGrid.firstRow * cellGrid.cellSize);
    const density = soundingDensity(easting, northing, {
      originX, originY, cellSize: cellGrid.cellSize, cols: cellGrid.cols, rows: cellGrid.rows, rotationDegrees: cellGrid.rotationDegrees,
    });
    const perCell: number[] = [];
    for (let row = 0; row < cellGrid.rows; row++) {
      for (let col = 0; col < cellGrid.cols; col++) {
        const [x, y] = fromGridFrame(cellGrid, (cellGrid.firstCol + col + 0.5) * cellGrid.cellSize, (cellGrid.firstRow + row + 0.5) * cellGrid.cellSize);
        if (!isInsideWorkLimit(input.workLimit, x, y)) continue;
        cellsInLimit++;
        const count = density.counts[row * cellGrid.cols + col];
        if (count > 0) {
          cellsWithSoundings++;
          perCell.push(count);
          if (count < MINIMUM_SOUNDINGS_PER_CELL) sparse++;
        }
      }
    }
    medianPerCell = medianOf(perCell);
  }

  // Spikes: a sounding more than the TVU allowance from the median of its neighbours. The radius
  // takes about a dozen neighbours at the survey's own density (never more than half a cell), so
  // dense echo-sounder files cost no more per sounding than sparse rod surveys.
  const sounded = cellsWithSoundings * input.grid.cellSize * input.grid.cellSize;
  const density = sounded > 0 ? easting.length / sounded : 0;
  const spikeRadius = density > 0 ? Math.min(input.grid.cellSize / 2, Math.sqrt(SPIKE_NEIGHBOURS / (Math.PI * density))) : input.grid.cellSize / 2;
  const spikeThreshold = allowance ?? Number.POSITIVE_INFINITY;
  const spikes = easting.length > 0 && Number.isFinite(spikeThreshold)
    ? findSpikes(easting, northing, input.elevation, { radius: spikeRadius, threshold: spikeThreshold })
    : { indices: new Uint32Array(0), differences: new Float64Array(0), unjudged: easting.length };

  // Crossings: lines found from the track; soundings of different lines within a tenth of a cell compared.
  const crossingRadius = input.grid.cellSize / 10;
  const depthForCrossings = Number.isFinite(medianDepth ?? Number.NaN) ? input.depth : input.elevation.map((value) => -value);
  let crossings: SurveyQa["crossings"] = { comparisons: 0, withinAllowanceShare: null, meanDifference: null, rmsDifference: null, radius: crossingRadius };
  if (easting.length > 1) {
    const lineIds = linesByHeading(easting, northing, { maxGap: input.grid.cellSize });
    const result = crossingDifferences(easting, northing, depthForCrossings, lineIds, { radius: crossingRadius, order, unit });
    crossings = {
      comparisons: result.first.length,
      withinAllowanceShare: nullable(result.withinAllowanceShare),
      meanDifference: nullable(result.meanDifference),
      rmsDifference: nullable(result.rmsDifference),
      radius: crossingRadius,
    };
  }

  return {
    order,
    minimumPerCell: MINIMUM_SOUNDINGS_PER_CELL,
    cellsInLimit,
    cellsWithSoundings,
    sparseCells: sparse,
    medianPerCell,
    coverage: cellsInLimit > 0 ? cellsWithSoundings / cellsInLimit : null,
    spikes: {
      count: spikes.indices.length,
      rows: Array.from(spikes.indices.slice(0, 200), (index) => input.sourceRow[index]),
      threshold: spikeThreshold,
      radius: spikeRadius,
      unjudged: spikes.unjudged,
    },
    crossings,
    allowanceAtMedianDepth: allowance,
    medianDepth,
  };
}
