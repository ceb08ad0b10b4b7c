import mariadb from "mariadb";
import { Sequelize } from "sequelize";
import { getDatabaseSettings } from "./settings";

// One Sequelize instance per process, talking to MariaDB through the `mariadb` connector.
// Times are stored and read in UTC ("+00:00") so a server's local zone never shifts them.

let instance: Sequelize | undefined;

export function getSequelize(): Sequelize {
  if (instance) return instance;
  const env = getDatabaseSettings();
  instance = new Sequelize(env.DB_NAME, env.DB_USER, env.DB_PASSWORD, {
    dialect: "mariadb",
    dialectModule: mariadb,
    host: env.DB_HOST,
    port: env.DB_PORT,
    timezone: "+00:00",
    logging: false,
    dialectOptions: { connectTimeout: 3_000 },
    // Connections are validated on checkout, so a restarted database is picked up again
    // without restarting the app; `acquire` bounds how long a request waits for one.
    pool: { max: 10, min: 0, idle: 10_000, acquire: 5_000, evict: 1_000 },
    define: { underscored: false, freezeTableName: true },
  });
  return instance;
}

export async function closeSequelize(): Promise<void> {
  if (!instance) return;
  const closing = instance;
  instance = undefined;
  await closing.close();
}
