// Seeds a scenario: `npx tsx db/seed.ts demo` (only into a database without users).
import { closeSequelize } from "./connection.server";
import { initModels } from "./models";
import { seedDemo } from "./seeders/demo";
import { seedDemoDiveTeams } from "./seeders/demo-dive-teams";

const [scenario = "demo"] = process.argv.slice(2);
try {
  if (scenario !== "demo") throw new Error(`unknown scenario "${scenario}" (demo)`);
  const outcome = await seedDemo(initModels());
  console.error(outcome === "seeded" ? "[firmsand] demo scenario seeded" : "[firmsand] database already has users: demo seed skipped");
  if ((await seedDemoDiveTeams()) === "seeded") console.error("[firmsand] demo dive teams seeded");
} catch (error) {
  console.error(error);
  process.exitCode = 1;
} finally {
  await closeSequelize();
}
