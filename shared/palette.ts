/**
 * Firmsand's map colours. Status colours are our own, chosen so that every pair stays apart in
 * lightness as well as hue: people with a red–green or blue–yellow colour-vision deficiency still
 * tell the five states apart (checked by simulation in palette.test.ts). The order runs from
 * "nothing known" to "proven done": pale grey, dark umber, amber, light blue, deep navy.
 */
import type { CellStatus } from "./cell-status";

export const STATUS_COLOURS: Record<CellStatus, string> = {
  "no-data": "#e3e1dc",
  untouched: "#6e4420",
  "in-work": "#f2a93b",
  "at-firm-sand": "#7ec3ee",
  confirmed: "#173a6b",
};

export const STATUS_LABELS: Record<CellStatus, string> = {
  "no-data": "No data",
  untouched: "Untouched",
  "in-work": "In work",
  "at-firm-sand": "At firm sand",
  confirmed: "Confirmed (closeout)",
};

/**
 * The map's own basemap: land, and the water inside the shoreline and the work limit. The land is
 * the maps' CSS background under the canvas (app.css `--color-land`, the same value).
 */
export const LAND_COLOUR = "#eeede6";
export const WATER_COLOUR = "#cfe2e8";
/** The work limit's outline on the map and in the printed outlines. */
export const WORK_LIMIT_COLOUR = "#a3242a";

/** Code in the /api cells arrays (index into CELL_STATUSES); −1 marks a grid cell outside the work limit. */
export const OUTSIDE_WORK_LIMIT = -1;

/**
 * A sequential ramp for bands (remaining thickness, removed volume, depth): light to dark in one
 * hue family, so the order reads by lightness alone. `count` colours from the ramp's stops.
 */
const SEQUENTIAL_STOPS = ["#fff3d6", "#f6c978", "#d9893a", "#a4541f", "#5e2a12"];
const COOL_STOPS = ["#eef6fb", "#b9dcef", "#6fb0d9", "#2f72ad", "#12386b"];

function hexToRgb(hex: string): [number, number, number] {
  const value = Number.parseInt(hex.slice(1), 16);
  return [(value >> 16) & 255, (value >> 8) & 255, value & 255];
}

function rgbToHex([red, green, blue]: [number, number, number]): string {
  return `#${[red, green, blue].map((channel) => Math.round(channel).toString(16).padStart(2, "0")).join("")}`;
}

function ramp(stops: readonly string[], count: number): string[] {
  if (count <= 1) return [stops[Math.floor(stops.length / 2)]];
  const colours: string[] = [];
  for (let index = 0; index < count; index++) {
    const position = (index / (count - 1)) * (stops.length - 1);
    const lower = Math.min(Math.floor(position), stops.length - 2);
    const share = position - lower;
    const from = hexToRgb(stops[lower]);
    const to = hexToRgb(stops[lower + 1]);
    colours.push(rgbToHex([0, 1, 2].map((channel) => from[channel] + (to[channel] - from[channel]) * share) as [number, number, number]));
  }
  return colours;
}

/** Warm ramp: more sediment left reads darker. */
export function sedimentRamp(count: number): string[] {
  return ramp(SEQUENTIAL_STOPS, count);
}

/** Cool ramp: more removed (or deeper) reads darker. */
export function coolRamp(count: number): string[] {
  return ramp(COOL_STOPS, count);
}

export { hexToRgb };
