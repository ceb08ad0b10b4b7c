/**
 * The five states of a cell, declared once for the engine, the database, the API and the map.
 * The order runs from "nothing known" to "proven done"; a status's code is its index here (the
 * engine's status arrays, the stored snapshots and the /api cells arrays all use these codes).
 * The cell statistics decide the first four from the surfaces; `confirmed` is `at-firm-sand`
 * proven by a closeout survey, which only the project figures (that know each survey's kind) decide.
 */
export const CELL_STATUSES = ["no-data", "untouched", "in-work", "at-firm-sand", "confirmed"] as const;
export type CellStatus = (typeof CELL_STATUSES)[number];

/** The statuses the surfaces alone decide (all but `confirmed`). */
export type MeasuredCellStatus = Exclude<CellStatus, "confirmed">;

export const cellStatusCode: Record<CellStatus, number> = { "no-data": 0, untouched: 1, "in-work": 2, "at-firm-sand": 3, confirmed: 4 };
