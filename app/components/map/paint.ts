import { MAP_STATUSES, STATUS_COLOURS, STATUS_LABELS, coolRamp, sedimentRamp } from "../../../shared/palette";
import type { CellsData } from "./cell-features";

export type MapView = "status" | "thickness" | "removed";

export interface LegendEntry {
  colour: string;
  label: string;
}

/** Remaining-thickness steps (project length unit): the tolerance, then steps a crew acts on (practice). */
function thicknessSteps(data: CellsData): number[] {
  return data.lengthUnit === "m" ? [0.08, 0.15, 0.3, 0.6, 0.9, 1.2] : [0.25, 0.5, 1, 2, 3, 4];
}

/** Removed-volume steps: five equal parts of the largest cell's removal, rounded to whole units. */
function removedSteps(data: CellsData): number[] {
  let largest = 0;
  for (let index = 0; index < data.removedVolume.length; index++) if (data.status[index] >= 0 && data.removedVolume[index] > largest) largest = data.removedVolume[index];
  const step = Math.max(1, Math.ceil(largest / 5));
  return [0.5, step, step * 2, step * 3, step * 4];
}

export function fillColour(view: MapView, data: CellsData): unknown {
  if (view === "status") {
    return ["match", ["get", "s"], ...MAP_STATUSES.flatMap((status, code) => [code, STATUS_COLOURS[status]]), STATUS_COLOURS["no-data"]];
  }
  const steps = view === "thickness" ? thicknessSteps(data) : removedSteps(data);
  const colours = view === "thickness" ? sedimentRamp(steps.length + 1) : coolRamp(steps.length + 1);
  const property = view === "thickness" ? "t" : "r";
  const stepExpression: unknown[] = ["step", ["get", property], colours[0]];
  steps.forEach((step, index) => stepExpression.push(step, colours[index + 1]));
  return ["case", ["==", ["get", "s"], 0], STATUS_COLOURS["no-data"], view === "thickness" ? ["<", ["get", "t"], 0] : false, STATUS_COLOURS["no-data"], stepExpression];
}

export function legendFor(view: MapView, data: CellsData): LegendEntry[] {
  if (view === "status") return MAP_STATUSES.map((status) => ({ colour: STATUS_COLOURS[status], label: STATUS_LABELS[status] }));
  const steps = view === "thickness" ? thicknessSteps(data) : removedSteps(data);
  const colours = view === "thickness" ? sedimentRamp(steps.length + 1) : coolRamp(steps.length + 1);
  const unit = view === "thickness" ? data.labels.length : data.labels.volume;
  const entries = colours.map((colour, index) => {
    const lower = index === 0 ? null : steps[index - 1];
    const upper = index < steps.length ? steps[index] : null;
    const label = lower === null ? `under ${upper} ${unit}` : upper === null ? `${lower} ${unit} and more` : `${lower} to ${upper} ${unit}`;
    return { colour, label };
  });
  return [...entries, { colour: STATUS_COLOURS["no-data"], label: "No data" }];
}

/** Band fill by the band's lower bound, light to dark. */
export function bandColour(surface: "remaining" | "depth", lowers: number[]): unknown {
  const sorted = [...new Set(lowers)].sort((a, b) => a - b);
  const colours = surface === "remaining" ? sedimentRamp(sorted.length + 1) : coolRamp(sorted.length + 1);
  const expression: unknown[] = ["step", ["coalesce", ["get", "lower"], -1e9], colours[0]];
  sorted.forEach((lower, index) => expression.push(lower, colours[index + 1]));
  return sorted.length === 0 ? colours[0] : expression;
}
