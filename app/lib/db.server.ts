import { ConnectionError } from "sequelize";
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
