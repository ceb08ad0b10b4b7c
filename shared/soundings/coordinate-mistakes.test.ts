import { describe, expect, it } from "vitest";
import { FEET_PER_METRE } from "../units";
import { findCoordinateMistake } from "./coordinate-mistakes";

// A work limit near easting 600,000 ft, northing 1,680,000 ft (state plane feet, like the demo).
const workLimit = { minX: 600_000, minY: 1_679_700, maxX: 600_900, maxY: 1_680_100 };
const input = (easting: number, northing: number, declaredIsGeographic = false, project?: [number, number]) => ({
  fileEasting: Float64Array.of(easting, easting + 1, easting + 2),
  fileNorthing: Float64Array.of(northing, northing + 1, northing + 2),
  projectEasting: Float64Array.of(project?.[0] ?? easting, (project?.[0] ?? easting) + 1, (project?.[0] ?? easting) + 2),
  projectNorthing: Float64Array.of(project?.[1] ?? northing, (project?.[1] ?? northing) + 1, (project?.[1] ?? northing) + 2),
  declaredCrs: "EPSG:2237",
  declaredIsGeographic,
  workLimit,
  projectUnitWord: "US survey feet",
});

describe("findCoordinateMistake", () => {
  it("finds nothing wrong with soundings on the work limit", () => {
    expect(findCoordinateMistake(input(600_400, 1_679_900))).toBeNull();
  });

  it("says so when degrees are declared as a projected system", () => {
    expect(findCoordinateMistake(input(-82.175, 28.955))?.kind).toBe("lon-lat-as-projected");
  });

  it("says so when a lon/lat declaration holds projected numbers", () => {
    expect(findCoordinateMistake(input(600_400, 1_679_900, true))?.kind).toBe("not-degrees");
  });

  it("recognises metres declared as feet by the 3.2808 factor (0.3048 m per ft, NIST SP 811)", () => {
    const mistake = findCoordinateMistake(input(600_400 / FEET_PER_METRE, 1_679_900 / FEET_PER_METRE));
    expect(mistake?.kind).toBe("metres-as-feet");
    expect(mistake?.message).toMatch(/3\.2808/);
  });

  it("recognises feet declared as metres", () => {
    expect(findCoordinateMistake(input(600_400 * FEET_PER_METRE, 1_679_900 * FEET_PER_METRE))?.kind).toBe("feet-as-metres");
  });

  it("reports soundings far from the limit with the distance", () => {
    const mistake = findCoordinateMistake(input(640_000, 1_679_900));
    expect(mistake?.kind).toBe("far-from-work-limit");
    expect(mistake?.message).toContain("39,101 US survey feet"); // computed: median easting 640,001 − the limit's east edge 600,900
  });
});
