import { DataTypes, QueryTypes } from "sequelize";
import type { Migration } from "../umzug";

// The project's IHO S-44 survey order, a tolerance beside the firm-sand tolerance: the import form
// offers it as the default order a survey's QA is judged against. Each survey keeps the order it
// was imported with (in its QA); a project that has surveys starts with the order of its newest
// that recorded one, as that is the order its people were choosing, others with 1a (what the import form
// offered until now). The orders are copied here, not imported: a migration keeps the values of its day.
const ORDERS = ["exclusive", "special", "1a", "1b", "2"];

export const up: Migration = async ({ context: queryInterface }) => {
  await queryInterface.addColumn("projects", "surveyOrder", { type: DataTypes.ENUM(...ORDERS), allowNull: false, defaultValue: "1a" });
  const surveys = await queryInterface.sequelize.query<{ projectId: number; qa: unknown }>(
    "SELECT projectId, qa FROM surveys ORDER BY projectId, surveyedOn DESC, id DESC",
    { type: QueryTypes.SELECT },
  );
  const newest = new Map<number, string>();
  for (const survey of surveys) {
    if (newest.has(survey.projectId)) continue;
    const qa = typeof survey.qa === "string" ? (JSON.parse(survey.qa) as Record<string, unknown>) : (survey.qa as Record<string, unknown> | null);
    const order = qa?.surveyOrder ?? qa?.order;
    if (typeof order === "string" && ORDERS.includes(order)) newest.set(survey.projectId, order);
  }
  for (const [projectId, order] of newest) {
    await queryInterface.sequelize.query("UPDATE projects SET surveyOrder = ? WHERE id = ?", { replacements: [order, projectId] });
  }
};

// Plain ALTER TABLE: Sequelize's removeColumn fails on the MariaDB driver's result arrays.
export const down: Migration = async ({ context: queryInterface }) => {
  await queryInterface.sequelize.query("ALTER TABLE `projects` DROP COLUMN `surveyOrder`");
};
