/**
 * The demo's synthetic bottom, in NAVD88 feet at local coordinates (feet east and north of the
 * vent): a firm-sand (refusal) surface shaped like a spring's vent bowl draining into a sloping
 * run, and a muck layer 0.5–4 ft thick, thicker in the coves, along the banks and down the run,
 * thin at the vent where the spring's discharge keeps the sand clean.
 */
import {
  BASIN_COVE_ANGLE_RADIANS,
  RUN_COVE_AT_FT,
  RUN_END_FT,
  centerLinePoint,
  runHalfWidthsFt,
} from "./outline";
import type { Random } from "./prng";

export const MUCK_MIN_THICKNESS_FT = 0.5;
export const MUCK_MAX_THICKNESS_FT = 4;

/** Where a point sits relative to the run: distance along its centre line and across it. */
export interface RunPosition {
  alongFt: number;
  /** Signed, positive toward the left bank (looking downstream). */
  acrossFt: number;
}

const CENTER_LINE_STEP_FT = 5;
const centerLine: [number, number][] = [];
for (let along = 0; along <= RUN_END_FT + 40; along += CENTER_LINE_STEP_FT) {
  centerLine.push(centerLinePoint(along));
}

/** Nearest point on the run's centre line (a 5 ft polyline from the vent). */
export function runPosition(x: number, y: number): RunPosition {
  let bestDistance2 = Infinity;
  let best: RunPosition = { alongFt: 0, acrossFt: 0 };
  for (let index = 0; index + 1 < centerLine.length; index++) {
    const [x0, y0] = centerLine[index];
    const [x1, y1] = centerLine[index + 1];
    const dx = x1 - x0;
    const dy = y1 - y0;
    const length2 = dx * dx + dy * dy;
    const share = Math.max(0, Math.min(1, ((x - x0) * dx + (y - y0) * dy) / length2));
    const px = x0 + share * dx;
    const py = y0 + share * dy;
    const distance2 = (x - px) ** 2 + (y - py) ** 2;
    if (distance2 < bestDistance2) {
      bestDistance2 = distance2;
      const side = Math.sign(dx * (y - y0) - dy * (x - x0)) || 1;
      best = { alongFt: (index + share) * CENTER_LINE_STEP_FT, acrossFt: side * Math.sqrt(distance2) };
    }
  }
  return best;
}

function smoothstep(value: number): number {
  const clamped = Math.max(0, Math.min(1, value));
  return clamped * clamped * (3 - 2 * clamped);
}

/** A smooth random field of unit amplitude: a few plane waves of 40–160 ft wavelength. */
function smoothField(random: Random): (x: number, y: number) => number {
  const waves = Array.from({ length: 6 }, () => {
    const direction = random.between(0, 2 * Math.PI);
    const wavenumber = (2 * Math.PI) / random.between(40, 160);
    return {
      kx: wavenumber * Math.cos(direction),
      ky: wavenumber * Math.sin(direction),
      phase: random.between(0, 2 * Math.PI),
    };
  });
  const scale = 1 / Math.sqrt(waves.length / 2);
  return (x, y) => {
    let sum = 0;
    for (const wave of waves) sum += Math.sin(wave.kx * x + wave.ky * y + wave.phase);
    return (sum * scale) / 2;
  };
}

export interface DemoBottom {
  /** Firm-sand (refusal) elevation, NAVD88 ft. */
  firmElevationFt(x: number, y: number): number;
  /** Baseline muck thickness above firm sand, ft. */
  muckThicknessFt(x: number, y: number): number;
}

export function createBottom(random: Random): DemoBottom {
  const firmUndulation = smoothField(random);
  const muckVariation = smoothField(random);
  const basinCove: [number, number] = [
    120 * Math.cos(BASIN_COVE_ANGLE_RADIANS),
    120 * Math.sin(BASIN_COVE_ANGLE_RADIANS),
  ];
  const runCoveCenter = centerLinePoint(RUN_COVE_AT_FT);
  const runCoveNormal = centerLinePoint(RUN_COVE_AT_FT + 1);
  const tangentX = runCoveNormal[0] - runCoveCenter[0];
  const tangentY = runCoveNormal[1] - runCoveCenter[1];
  const tangentLength = Math.hypot(tangentX, tangentY);
  const runCove: [number, number] = [
    runCoveCenter[0] - (40 * tangentY) / tangentLength,
    runCoveCenter[1] + (40 * tangentX) / tangentLength,
  ];

  function shape(x: number, y: number) {
    const radiusFt = Math.hypot(x, y);
    const run = runPosition(x, y);
    // 0 in the basin, 1 in the run; the mouth blends over 110 ft.
    const runShare = smoothstep((run.alongFt - 100) / 110);
    const widths = runHalfWidthsFt(run.alongFt);
    const halfWidth = run.acrossFt >= 0 ? widths.leftFt : widths.rightFt;
    const acrossShare = Math.min(1.2, Math.abs(run.acrossFt) / halfWidth);
    const downRunShare = Math.max(0, Math.min(1, (run.alongFt - 140) / 600));
    return { radiusFt, runShare, acrossShare, downRunShare };
  }

  return {
    firmElevationFt(x, y) {
      const { radiusFt, runShare, acrossShare, downRunShare } = shape(x, y);
      const basin = 27 - 14 * Math.exp(-((radiusFt / 75) ** 2)) + 1.2 * (radiusFt / 140) ** 2;
      const run = 24.8 - 1.6 * downRunShare + 2.4 * acrossShare ** 2;
      return basin + (run - basin) * runShare + 0.3 * firmUndulation(x, y);
    },
    muckThicknessFt(x, y) {
      const { radiusFt, runShare, acrossShare, downRunShare } = shape(x, y);
      const basin = 1.6;
      const run = 1.1 + 1.8 * downRunShare + 0.5 * acrossShare ** 2;
      const coves =
        1.8 * Math.exp(-((Math.hypot(x - basinCove[0], y - basinCove[1]) / 45) ** 2)) +
        1.6 * Math.exp(-((Math.hypot(x - runCove[0], y - runCove[1]) / 35) ** 2));
      const ventScour = 1.0 * Math.exp(-((radiusFt / 30) ** 2));
      const thickness =
        basin + (run - basin) * runShare + coves - ventScour + 0.35 * muckVariation(x, y);
      return Math.max(MUCK_MIN_THICKNESS_FT, Math.min(MUCK_MAX_THICKNESS_FT, thickness));
    },
  };
}
