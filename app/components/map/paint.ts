import { CELL_STATUSES } from "../../../shared/cell-status";
import { STATUS_COLOURS, STATUS_LABELS, coolRamp, sedimentRamp } from "../../../shared/palette";
import type { CellsData } from "./cell-features";

export type MapView = "status" | "thickness" | "removed";

export interface LegendEntry {
  /** A CSS background: a colour, or a pattern for hatched marks. */
  colour: string;
  label: string;
  /** A CSS colour for an outlined mark's border. */
  outline?: string;
  /** The border is dashed (a zone's outline). */
  dashed?: boolean;
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

/** How a view colours a cell: by status code, or by steps of thickness ("t") or removed volume ("r"). */
type ColourRule = { property: "s" } | { property: "t" | "r"; steps: number[]; colours: string[] };

function colourRule(view: MapView, data: CellsData): ColourRule {
  if (view === "status") return { property: "s" };
  const steps = view === "thickness" ? thicknessSteps(data) : removedSteps(data);
  const colours = view === "thickness" ? sedimentRamp(steps.length + 1) : coolRamp(steps.length + 1);
  return { property: view === "thickness" ? "t" : "r", steps, colours };
}

/** The cells layer's fill colour as a MapLibre expression over the cell properties (cell-features.ts). */
export function fillColour(view: MapView, data: CellsData): unknown {
  const rule = colourRule(view, data);
  if (rule.property === "s") {
    return ["match", ["get", "s"], ...CELL_STATUSES.flatMap((status, code) => [code, STATUS_COLOURS[status]]), STATUS_COLOURS["no-data"]];
  }
  const stepExpression: unknown[] = ["step", ["get", rule.property], rule.colours[0]];
  rule.steps.forEach((step, index) => stepExpression.push(step, rule.colours[index + 1]));
  return ["case", ["==", ["get", "s"], 0], STATUS_COLOURS["no-data"], rule.property === "t" ? ["<", ["get", "t"], 0] : false, STATUS_COLOURS["no-data"], stepExpression];
}

/**
 * The same colours as `fillColour`, per grid index straight from the payload's arrays: for the
 * quick-look image drawn before MapLibre has tiled the cells (cell-image.ts).
 */
export function cellColour(view: MapView, data: CellsData): (index: number) => string {
  const rule = colourRule(view, data);
  const noData = STATUS_COLOURS["no-data"];
  if (rule.property === "s") return (index) => STATUS_COLOURS[CELL_STATUSES[data.status[index]]] ?? noData;
  const { steps, colours } = rule;
  return (index) => {
    if (data.status[index] === 0) return noData;
    const value = rule.property === "t" ? (data.remainingThickness[index] ?? -1) : data.removedVolume[index];
    if (rule.property === "t" && value < 0) return noData;
    let colour = colours[0];
    for (let step = 0; step < steps.length && value >= steps[step]; step++) colour = colours[step + 1];
    return colour;
  };
}

export function legendFor(view: MapView, data: CellsData): LegendEntry[] {
  if (view === "status") return CELL_STATUSES.map((status) => ({ colour: STATUS_COLOURS[status], label: STATUS_LABELS[status] }));
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

/** A band's bounds as the bands API gives them (null for an open end). */
export interface BandBounds {
  lower: number | null;
  upper: number | null;
}

/** Bands' colours by lower bound, light to dark: the one rule behind the fill and the legend. */
function bandRule(surface: "remaining" | "depth", bands: readonly BandBounds[]) {
  const lowers = [...new Set(bands.map((band) => band.lower ?? -1e9))].sort((a, b) => a - b);
  const colours = surface === "remaining" ? sedimentRamp(lowers.length + 1) : coolRamp(lowers.length + 1);
  const colourOf = (lower: number | null) => {
    let colour = colours[0];
    for (let index = 0; index < lowers.length && (lower ?? -1e9) >= lowers[index]; index++) colour = colours[index + 1];
    return colour;
  };
  return { lowers, colours, colourOf };
}

/** Band fill by the band's lower bound, light to dark. */
export function bandColour(surface: "remaining" | "depth", bands: readonly BandBounds[]): unknown {
  const { lowers, colours } = bandRule(surface, bands);
  const expression: unknown[] = ["step", ["coalesce", ["get", "lower"], -1e9], colours[0]];
  lowers.forEach((lower, index) => expression.push(lower, colours[index + 1]));
  return lowers.length === 0 ? colours[0] : expression;
}

/** The legend of the bands drawn: one entry per band, shallow to deep, in the project's length unit. */
export function bandLegend(surface: "remaining" | "depth", bands: readonly BandBounds[], unit: string): LegendEntry[] {
  const { colourOf } = bandRule(surface, bands);
  return [...bands]
    .sort((a, b) => (a.lower ?? -Infinity) - (b.lower ?? -Infinity))
    .map((band) => ({
      colour: colourOf(band.lower),
      label: band.lower === null ? `under ${band.upper} ${unit}` : band.upper === null ? `${band.lower} ${unit} and more` : `${band.lower} to ${band.upper} ${unit}`,
    }));
}

/** How the marked cells are drawn (coverage-map.tsx paints them; the legend shows the same). */
export const MARK_STYLES = {
  planned: { line: "#1d2528", hatchDark: "#1d2528", hatchLight: "#ffffff" },
  held: { line: "#a3242a", fill: "rgba(163, 36, 42, 0.35)" },
  selected: { line: "#d4145a" },
} as const;

/** The name of the planned cells' hatch image in the map style; plannedPatternPixels draws it. */
export const PLANNED_PATTERN = "planned-hatch";

/** The planned cells' hatch: 8 × 8 RGBA pixels, a dark diagonal with a light edge, clear between. */
export function plannedPatternPixels(): { width: number; height: number; data: Uint8Array } {
  const size = 8;
  const data = new Uint8Array(size * size * 4);
  const paint = (x: number, y: number, rgb: [number, number, number], alpha: number) => {
    const offset = (y * size + x) * 4;
    data.set([...rgb, alpha], offset);
  };
  for (let y = 0; y < size; y++) {
    for (let x = 0; x < size; x++) {
      const diagonal = (x + y) % size;
      if (diagonal === 0 || diagonal === 1) paint(x, y, [29, 37, 40], 255);
      else if (diagonal === 2) paint(x, y, [255, 255, 255], 230);
    }
  }
  return { width: size, height: size, data };
}

/** Legend swatches (CSS backgrounds) for the marked cells. */
export const MARK_SWATCHES = {
  planned: `repeating-linear-gradient(135deg, ${MARK_STYLES.planned.hatchDark} 0 2px, ${MARK_STYLES.planned.hatchLight} 2px 3px, transparent 3px 7px)`,
  held: `${MARK_STYLES.held.fill}`,
  selected: "transparent",
} as const;

/** Geotextile tubes on the laydown area (the style's "tubes" layer and the legend): cake brown, the work limit's red near capacity. */
export const TUBE_COLOURS = { normal: "#6b5a3a", nearCapacity: "#a3242a" } as const;

/**
 * A colour that is the same for every feature, written as if read from each feature (a property no
 * feature has, then the colour). MapLibre compiles one GPU program per layer kind and per paint
 * colour given once for the layer or per feature. Where the map also has a layer of the same kind
 * coloured per feature (the cells, the zones' names), this lets the two share a program: in a
 * browser drawing without a GPU each program costs tens of milliseconds at the first frame. For
 * layers of few features only: a per-feature colour takes room in every vertex.
 */
export function sharedProgramColour(colour: string) {
  return ["coalesce", ["get", "firmsand:colour"], colour] as const;
}
