import { QueryTypes, type Sequelize, type Transaction } from "sequelize";
import type { PreparedSoundings } from "./analyse.server";

/**
 * Writes a survey's soundings with multi-row INSERTs of a few thousand rows each (one round trip
 * per chunk instead of per row), inside the caller's transaction.
 */
export const SOUNDING_CHUNK_ROWS = 4000;

const finiteOrNull = (value: number) => (Number.isFinite(value) ? value : null);

export async function insertSoundings(
  sequelize: Sequelize,
  surveyId: number,
  soundings: PreparedSoundings,
  transaction: Transaction,
  onProgress?: (fraction: number) => void,
): Promise<void> {
  const total = soundings.sourceRow.length;
  for (let start = 0; start < total; start += SOUNDING_CHUNK_ROWS) {
    const end = Math.min(total, start + SOUNDING_CHUNK_ROWS);
    const placeholders: string[] = [];
    const values: unknown[] = [];
    for (let index = start; index < end; index++) {
      placeholders.push("(?,?,?,?,?,?,?,?,?,?)");
      values.push(
        surveyId,
        soundings.sourceRow[index],
        soundings.easting[index],
        soundings.northing[index],
        finiteOrNull(soundings.depth[index]),
        soundings.probe ? finiteOrNull(soundings.probe[index]) : null,
        soundings.elevation[index],
        soundings.refusalElevation ? finiteOrNull(soundings.refusalElevation[index]) : null,
        soundings.time?.[index] ? soundings.time[index].slice(0, 40) : null,
        soundings.pointId?.[index] ? soundings.pointId[index].slice(0, 64) : null,
      );
    }
    await sequelize.query(
      `INSERT INTO soundings (surveyId, sourceRow, easting, northing, depth, probe, elevation, refusalElevation, time, pointId) VALUES ${placeholders.join(",")}`,
      { replacements: values, transaction, type: QueryTypes.INSERT },
    );
    onProgress?.(end / total);
  }
}
