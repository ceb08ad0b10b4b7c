// Runs Firmsand's migrations: `npx tsx db/migrate.ts up|down|reset|status`.
//   up      apply every pending migration
//   down    revert the newest migration (`down all` reverts every one)
//   reset   drop every table, then apply all migrations
import { closeSequelize, getSequelize } from "./connection.server";
import { createUmzug, resetDatabase } from "./umzug";

const [command = "up", argument] = process.argv.slice(2);
const sequelize = getSequelize();
const umzug = createUmzug(sequelize);

try {
  if (command === "up") {
    const applied = await umzug.up();
    console.error(`[firmsand] migrations: ${applied.length ? applied.map((m) => m.name).join(", ") : "none pending"}`);
  } else if (command === "down") {
    const reverted = await umzug.down(argument === "all" ? { to: 0 } : undefined);
    console.error(`[firmsand] reverted: ${reverted.map((m) => m.name).join(", ") || "nothing"}`);
  } else if (command === "reset") {
    await resetDatabase(sequelize);
    console.error(`[firmsand] database ${sequelize.getDatabaseName()} reset and migrated`);
  } else if (command === "status") {
    const executed = await umzug.executed();
    const pending = await umzug.pending();
    console.error(`[firmsand] applied: ${executed.map((m) => m.name).join(", ") || "none"}; pending: ${pending.map((m) => m.name).join(", ") || "none"}`);
  } else {
    console.error(`unknown command "${command}" (up, down, reset, status)`);
    process.exitCode = 2;
  }
} catch (error) {
  console.error(error);
  process.exitCode = 1;
} finally {
  await closeSequelize();
}
