import { QueryTypes, type Sequelize, type Transaction } from "sequelize";
import type { PreparedSoundings } from "../../../shared/soundings/prepare";

/**
 * Writes a survey's soundings with multi-row INSERTs of 1,500 rows each (one round trip per chunk
 * instead of per row), inside the caller's transaction. A chunk's statement stays near 100 KB, under
 * V8's large-object size: bigger statements go to the large-object space, which only a full
 * collection frees, and a 1,000,000-row import piled up ~150 MB of them (measured with
 * BENCH_TRACE=1 npm run bench -- --only import).
 */
export const SOUNDING_CHUNK_ROWS = 1_500;

/** A finite number as SQL text (numbers need no escaping), or NULL. */
function sqlNumber(value: number): string {
  return Number.isFinite(value) ? String(value) : "NULL";
}

export async function insertSoundings(
  sequelize: Sequelize,
  surveyId: number,
  soundings: PreparedSoundings,
  transaction: Transaction,
  onProgress?: (fraction: number) => void,
): Promise<void> {
  const total = soundings.sourceRow.length;
  const text = (values: string[] | null, index: number, length: number) => {
    const value = values?.[index];
    return value ? sequelize.escape(value.slice(0, length)) : "NULL";
  };
  // The statement text is built directly: numbers are written as numbers and the only strings
  // (time, point id) go through the connector's escaping. Sequelize's `?` replacement would
  // re-scan every chunk and costs several times more than the insert itself.
  for (let start = 0; start < total; start += SOUNDING_CHUNK_ROWS) {
    const end = Math.min(total, start + SOUNDING_CHUNK_ROWS);
    const rows: string[] = [];
    for (let index = start; index < end; index++) {
      rows.push(
        `(${surveyId},${soundings.sourceRow[index]},${sqlNumber(soundings.easting[index])},${sqlNumber(soundings.northing[index])},` +
          `${sqlNumber(soundings.depth[index])},${soundings.probe ? sqlNumber(soundings.probe[index]) : "NULL"},${sqlNumber(soundings.elevation[index])},` +
          `${soundings.refusalElevation ? sqlNumber(soundings.refusalElevation[index]) : "NULL"},${text(soundings.time, index, 40)},${text(soundings.pointId, index, 64)})`,
      );
    }
    await sequelize.query(
      `INSERT INTO soundings (surveyId, sourceRow, easting, northing, depth, probe, elevation, refusalElevation, time, pointId) VALUES ${rows.join(",")}`,
      { transaction, type: QueryTypes.INSERT },
    );
    onProgress?.(end / total);
  }
}
