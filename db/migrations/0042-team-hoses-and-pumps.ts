import { DataTypes, QueryTypes } from "sequelize";
import type { Migration } from "../umzug";

// A dive team's hoses and pumps, each with its name and diameter (shared/dive-plan/equipment.ts):
// `hoses` held names only and becomes [{name, diameter, diameterUnit}], and `pumps` is new. The
// old list was "hoses and pumps, one a line", so a name with the word "pump" in it moves to the
// pumps; the rest stay hoses. No diameter was ever given, so every one is null (the teams page says
// "diameter not given" until someone adds it), in the unit of the project's length unit family.
// Down keeps the names, hoses then pumps, and drops the diameters.

const isPump = (name: string) => /\bpumps?\b/i.test(name);

export const up: Migration = async ({ context: queryInterface }) => {
  await queryInterface.addColumn("dive_teams", "pumps", { type: DataTypes.JSON, allowNull: true });
  const teams = await queryInterface.sequelize.query<{ id: number; hoses: unknown; lengthUnit: string }>(
    "SELECT dive_teams.id, dive_teams.hoses, projects.lengthUnit FROM dive_teams JOIN projects ON projects.id = dive_teams.projectId",
    { type: QueryTypes.SELECT },
  );
  for (const team of teams) {
    const names = (typeof team.hoses === "string" ? JSON.parse(team.hoses) : team.hoses) as unknown[];
    const diameterUnit = team.lengthUnit === "m" ? "mm" : "in";
    const entry = (name: string) => ({ name, diameter: null, diameterUnit });
    const strings = names.filter((name): name is string => typeof name === "string");
    await queryInterface.sequelize.query("UPDATE dive_teams SET hoses = ?, pumps = ? WHERE id = ?", {
      replacements: [JSON.stringify(strings.filter((name) => !isPump(name)).map(entry)), JSON.stringify(strings.filter(isPump).map(entry)), team.id],
    });
  }
  await queryInterface.sequelize.query("UPDATE dive_teams SET pumps = '[]' WHERE pumps IS NULL");
  await queryInterface.changeColumn("dive_teams", "pumps", { type: DataTypes.JSON, allowNull: false });
};

export const down: Migration = async ({ context: queryInterface }) => {
  const teams = await queryInterface.sequelize.query<{ id: number; hoses: unknown; pumps: unknown }>("SELECT id, hoses, pumps FROM dive_teams", { type: QueryTypes.SELECT });
  for (const team of teams) {
    const read = (value: unknown) => ((typeof value === "string" ? JSON.parse(value) : value) ?? []) as Array<{ name: string }>;
    const names = [...read(team.hoses), ...read(team.pumps)].map((entry) => entry.name);
    await queryInterface.sequelize.query("UPDATE dive_teams SET hoses = ? WHERE id = ?", { replacements: [JSON.stringify(names), team.id] });
  }
  // Plain ALTER TABLE: Sequelize's removeColumn fails on the MariaDB driver's result arrays.
  await queryInterface.sequelize.query("ALTER TABLE `dive_teams` DROP COLUMN `pumps`");
};
