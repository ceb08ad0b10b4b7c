import { QueryTypes } from "sequelize";
import { Survey, getSequelize } from "../db.server";
import { binMedians } from "../../../shared/soundings/depth-unit-mistakes";

/**
 * What the project already knows of its bottom, for the depth-unit and bottom-shift checks: the
 * median bottom elevation (project units) per square bin from the active surveys, newest first,
 * each bin taken from the newest survey that covers it; and likewise the firm-sand (refusal)
 * elevation from the newest survey whose probe reached it there. Reads at most `maxPerSurvey` soundings of each of the
 * newest `maxSurveys` surveys (an even sample by id), so a large project costs a bounded read.
 */
export async function previousBottomBins(projectId: number, binSize: number, origin: { x: number; y: number }, maxSurveys = 6, maxPerSurvey = 50_000): Promise<{ bottom: Map<string, number>; refusal: Map<string, number> }> {
  const surveys = await Survey.findAll({
    where: { projectId, status: "active" },
    attributes: ["id", "soundingCount"],
    order: [["surveyedOn", "DESC"], ["id", "DESC"]],
    limit: maxSurveys,
  });
  // Firm sand comes from the probe readings of a baseline, which a long project's newest surveys may not include.
  const baseline = await Survey.findOne({ where: { projectId, status: "active", kind: "baseline" }, attributes: ["id", "soundingCount"], order: [["surveyedOn", "DESC"], ["id", "DESC"]] });
  const firmOnly = baseline && !surveys.some((survey) => survey.id === baseline.id) ? baseline : null;
  const bins = new Map<string, number>();
  const refusal = new Map<string, number>();
  for (const survey of firmOnly ? [...surveys, firmOnly] : surveys) {
    const step = Math.max(1, Math.ceil(Number(survey.soundingCount) / maxPerSurvey));
    const rows = await getSequelize().query<{ easting: number; northing: number; elevation: number; refusalElevation: number | null }>(
      "SELECT easting, northing, elevation, refusalElevation FROM soundings WHERE surveyId = ? AND MOD(id, ?) = 0",
      { replacements: [survey.id, step], type: QueryTypes.SELECT },
    );
    const x = Float64Array.from(rows, (row) => Number(row.easting));
    const y = Float64Array.from(rows, (row) => Number(row.northing));
    const z = Float64Array.from(rows, (row) => Number(row.elevation));
    if (survey !== firmOnly) for (const [key, value] of binMedians(x, y, z, binSize, origin, maxPerSurvey)) if (!bins.has(key)) bins.set(key, value);
    const firm = Float64Array.from(rows, (row) => (row.refusalElevation === null ? Number.NaN : Number(row.refusalElevation)));
    for (const [key, value] of binMedians(x, y, firm, binSize, origin, maxPerSurvey)) if (!refusal.has(key)) refusal.set(key, value);
  }
  return { bottom: bins, refusal };
}
