import { describe, expect, it } from "vitest";
import { CELL_STATUSES, cellStatusCode } from "./cell-status";
import { STATUS_COLOURS, STATUS_LABELS } from "./palette";

describe("cell statuses", () => {
  it("give each status its index as its code (the stored snapshots and the /api arrays hold codes)", () => {
    // invariant: the code table and the list are two views of one order.
    expect(Object.entries(cellStatusCode).sort(([, a], [, b]) => a - b).map(([status]) => status)).toEqual([...CELL_STATUSES]);
  });

  it("have a colour and a label each on the map", () => {
    expect(Object.keys(STATUS_COLOURS).sort()).toEqual([...CELL_STATUSES].sort());
    expect(Object.keys(STATUS_LABELS).sort()).toEqual([...CELL_STATUSES].sort());
  });
});
