import { readdirSync } from "node:fs";
import { dirname, join } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";
import { QueryTypes, type QueryInterface, type Sequelize } from "sequelize";
import { SequelizeStorage, Umzug, type MigrationFn } from "umzug";

// Schema changes are migrations in db/migrations (each with up and down), run by Umzug and
// recorded in the `schema_migrations` table. Never sync({ alter }).

export type Migration = MigrationFn<QueryInterface>;

const MIGRATIONS_DIR = join(dirname(fileURLToPath(import.meta.url)), "migrations");

export function migrationFiles(): string[] {
  return readdirSync(MIGRATIONS_DIR)
    .filter((file) => /^\d{4}-[a-z0-9-]+\.ts$/.test(file) && !file.endsWith(".test.ts"))
    .sort();
}

export function createUmzug(sequelize: Sequelize) {
  return new Umzug<QueryInterface>({
    migrations: migrationFiles().map((file) => {
      const path = join(MIGRATIONS_DIR, file);
      const load = () => import(pathToFileURL(path).href) as Promise<{ up: Migration; down: Migration }>;
      return {
        name: file.replace(/\.ts$/, ""),
        path,
        up: async (params) => (await load()).up(params),
        down: async (params) => (await load()).down(params),
      };
    }),
    context: sequelize.getQueryInterface(),
    storage: new SequelizeStorage({ sequelize, tableName: "schema_migrations" }),
    logger: undefined,
  });
}

/** Drops every table in the database (including ones no migration knows), then runs all migrations up. */
export async function resetDatabase(sequelize: Sequelize): Promise<void> {
  // Raw SELECTs must say QueryTypes.SELECT: Sequelize 6's raw path tries to delete the result's
  // non-configurable `meta` property set by the mariadb 3.5 connector, and throws.
  const rows = await sequelize.query<{ name: string }>(
    "SELECT table_name AS name FROM information_schema.tables WHERE table_schema = DATABASE()",
    { type: QueryTypes.SELECT },
  );
  await sequelize.query("SET FOREIGN_KEY_CHECKS = 0");
  try {
    for (const { name } of rows) {
      await sequelize.query(`DROP TABLE IF EXISTS \`${name.replace(/`/g, "``")}\``);
    }
  } finally {
    await sequelize.query("SET FOREIGN_KEY_CHECKS = 1");
  }
  await createUmzug(sequelize).up();
}
