import { describe, expect, it } from "vitest";
import { nodePosition, rasterizeTin } from "./raster";
import { triangulate } from "./triangulate";

describe("rasterizeTin", () => {
  const plane = (x: number, y: number) => 512.25 - 0.0375 * (x - 640000) + 0.0125 * (y - 1300000);

  it("reproduces a plane at every node inside the TIN (1e-9 relative) and leaves the rest NaN", () => {
    // Scattered soundings in state-plane-sized coordinates over a plane.
    const easting: number[] = [];
    const northing: number[] = [];
    for (let index = 0; index < 300; index++) {
      easting.push(640000 + ((index * 37) % 101) + (index % 7) * 0.13);
      northing.push(1300000 + ((index * 53) % 97) + (index % 5) * 0.29);
    }
    const elevation = easting.map((x, index) => plane(x, northing[index]));
    const tin = triangulate(easting, northing, elevation, { maxEdge: Infinity });
    const grid = { originX: 639990, originY: 1299990, spacing: 1, cols: 130, rows: 130 };
    const raster = rasterizeTin(tin, grid);
    let inside = 0;
    for (let row = 0; row < grid.rows; row++) {
      for (let col = 0; col < grid.cols; col++) {
        const value = raster.values[row * grid.cols + col];
        const [x, y] = nodePosition(grid, col, row);
        if (Number.isNaN(value)) continue;
        inside++;
        const exact = plane(x, y);
        // computed: linear interpolation reproduces a plane exactly.
        expect(Math.abs(value - exact) / Math.abs(exact)).toBeLessThan(1e-9);
      }
    }
    expect(inside).toBeGreaterThan(8000);
    // A node far outside the soundings stays NaN: no surface is invented there.
    expect(Number.isNaN(raster.values[0])).toBe(true);
  });

  it("keeps masked-out nodes NaN and can store float32", () => {
    const tin = triangulate([0, 10, 10, 0], [0, 0, 10, 10], [1, 1, 1, 1], { maxEdge: Infinity });
    const grid = { originX: 0, originY: 0, spacing: 1, cols: 10, rows: 10 };
    const mask = new Uint8Array(100).fill(1);
    mask[55] = 0;
    const raster = rasterizeTin(tin, grid, { mask, precision: "float32" });
    expect(raster.values).toBeInstanceOf(Float32Array);
    expect(Number.isNaN(raster.values[55])).toBe(true);
    expect(Array.from(raster.values).filter((value) => value === 1)).toHaveLength(99); // computed: 100 nodes − 1 masked
  });
});
