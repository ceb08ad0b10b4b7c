import { ConnectionError, type Model, type ModelStatic } from "sequelize";
import { getSequelize } from "../../db/connection.server";
import { initModels } from "../../db/models";

// Models are initialised once, when the server first loads a model module.
initModels();

export * from "../../db/models";
export { getSequelize } from "../../db/connection.server";

/**
 * True for the errors Sequelize throws when MariaDB cannot be reached (refused, unknown host, no
 * free connection in time): the database is down or overloaded, not the request wrong.
 */
export function isDatabaseUnreachable(error: unknown): boolean {
  return error instanceof ConnectionError;
}

/** The distinct dates (YYYY-MM-DD) in a DATEONLY column of a project's rows: the days something was logged. */
export async function distinctProjectDates(model: ModelStatic<Model>, column: string, projectId: number): Promise<string[]> {
  const rows = await model.findAll({ where: { projectId }, attributes: [[getSequelize().fn("DISTINCT", getSequelize().col(column)), "day"]], raw: true });
  return rows.map((row) => String((row as unknown as { day: string }).day).slice(0, 10));
}
