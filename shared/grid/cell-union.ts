import { fromGridFrame, type CellGrid } from "./cell-grid";
import type { Position, ProjectedMultiPolygon, Ring } from "./work-limit";

/**
 * The outline of a set of grid cells: the union of their squares, as polygons in project
 * coordinates (a zone made from cells selected on the map). Worked out exactly on the grid's own
 * lines, not by a polygon clipper: every side of a chosen cell whose neighbour across it is not
 * chosen is a boundary edge, directed so the chosen side lies to its left; the edges are then
 * joined into rings. Where two chosen cells touch only at a corner, the walk turns left, so each
 * ring stays simple (two squares meeting at a point are two polygons, a gap meeting the outside
 * at a corner is no hole). Outer rings run counter-clockwise, holes clockwise (RFC 7946); each
 * hole goes with the smallest outer ring around it; straight runs are one edge (corners only).
 */
export function cellsOutline(grid: Pick<CellGrid, "originX" | "originY" | "rotationDegrees" | "cellSize">, cells: ReadonlyArray<{ row: number; col: number }>): ProjectedMultiPolygon {
  const key = (row: number, col: number) => `${row}:${col}`;
  const chosen = new Set(cells.map((cell) => key(cell.row, cell.col)));
  // Boundary edges in grid units (x = column line, y = row line), by their start corner.
  const outgoing = new Map<string, Array<[number, number]>>();
  const addEdge = (x0: number, y0: number, x1: number, y1: number) => {
    const start = key(y0, x0);
    const list = outgoing.get(start);
    if (list) list.push([x1, y1]);
    else outgoing.set(start, [[x1, y1]]);
  };
  for (const id of chosen) {
    const [row, col] = id.split(":").map(Number);
    if (!chosen.has(key(row - 1, col))) addEdge(col, row, col + 1, row);
    if (!chosen.has(key(row, col + 1))) addEdge(col + 1, row, col + 1, row + 1);
    if (!chosen.has(key(row + 1, col))) addEdge(col + 1, row + 1, col, row + 1);
    if (!chosen.has(key(row, col - 1))) addEdge(col, row + 1, col, row);
  }

  const rings: Array<Array<[number, number]>> = [];
  for (const [startKey, ends] of outgoing) {
    while (ends.length > 0) {
      const [startY, startX] = startKey.split(":").map(Number);
      const ring: Array<[number, number]> = [[startX, startY]];
      let [x, y] = ends.pop()!;
      let dx = x - startX, dy = y - startY;
      while (x !== startX || y !== startY) {
        ring.push([x, y]);
        const choices = outgoing.get(key(y, x))!;
        // One way on, or two at a corner two cells share: the left turn (cross product > 0).
        let pick = 0;
        if (choices.length > 1) {
          const left = choices.findIndex(([nx, ny]) => dx * (ny - y) - dy * (nx - x) > 0);
          if (left >= 0) pick = left;
        }
        const [nextX, nextY] = choices.splice(pick, 1)[0];
        dx = nextX - x; dy = nextY - y;
        x = nextX; y = nextY;
      }
      rings.push(withoutStraightRuns(ring));
    }
  }

  const signedArea = (ring: Array<[number, number]>) => {
    let sum = 0;
    for (let index = 0; index < ring.length; index++) {
      const [x0, y0] = ring[index];
      const [x1, y1] = ring[(index + 1) % ring.length];
      sum += x0 * y1 - x1 * y0;
    }
    return sum / 2;
  };
  const outers = rings.filter((ring) => signedArea(ring) > 0).map((ring) => ({ ring, area: signedArea(ring), holes: [] as Array<Array<[number, number]>> }));
  for (const hole of rings.filter((ring) => signedArea(ring) < 0)) {
    // A point surely inside the hole: the middle of the unchosen cell right of its first edge.
    const [x0, y0] = hole[0];
    const [x1, y1] = hole[1];
    const length = Math.hypot(x1 - x0, y1 - y0);
    const ux = (x1 - x0) / length, uy = (y1 - y0) / length;
    const probe: [number, number] = [x0 + ux * 0.5 + uy * 0.5, y0 + uy * 0.5 - ux * 0.5];
    const holder = outers.filter((outer) => insideRing(probe, outer.ring)).sort((a, b) => a.area - b.area)[0];
    holder?.holes.push(hole);
  }
  const toProject = (ring: Array<[number, number]>): Ring => {
    const positions = ring.map(([x, y]) => fromGridFrame(grid, x * grid.cellSize, y * grid.cellSize) as Position);
    positions.push([positions[0][0], positions[0][1]]);
    return positions;
  };
  return outers.map((outer) => [toProject(outer.ring), ...outer.holes.map(toProject)]);
}

/** Drops corners where the ring goes straight on (open ring, no closing repeat). */
function withoutStraightRuns(ring: Array<[number, number]>): Array<[number, number]> {
  return ring.filter((point, index) => {
    const previous = ring[(index + ring.length - 1) % ring.length];
    const next = ring[(index + 1) % ring.length];
    return (point[0] - previous[0]) * (next[1] - point[1]) - (point[1] - previous[1]) * (next[0] - point[0]) !== 0;
  });
}

function insideRing([x, y]: [number, number], ring: Array<[number, number]>): boolean {
  let inside = false;
  for (let index = 0, previous = ring.length - 1; index < ring.length; previous = index++) {
    const [xi, yi] = ring[index];
    const [xj, yj] = ring[previous];
    if (yi > y !== yj > y && x < ((xj - xi) * (y - yi)) / (yj - yi) + xi) inside = !inside;
  }
  return inside;
}
