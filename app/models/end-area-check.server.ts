import { QueryTypes } from "sequelize";
import { computeSurveyVolumes, type SurveyPoints } from "../../shared/pipeline";
import { endAreaCheck, principalAxisLayout } from "../../shared/progress/end-area-check";
import { cubicToVolumeUnit } from "../../shared/units";
import { Survey, SurveySnapshot, getSequelize } from "~/lib/db.server";
import { loadProjectGeometry } from "~/lib/engine/project-geometry.server";
import type { ProjectView } from "./project.server";

/**
 * The end-area cross-check of the removed volume for a project: the engine's surfaces rebuilt
 * from the active surveys' soundings, then sections across the work limit (shared/progress/
 * end-area-check). The result is kept per project until its statistics are recomputed, so only
 * the first view after an import pays for it.
 */
export interface EndAreaCrossCheck {
  /** Project volume unit. */
  surfaceRemovedVolume: number;
  endAreaRemovedVolume: number;
  differencePercent: number | null;
  sections: number;
  /** Project length unit. */
  sectionSpacing: number;
  method: string;
}

const cache = new Map<number, { key: string; value: EndAreaCrossCheck | null }>();

async function soundings(surveyId: number) {
  const rows = await getSequelize().query<{ easting: number; northing: number; elevation: number; refusalElevation: number | null }>(
    "SELECT easting, northing, elevation, refusalElevation FROM soundings WHERE surveyId = ? ORDER BY id",
    { replacements: [surveyId], type: QueryTypes.SELECT },
  );
  return {
    easting: Float64Array.from(rows, (row) => row.easting),
    northing: Float64Array.from(rows, (row) => row.northing),
    elevation: Float64Array.from(rows, (row) => row.elevation),
    refusal: Float64Array.from(rows, (row) => row.refusalElevation ?? Number.NaN),
  };
}

/** Firm sand from the baseline's probe: its own arrays when every row has one (one triangulation then serves both). */
function firmPoints(baseline: Awaited<ReturnType<typeof soundings>>): SurveyPoints {
  const keep: number[] = [];
  baseline.refusal.forEach((value, index) => { if (Number.isFinite(value)) keep.push(index); });
  if (keep.length === baseline.refusal.length) return { easting: baseline.easting, northing: baseline.northing, elevation: baseline.refusal };
  return {
    easting: Float64Array.from(keep, (index) => baseline.easting[index]),
    northing: Float64Array.from(keep, (index) => baseline.northing[index]),
    elevation: Float64Array.from(keep, (index) => baseline.refusal[index]),
  };
}

export async function loadEndAreaCrossCheck(project: ProjectView): Promise<EndAreaCrossCheck | null> {
  const [surveys, newest] = await Promise.all([
    Survey.findAll({ where: { projectId: project.id, status: "active" }, order: [["surveyedOn", "ASC"], ["id", "ASC"]], attributes: ["id", "kind", "surveyedOn"] }),
    SurveySnapshot.max("computedAt", { where: { projectId: project.id } }),
  ]);
  const key = `${String(newest)}|${surveys.map((survey) => survey.id).join(",")}`;
  const cached = cache.get(project.id);
  if (cached?.key === key) return cached.value;

  const baselines = surveys.filter((survey) => survey.kind === "baseline");
  const geometry = await loadProjectGeometry(project.id);
  let value: EndAreaCrossCheck | null = null;
  if (baselines.length > 0 && geometry.workLimit) {
    const baseline = await soundings(baselines[baselines.length - 1].id);
    const later = await Promise.all(surveys.filter((survey) => survey.kind !== "baseline").map((survey) => soundings(survey.id)));
    if (baseline.refusal.some(Number.isFinite)) {
      const result = computeSurveyVolumes(
        {
          baseline: { easting: baseline.easting, northing: baseline.northing, elevation: baseline.elevation },
          firm: firmPoints(baseline),
          progress: later.map((survey) => ({ easting: survey.easting, northing: survey.northing, elevation: survey.elevation })),
        },
        geometry.workLimit,
        geometry.settings,
      );
      // Sections one cell apart, sampled at the raster spacing: as fine as the surfaces themselves.
      const layout = principalAxisLayout(geometry.workLimit, geometry.settings.cellSize, geometry.settings.resolution);
      const check = endAreaCheck(result.rasters.muckTop, result.rasters.latestBottom, result.totals.removedVolume, layout);
      const volume = (cubic: number) => cubicToVolumeUnit(cubic, geometry.lengthUnit);
      value = {
        surfaceRemovedVolume: volume(check.surfaceVolume),
        endAreaRemovedVolume: volume(check.endAreaVolume),
        differencePercent: check.differencePercent,
        sections: check.sections,
        sectionSpacing: check.sectionSpacing,
        method:
          `Average end area (USACE EM 1110-2-1003, ch. 15) of ${check.sections} sections ${check.sectionSpacing} apart, square to the work limit's long axis, ` +
          "each integrated across the limit from the baseline muck top down to the latest bottom.",
      };
    }
  }
  cache.set(project.id, { key, value });
  return value;
}
