import type { Raster } from "./surface/raster";

/**
 * Cross-section (end-area) volumes, the check the trade keeps beside a surface volume.
 * Methods as in USACE EM 1110-2-1003 *Hydrographic Surveying* (2002), ch. 15: the average end
 * area V = L(A1 + A2)/2 per pair of sections, and the prismoidal formula V = L(A1 + 4Am + A2)/6.
 * The end-area method over-estimates tapering solids (a pyramid by half); see Deakin & Hunter
 * (2009), *The Prismoidal Correction Revisited*.
 *
 * All lengths are in the project's unit; areas come out in square units and volumes in cubic
 * units (convert with `cubicToVolumeUnit` from ./units).
 */

/** Thickness (e.g. removed or remaining) at a point; NaN where there is no data. */
export type ThicknessSampler = (x: number, y: number) => number;

/** Average end area between consecutive sections at `stations` (increasing distances). */
export function averageEndAreaVolume(areas: ArrayLike<number>, stations: ArrayLike<number>): number {
  if (areas.length !== stations.length) throw new Error("Each section needs one station");
  let volume = 0;
  for (let i = 1; i < areas.length; i++) {
    const length = stations[i] - stations[i - 1];
    if (!(length > 0)) throw new Error(`Section stations must increase (section ${i + 1})`);
    volume += (length * (areas[i - 1] + areas[i])) / 2;
  }
  return volume;
}

/** Prismoidal formula between two end sections with the section midway between them. */
export function prismoidalVolume(areaStart: number, areaMiddle: number, areaEnd: number, length: number): number {
  return (length * (areaStart + 4 * areaMiddle + areaEnd)) / 6;
}

/**
 * Prismoidal volume over an odd number of equally spaced sections (Simpson's rule over pairs of
 * intervals): exact where the section area varies as a quadratic, e.g. pyramids and frustums.
 */
export function prismoidalVolumeOfSections(areas: ArrayLike<number>, spacing: number): number {
  if (areas.length < 3 || areas.length % 2 === 0) {
    throw new Error("The prismoidal formula needs an odd number of sections, at least three");
  }
  let volume = 0;
  for (let i = 0; i + 2 < areas.length; i += 2) {
    volume += prismoidalVolume(areas[i], areas[i + 1], areas[i + 2], 2 * spacing);
  }
  return volume;
}

/**
 * Area of one section line from (startX, startY) to (endX, endY): the integral of thickness along
 * it by the trapezoid rule at `sampleStep`. No-data samples count as zero thickness, and are counted.
 */
export function sectionArea(
  sampler: ThicknessSampler,
  startX: number,
  startY: number,
  endX: number,
  endY: number,
  sampleStep: number,
): { area: number; samples: number; noDataSamples: number } {
  const length = Math.hypot(endX - startX, endY - startY);
  const intervals = Math.max(1, Math.ceil(length / sampleStep));
  const step = length / intervals;
  let area = 0;
  let noDataSamples = 0;
  for (let i = 0; i <= intervals; i++) {
    const fraction = i / intervals;
    let thickness = sampler(startX + fraction * (endX - startX), startY + fraction * (endY - startY));
    if (Number.isNaN(thickness)) {
      noDataSamples++;
      thickness = 0;
    }
    area += i === 0 || i === intervals ? thickness / 2 : thickness;
  }
  return { area: area * step, samples: intervals + 1, noDataSamples };
}

export interface SectionLayout {
  /** Baseline (alignment) the sections are stationed along. */
  baselineStartX: number;
  baselineStartY: number;
  baselineEndX: number;
  baselineEndY: number;
  /** Distance between sections along the baseline. */
  sectionSpacing: number;
  /** Sections reach this far to the left and to the right of the baseline. */
  halfWidth: number;
  /** Sampling step along each section. */
  sampleStep: number;
}

export interface EndAreaResult {
  /** Distance of each section from the baseline start. */
  stations: Float64Array<ArrayBuffer>;
  /** Section areas in square project units. */
  areas: Float64Array<ArrayBuffer>;
  /** Average-end-area volume in cubic project units. */
  averageEndAreaVolume: number;
  /** Prismoidal volume when the sections allow it (odd count, equal spacing), else null. */
  prismoidalVolume: number | null;
  /** Share of the samples that had no data. */
  noDataShare: number;
}

/**
 * Sections perpendicular to the baseline at `sectionSpacing` from its start; the last section
 * sits at the baseline's end (so the final interval may be shorter).
 */
export function endAreaVolume(sampler: ThicknessSampler, layout: SectionLayout): EndAreaResult {
  const dx = layout.baselineEndX - layout.baselineStartX;
  const dy = layout.baselineEndY - layout.baselineStartY;
  const baselineLength = Math.hypot(dx, dy);
  if (!(baselineLength > 0)) throw new Error("The baseline needs two distinct ends");
  if (!(layout.sectionSpacing > 0) || !(layout.sampleStep > 0) || !(layout.halfWidth > 0)) {
    throw new Error("Section spacing, half width and sample step must be positive");
  }
  const alongX = dx / baselineLength;
  const alongY = dy / baselineLength;
  // Left-hand normal: sections run from right to left of the baseline.
  const acrossX = -alongY;
  const acrossY = alongX;
  const stationList: number[] = [];
  for (let station = 0; station < baselineLength - 1e-9 * baselineLength; station += layout.sectionSpacing) {
    stationList.push(station);
  }
  stationList.push(baselineLength);
  const stations = Float64Array.from(stationList);
  const areas = new Float64Array(stations.length);
  let samples = 0;
  let noData = 0;
  for (let i = 0; i < stations.length; i++) {
    const centreX = layout.baselineStartX + alongX * stations[i];
    const centreY = layout.baselineStartY + alongY * stations[i];
    const section = sectionArea(
      sampler,
      centreX - acrossX * layout.halfWidth,
      centreY - acrossY * layout.halfWidth,
      centreX + acrossX * layout.halfWidth,
      centreY + acrossY * layout.halfWidth,
      layout.sampleStep,
    );
    areas[i] = section.area;
    samples += section.samples;
    noData += section.noDataSamples;
  }
  const equalSpacing = Math.abs(baselineLength - (stations.length - 1) * layout.sectionSpacing) < 1e-9 * baselineLength;
  const prismoidal =
    equalSpacing && stations.length >= 3 && stations.length % 2 === 1
      ? prismoidalVolumeOfSections(areas, layout.sectionSpacing)
      : null;
  return {
    stations,
    areas,
    averageEndAreaVolume: averageEndAreaVolume(areas, stations),
    prismoidalVolume: prismoidal,
    noDataShare: samples === 0 ? 0 : noData / samples,
  };
}

/** The surfaces' raster (see ./surface/raster): node (col, row) at the centre of its pixel. */
export type SampledRaster = Pick<Raster, "values" | "cols" | "rows" | "originX" | "originY" | "spacing">;

/**
 * Bilinear value of a raster at a point; NaN outside its extent or next to a no-data node. In
 * the outer half pixel the edge pair of nodes is extended linearly, which keeps planes exact.
 */
export function sampleRaster(raster: SampledRaster, x: number, y: number): number {
  const gx = (x - raster.originX) / raster.spacing - 0.5;
  const gy = (y - raster.originY) / raster.spacing - 0.5;
  if (!(gx >= -0.5 && gy >= -0.5 && gx <= raster.cols - 0.5 && gy <= raster.rows - 0.5)) return Number.NaN;
  const col = Math.max(0, Math.min(Math.floor(gx), raster.cols - 2));
  const row = Math.max(0, Math.min(Math.floor(gy), raster.rows - 2));
  // A one-node-wide raster has no second node in that direction: hold its value.
  const fx = raster.cols === 1 ? 0 : gx - col;
  const fy = raster.rows === 1 ? 0 : gy - row;
  const nextCol = Math.min(col + 1, raster.cols - 1);
  const nextRow = Math.min(row + 1, raster.rows - 1);
  const v00 = raster.values[row * raster.cols + col];
  const v10 = raster.values[row * raster.cols + nextCol];
  const v01 = raster.values[nextRow * raster.cols + col];
  const v11 = raster.values[nextRow * raster.cols + nextCol];
  return (v00 * (1 - fx) + v10 * fx) * (1 - fy) + (v01 * (1 - fx) + v11 * fx) * fy;
}

/**
 * Removed thickness between two surfaces on the same raster layout: max(before − after, 0).
 * Pass (latest, firm) for remaining thickness, or (muck top, firm) for planned.
 */
export function thicknessBetween(upper: SampledRaster, lower: SampledRaster): ThicknessSampler {
  return (x, y) => {
    const difference = sampleRaster(upper, x, y) - sampleRaster(lower, x, y);
    return Number.isNaN(difference) ? Number.NaN : Math.max(difference, 0);
  };
}
