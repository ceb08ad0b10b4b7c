import { Color, createExpression } from "@maplibre/maplibre-gl-style-spec";
import { describe, expect, it } from "vitest";
import { cellCentroid, createCellGrid } from "../../../shared/grid/cell-grid";
import { createCrs } from "../../../shared/crs";
import { buildCellFeatures, type CellsData } from "./cell-features";
import { cellImageCorners, cellIndexAtLonLat, inLimitCellCount, paintCellImage } from "./cell-image";
import { cellColour, fillColour, type MapView } from "./paint";

// An invented basin in UTM zone 17N (metres), a 7 × 5 grid of 10 m cells turned 20°.
const UTM17 = "+proj=utm +zone=17 +ellps=GRS80 +towgs84=0,0,0,0,0,0,0 +units=m +no_defs";
const E0 = 343_000, N0 = 3_198_000;

function basin(): CellsData {
  const grid = createCellGrid([[[[E0, N0], [E0 + 70, N0], [E0 + 70, N0 + 50], [E0, N0 + 50], [E0, N0]]]], { cellSize: 10, originX: E0, originY: N0, rotationDegrees: 20 });
  const count = grid.cols * grid.rows;
  // Every status, thickness and removed value spread over the cells; two cells outside the limit.
  const status = Array.from({ length: count }, (_, index) => (index === 3 || index === count - 2 ? -1 : index % 5));
  return {
    projectId: 1, crs: { code: "EPSG:26917", definition: UTM17 }, lengthUnit: "m", labels: { length: "m", volume: "m³" }, grid,
    statuses: ["no-data", "untouched", "in-work", "at-firm-sand", "confirmed"], zones: [], computedAt: null, status,
    // Some values exactly on a step (0.3 m of thickness, 0.5 m³ removed): a step includes its lower bound.
    remainingThickness: Array.from({ length: count }, (_, index) => (index % 7 === 0 ? null : index % 7 === 1 ? 0.3 : (index % 11) * 0.11)),
    removedVolume: Array.from({ length: count }, (_, index) => (index % 6 === 1 ? 0.5 : (index * 3.7) % 40)),
    remainingVolume: new Array(count).fill(0), plannedVolume: new Array(count).fill(0), coverage: new Array(count).fill(1), zone: new Array(count).fill(-1),
  } as unknown as CellsData;
}

describe("the quick-look image of the cells", () => {
  for (const view of ["status", "thickness", "removed"] as MapView[]) {
    it(`${view}: each cell's colour is what MapLibre's own expression evaluator gives its feature`, () => {
      const data = basin();
      const expression = createExpression(fillColour(view, data), { type: "color", "property-type": "data-driven", expression: { interpolated: false, parameters: ["zoom", "feature"] } } as never);
      if (expression.result !== "success") throw new Error(JSON.stringify(expression.value));
      const colourOf = cellColour(view, data);
      const features = buildCellFeatures(data).features;
      expect(features.length).toBe(inLimitCellCount(data));
      for (const feature of features) {
        const evaluated = Color.parse(expression.value.evaluate({ zoom: 16 }, { type: "Polygon", properties: feature.properties } as never) as string | Color);
        const drawn = Color.parse(colourOf(feature.id as number));
        expect(evaluated, `cell ${feature.id}`).toBeDefined();
        expect([drawn!.r, drawn!.g, drawn!.b, drawn!.a]).toEqual([evaluated!.r, evaluated!.g, evaluated!.b, evaluated!.a]);
      }
    });
  }

  it("puts one pixel per cell, the grid's last row on top, and leaves cells outside the limit transparent", () => {
    const data = basin();
    const grid = data.grid!;
    const image = paintCellImage(data, () => "#102030");
    expect([image.width, image.height]).toEqual([grid.cols, grid.rows]);
    const alpha = (localRow: number, localCol: number) => image.pixels[((grid.rows - 1 - localRow) * grid.cols + localCol) * 4 + 3];
    expect(alpha(0, 3)).toBe(0); // index 3 is outside
    expect(alpha(0, 2)).toBe(255);
    expect(Array.from(image.pixels.slice(((grid.rows - 1) * grid.cols) * 4, ((grid.rows - 1) * grid.cols) * 4 + 4))).toEqual([16, 32, 48, 255]);
  });

  it("leaves the cells of other zones transparent when a zone is chosen (as the shapes' zone filter does)", () => {
    const data = basin();
    const zone = data.zone.map((_, index) => (index % 3 === 0 ? 0 : 1));
    const zoned = { ...data, zone } as CellsData;
    const grid = data.grid!;
    const image = paintCellImage(zoned, () => "#102030", 1);
    for (let index = 0; index < zone.length; index++) {
      const alpha = image.pixels[((grid.rows - 1 - Math.floor(index / grid.cols)) * grid.cols + (index % grid.cols)) * 4 + 3];
      expect(alpha, `cell ${index}`).toBe(data.status[index] >= 0 && zone[index] === 1 ? 255 : 0);
    }
  });

  it("lays the image on the grid's outer corners and finds the cell under a point (round trip through proj4)", () => {
    const data = basin();
    const grid = data.grid!;
    const crs = createCrs(UTM17);
    const [topLeft, , bottomRight, bottomLeft] = cellImageCorners(data);
    // Bottom left is the outer corner of the first row and column: turned 20° about the origin.
    const along = grid.firstCol * grid.cellSize, across = grid.firstRow * grid.cellSize;
    const radians = (20 * Math.PI) / 180;
    const corner = crs.toLonLat(E0 + along * Math.cos(radians) - across * Math.sin(radians), N0 + along * Math.sin(radians) + across * Math.cos(radians));
    expect(bottomLeft[0]).toBeCloseTo(corner[0], 9);
    expect(bottomLeft[1]).toBeCloseTo(corner[1], 9);
    expect(topLeft[1]).toBeGreaterThan(bottomLeft[1]);
    expect(bottomRight[0]).toBeGreaterThan(bottomLeft[0]);
    for (let index = 0; index < data.status.length; index++) {
      const [x, y] = cellCentroid(grid, Math.floor(index / grid.cols) + grid.firstRow, (index % grid.cols) + grid.firstCol);
      const [lon, lat] = crs.toLonLat(x, y);
      expect(cellIndexAtLonLat(data, lon, lat)).toBe(data.status[index] >= 0 ? index : -1);
    }
    expect(cellIndexAtLonLat(data, topLeft[0] - 0.01, topLeft[1])).toBe(-1);
  });
});
