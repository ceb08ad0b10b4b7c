import { endAreaVolume, thicknessBetween, type SampledRaster, type SectionLayout } from "../end-area";
import type { ProjectedMultiPolygon } from "../grid/work-limit";
import { percentDifference } from "./percent-complete";

/**
 * The end-area (cross-section) check beside the surface volume, as a reviewer would run it:
 * sections square to the work limit's long axis (its principal axis), spanning its full width,
 * a fixed distance apart, sampled along each section at the raster's spacing; volumes by the
 * average end area between consecutive sections (USACE EM 1110-2-1003, ch. 15). Outside the
 * work limit the rasters hold no data, which the sections read as zero thickness.
 */

/** Sections along the principal axis of the work limit's outer-ring vertices. */
/** A ring's distinct vertices: the closing vertex repeats the first and would weigh it twice. */
function openRing(ring: ReadonlyArray<readonly [number, number] | number[]>) {
  const last = ring.length - 1;
  return last > 0 && ring[0][0] === ring[last][0] && ring[0][1] === ring[last][1] ? ring.slice(0, last) : ring;
}

export function principalAxisLayout(workLimit: ProjectedMultiPolygon, sectionSpacing: number, sampleStep: number): SectionLayout {
  let count = 0;
  let meanX = 0;
  let meanY = 0;
  for (const polygon of workLimit) for (const [x, y] of openRing(polygon[0] ?? [])) { meanX += x; meanY += y; count++; }
  if (count < 3) throw new Error("the work limit needs at least three vertices");
  meanX /= count;
  meanY /= count;
  let sxx = 0;
  let syy = 0;
  let sxy = 0;
  for (const polygon of workLimit) {
    for (const [x, y] of openRing(polygon[0] ?? [])) {
      sxx += (x - meanX) ** 2;
      syy += (y - meanY) ** 2;
      sxy += (x - meanX) * (y - meanY);
    }
  }
  // Direction of the larger eigenvalue of the 2×2 covariance matrix.
  const angle = 0.5 * Math.atan2(2 * sxy, sxx - syy);
  const alongX = Math.cos(angle);
  const alongY = Math.sin(angle);
  let minAlong = Infinity;
  let maxAlong = -Infinity;
  let maxAcross = 0;
  for (const polygon of workLimit) {
    for (const ring of polygon) {
      for (const [x, y] of ring) {
        const along = (x - meanX) * alongX + (y - meanY) * alongY;
        const across = -(x - meanX) * alongY + (y - meanY) * alongX;
        minAlong = Math.min(minAlong, along);
        maxAlong = Math.max(maxAlong, along);
        maxAcross = Math.max(maxAcross, Math.abs(across));
      }
    }
  }
  return {
    baselineStartX: meanX + alongX * minAlong,
    baselineStartY: meanY + alongY * minAlong,
    baselineEndX: meanX + alongX * maxAlong,
    baselineEndY: meanY + alongY * maxAlong,
    sectionSpacing,
    // A sample step beyond the widest point so the end sections reach past every vertex.
    halfWidth: maxAcross + sampleStep,
    sampleStep,
  };
}

export interface EndAreaCheck {
  /** Cubic project length units. */
  surfaceVolumeCubicLength: number;
  endAreaVolumeCubicLength: number;
  /** (end area − surface) ÷ surface, percent; null when the surface volume is zero. */
  differencePercent: number | null;
  sections: number;
  sectionSpacing: number;
}

/** Removed volume (upper = baseline muck top, lower = latest bottom) by sections, beside the surface figure. */
export function endAreaCheck(upper: SampledRaster, lower: SampledRaster, surfaceVolumeCubicLength: number, layout: SectionLayout): EndAreaCheck {
  const result = endAreaVolume(thicknessBetween(upper, lower), layout);
  return {
    surfaceVolumeCubicLength,
    endAreaVolumeCubicLength: result.averageEndAreaVolume,
    differencePercent: percentDifference(surfaceVolumeCubicLength, result.averageEndAreaVolume),
    sections: result.stations.length,
    sectionSpacing: layout.sectionSpacing,
  };
}
