import type { ProjectedMultiPolygon } from "../../shared/grid/work-limit";
import type { SurveyPoints } from "../../shared/pipeline";

/**
 * Seeded synthetic surveys for the benchmark: an elliptical basin with a gently rolling firm-sand
 * floor under a muck layer of varying thickness; the "after" survey has the muck dredged from the
 * western part of the basin. Invented numbers, no real site.
 */

/** mulberry32: a small, fast, seedable generator (results repeat run to run). */
export function seededRandom(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let mixed = Math.imul(state ^ (state >>> 15), 1 | state);
    mixed = (mixed + Math.imul(mixed ^ (mixed >>> 7), 61 | mixed)) ^ mixed;
    return ((mixed ^ (mixed >>> 14)) >>> 0) / 4294967296;
  };
}

export interface Basin {
  name: string;
  centreX: number;
  centreY: number;
  /** Semi-axes of the elliptical work limit. */
  radiusX: number;
  radiusY: number;
  /** Typical water depth and muck thickness (project length unit). */
  waterDepth: number;
  muckThickness: number;
}

export function ellipseLimit(basin: Basin, vertices = 256): ProjectedMultiPolygon {
  const ring: Array<[number, number]> = [];
  for (let index = 0; index < vertices; index++) {
    const angle = (2 * Math.PI * index) / vertices;
    ring.push([basin.centreX + basin.radiusX * Math.cos(angle), basin.centreY + basin.radiusY * Math.sin(angle)]);
  }
  ring.push([ring[0][0], ring[0][1]]);
  return [[ring]];
}

function firmDepth(basin: Basin, u: number, v: number) {
  return basin.waterDepth + basin.muckThickness + 0.15 * basin.waterDepth * Math.sin(3 * u) * Math.cos(2 * v);
}
function muckDepth(basin: Basin, u: number, v: number) {
  const thickness = basin.muckThickness * (0.6 + 0.4 * Math.sin(5 * u + 1) * Math.sin(4 * v + 2));
  return firmDepth(basin, u, v) - thickness;
}

export interface SyntheticSurveys {
  before: SurveyPoints;
  /** Refusal elevations on the before survey's own positions (its probe column). */
  firm: SurveyPoints;
  after: SurveyPoints;
}

/**
 * `count` soundings per survey, uniformly scattered over the ellipse grown by 3 % (crews sound a
 * little past the limit). `duplicateShare` repeats that share of positions exactly and
 * `transects` puts soundings on straight east-west lines (collinear runs), for the degenerate case.
 */
export function syntheticSurveys(basin: Basin, count: number, seed: number, options: { duplicateShare?: number; transects?: number } = {}): SyntheticSurveys {
  const random = seededRandom(seed);
  const make = (dredged: boolean, withFirm: boolean) => {
    const easting = new Float64Array(count);
    const northing = new Float64Array(count);
    const elevation = new Float64Array(count);
    const refusal = withFirm ? new Float64Array(count) : null;
    for (let index = 0; index < count; index++) {
      let u: number;
      let v: number;
      const duplicate = options.duplicateShare !== undefined && index > 0 && random() < options.duplicateShare;
      if (duplicate) {
        const earlier = Math.floor(random() * index);
        easting[index] = easting[earlier];
        northing[index] = northing[earlier];
        u = (easting[index] - basin.centreX) / basin.radiusX;
        v = (northing[index] - basin.centreY) / basin.radiusY;
      } else {
        if (options.transects !== undefined) {
          const line = Math.floor(random() * options.transects);
          v = -1.03 + (2.06 * (line + 0.5)) / options.transects;
          u = (random() * 2 - 1) * 1.03;
        } else {
          do {
            u = (random() * 2 - 1) * 1.03;
            v = (random() * 2 - 1) * 1.03;
          } while (u * u + v * v > 1.03 * 1.03);
        }
        easting[index] = basin.centreX + u * basin.radiusX;
        northing[index] = basin.centreY + v * basin.radiusY;
      }
      const noise = (random() - 0.5) * 0.02 * basin.waterDepth;
      const firm = firmDepth(basin, u, v);
      const muck = muckDepth(basin, u, v);
      // West of the centre line the dredge has taken the muck down to within 5 % of firm sand.
      const depth = dredged && u < 0 ? firm - 0.05 * (firm - muck) : muck;
      elevation[index] = -(depth + noise);
      if (refusal) refusal[index] = -firm;
    }
    return { easting, northing, elevation, refusal };
  };
  const before = make(false, true);
  const after = make(true, false);
  return {
    before: { easting: before.easting, northing: before.northing, elevation: before.elevation },
    firm: { easting: before.easting, northing: before.northing, elevation: before.refusal as Float64Array },
    after: { easting: after.easting, northing: after.northing, elevation: after.elevation },
  };
}
