import { QueryTypes, type Transaction } from "sequelize";
import { getSequelize } from "../db.server";
import type { ComputationSurvey } from "./engine-surveys";

/** A survey's soundings as the engine takes them: flat columns in the order they were stored. */
export type SurveySoundings = Omit<ComputationSurvey, "id" | "kind" | "surveyedOn">;

/**
 * The one way the server reads soundings for the engine: each survey's positions, bottom and
 * refusal elevations (project units, converted at import), in stored order. A survey without any
 * refusal reading gets `refusalElevation` null (no probe column); a row without one gets NaN.
 */
export async function loadSurveySoundings(surveyIds: readonly number[], transaction?: Transaction): Promise<Map<number, SurveySoundings>> {
  const result = new Map<number, SurveySoundings>();
  for (const surveyId of surveyIds) {
    const rows = await getSequelize().query<{ easting: number; northing: number; elevation: number; refusalElevation: number | null }>(
      "SELECT easting, northing, elevation, refusalElevation FROM soundings WHERE surveyId = ? ORDER BY id",
      { replacements: [surveyId], type: QueryTypes.SELECT, transaction },
    );
    const count = rows.length;
    const easting = new Float64Array(count);
    const northing = new Float64Array(count);
    const elevation = new Float64Array(count);
    const refusal = new Float64Array(count);
    let anyRefusal = false;
    for (let index = 0; index < count; index++) {
      const row = rows[index];
      easting[index] = row.easting;
      northing[index] = row.northing;
      elevation[index] = row.elevation;
      refusal[index] = row.refusalElevation ?? Number.NaN;
      if (row.refusalElevation !== null) anyRefusal = true;
    }
    result.set(surveyId, { easting, northing, elevation, refusalElevation: anyRefusal ? refusal : null });
  }
  return result;
}
