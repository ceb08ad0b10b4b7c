import { describe, expect, it } from "vitest";
import { spatialOrder } from "./spatial-order";

describe("spatialOrder", () => {
  it("is a permutation that visits a 4 × 4 lattice quadrant by quadrant (Z order)", () => {
    const x: number[] = [];
    const y: number[] = [];
    for (let row = 3; row >= 0; row--) for (let col = 3; col >= 0; col--) { x.push(col); y.push(row); }
    const order = Array.from(spatialOrder(Float64Array.from(x), Float64Array.from(y)));
    expect([...order].sort((a, b) => a - b)).toEqual([...Array(16).keys()]); // invariant: each point once
    // practice (Morton order): the first four points are the south-west 2 × 2 block.
    const firstFour = order.slice(0, 4).map((index) => [x[index], y[index]]);
    expect(firstFour).toEqual([[0, 0], [1, 0], [0, 1], [1, 1]]);
  });

  it("orders only the given subset, returning original indices", () => {
    const order = spatialOrder(Float64Array.of(5, 0, 9, 1), Float64Array.of(5, 0, 9, 1), Uint32Array.of(2, 3, 1));
    expect(Array.from(order)).toEqual([1, 3, 2]);
  });
});
