/**
 * How the demo's work limit and zones were drawn: a design in a local plane (feet east and north
 * of the fictional spring vent, in the projected CRS's axes), built from a few shape parameters.
 * `print-geometry.ts` turns it into the lon/lat literals in scenario.ts; generate.test.ts checks
 * that the two still agree. The bottom model (bottom.ts) reuses the run's centre line.
 */

/** Direction the spring run flows, counter-clockwise from grid east (east-south-east). */
export const RUN_BEARING_RADIANS = (-15 * Math.PI) / 180;
/** Where the run's banks leave the vent basin and where the upper run ends, along the centre line (ft). */
export const RUN_JOIN_FT = 125;
export const UPPER_RUN_END_FT = 430;
export const RUN_END_FT = 745;
/** Basin cove (a side embayment where muck collects): direction and radial reach. */
export const BASIN_COVE_ANGLE_RADIANS = (120 * Math.PI) / 180;
/** Lower-run cove on the left bank, centred at this distance along the centre line. */
export const RUN_COVE_AT_FT = 565;

const along = [Math.cos(RUN_BEARING_RADIANS), Math.sin(RUN_BEARING_RADIANS)];
const left = [-along[1], along[0]];

/** Meander of the run: lateral offset of the centre line (ft), straight inside the basin. */
function meanderFt(distanceFt: number): number {
  if (distanceFt <= 150) return 0;
  const ramp = Math.min(1, (distanceFt - 150) / 80);
  return 22 * ramp * Math.sin((2 * Math.PI * (distanceFt - 150)) / 420);
}

/** A point of the run's centre line, local feet. */
export function centerLinePoint(distanceFt: number): [number, number] {
  const offset = meanderFt(distanceFt);
  return [
    distanceFt * along[0] + offset * left[0],
    distanceFt * along[1] + offset * left[1],
  ];
}

/** Half-widths of the run (ft) to the left and right bank, looking downstream. */
export function runHalfWidthsFt(distanceFt: number): { leftFt: number; rightFt: number } {
  const base = 31 + 4 * Math.sin((2 * Math.PI * distanceFt) / 230 + 1);
  const cove = 24 * Math.exp(-(((distanceFt - RUN_COVE_AT_FT) / 45) ** 2));
  return { leftFt: base + cove, rightFt: base - 1.5 * Math.sin(distanceFt / 90) };
}

/** Radius of the vent basin's shore (ft) at an angle counter-clockwise from grid east. */
export function basinRadiusFt(angleRadians: number): number {
  const fromCove = Math.atan2(
    Math.sin(angleRadians - BASIN_COVE_ANGLE_RADIANS),
    Math.cos(angleRadians - BASIN_COVE_ANGLE_RADIANS),
  );
  return (
    128 +
    10 * Math.sin(2 * angleRadians + 0.7) +
    6 * Math.sin(3 * angleRadians + 2.1) +
    20 * Math.exp(-((fromCove / 0.35) ** 2))
  );
}

function unitNormal(distanceFt: number): [number, number] {
  const [x0, y0] = centerLinePoint(distanceFt - 0.5);
  const [x1, y1] = centerLinePoint(distanceFt + 0.5);
  const length = Math.hypot(x1 - x0, y1 - y0);
  return [-(y1 - y0) / length, (x1 - x0) / length];
}

/** A point on a bank of the run, or `beyondFt` past it (outside the water). */
export function bankPoint(distanceFt: number, side: "left" | "right", beyondFt = 0): [number, number] {
  const [x, y] = centerLinePoint(distanceFt);
  const [nx, ny] = unitNormal(distanceFt);
  const { leftFt, rightFt } = runHalfWidthsFt(distanceFt);
  const offset = side === "left" ? leftFt + beyondFt : -(rightFt + beyondFt);
  return [x + offset * nx, y + offset * ny];
}

export const UPPER_RUN_STATIONS_FT = [RUN_JOIN_FT, 200, 275, 350, UPPER_RUN_END_FT];
const LOWER_RUN_STATIONS_FT = [UPPER_RUN_END_FT, 500, 565, 630, 690];
/** The basin's shore is left this far either side of the run's mouth (a flared junction). */
const MOUTH_HALF_ANGLE_RADIANS = (26 * Math.PI) / 180;
const BASIN_SHORE_VERTICES = 15;

export interface OutlineDesign {
  /** Counter-clockwise closed rings in local feet (RFC 7946 orientation once in lon/lat). */
  workLimit: [number, number][];
  zones: { name: string; ring: [number, number][] }[];
}

function close(ring: [number, number][]): [number, number][] {
  return [...ring, ring[0]];
}

export function designOutline(zoneNames: readonly [string, string, string]): OutlineDesign {
  const rightUpper = UPPER_RUN_STATIONS_FT.map((s) => bankPoint(s, "right"));
  const rightLower = LOWER_RUN_STATIONS_FT.map((s) => bankPoint(s, "right"));
  const leftUpper = UPPER_RUN_STATIONS_FT.map((s) => bankPoint(s, "left"));
  const leftLower = LOWER_RUN_STATIONS_FT.map((s) => bankPoint(s, "left"));
  const runEnd = centerLinePoint(RUN_END_FT);

  // Shore of the basin, counter-clockwise from the left side of the run's mouth round to its right.
  const shore: [number, number][] = [];
  for (let index = 0; index < BASIN_SHORE_VERTICES; index++) {
    const angle =
      RUN_BEARING_RADIANS +
      MOUTH_HALF_ANGLE_RADIANS +
      ((2 * Math.PI - 2 * MOUTH_HALF_ANGLE_RADIANS) * index) / (BASIN_SHORE_VERTICES - 1);
    const radius = basinRadiusFt(angle);
    shore.push([radius * Math.cos(angle), radius * Math.sin(angle)]);
  }

  // Counter-clockwise: down the right (south) bank, round the run's end, up the left bank, round the basin.
  const workLimit = close([
    ...rightUpper,
    ...rightLower.slice(1),
    runEnd,
    ...[...leftLower].reverse(),
    ...[...leftUpper].reverse().slice(1),
    ...shore,
  ]);
  const ventBasin = close([leftUpper[0], ...shore, rightUpper[0]]);
  const upperRun = close([...rightUpper, ...[...leftUpper].reverse()]);
  const lowerRun = close([...rightLower, runEnd, ...[...leftLower].reverse()]);
  return {
    workLimit,
    zones: [
      { name: zoneNames[0], ring: ventBasin },
      { name: zoneNames[1], ring: upperRun },
      { name: zoneNames[2], ring: lowerRun },
    ],
  };
}
