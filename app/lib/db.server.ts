import { initModels } from "../../db/models";

// Models are initialised once, when the server first loads a model module.
initModels();

export * from "../../db/models";
export { getSequelize } from "../../db/connection.server";
