// `npm run bench`: every benchmark figure of Firmsand, each in its own process so each peak
// memory is its own.
//   engine  the survey engine on seeded synthetic surveys (tests/bench/run.ts; no database)
//   import  a 1,000,000-row file from upload to committed statistics (tests/bench/import.ts),
//           against the test MariaDB's `firmsand_bench` database
// Options: --only engine|import (repeatable); anything else goes to the engine bench
// (for example --only engine --runs 1). Leaves no process behind: what it started, it stops.
import { spawn } from "node:child_process";
import { bin, ensureNpmPackages, log, run, takeCheckoutLock } from "./lib.mjs";
import { ensureMariaDb, stopMariaDb } from "./db.mjs";

const args = process.argv.slice(2);
const parts = ["engine", "import"];
const chosen = [];
const passThrough = [];
for (let index = 0; index < args.length; index++) {
  if (args[index] === "--only" && parts.includes(args[index + 1])) chosen.push(args[++index]);
  else passThrough.push(args[index]);
}
const selected = chosen.length > 0 ? chosen : parts;

function runStep(command, commandArgs, env) {
  return new Promise((done) => {
    const child = spawn(command, commandArgs, { stdio: "inherit", env });
    child.on("exit", (code, signal) => done(code ?? (signal ? 1 : 0)));
  });
}

ensureNpmPackages();
let failed = false;
if (selected.includes("engine")) {
  log("bench: survey engine");
  if ((await runStep(bin("tsx"), ["tests/bench/run.ts", ...passThrough], process.env)) !== 0) failed = true;
}

const needsDatabase = selected.some((part) => part !== "engine");
if (needsDatabase) {
  await takeCheckoutLock("test-run", "npm test or npm run bench");
  const cleanups = [];
  const cleanUp = async () => {
    for (const cleanup of cleanups.splice(0).reverse()) await cleanup().catch((error) => log(error.message));
  };
  for (const signal of ["SIGINT", "SIGTERM"]) process.on(signal, () => cleanUp().finally(() => process.exit(130)));
  try {
    const database = await ensureMariaDb("test");
    if (database.startedHere) cleanups.push(() => stopMariaDb("test"));
    const env = { ...process.env, ...database.env, DB_NAME: "firmsand_bench", NODE_ENV: "production", SESSION_SECRET: "firmsand-bench-session-secret-not-for-production" };
    run(bin("tsx"), ["db/migrate.ts", "reset"], { env });
    if (selected.includes("import")) {
      log("bench: sounding import");
      if ((await runStep(bin("tsx"), ["tests/bench/import.ts"], env)) !== 0) failed = true;
    }
  } catch (error) {
    log(error.stack ?? String(error));
    failed = true;
  } finally {
    await cleanUp();
  }
}
log(failed ? "bench FAILED" : "bench done");
process.exit(failed ? 1 : 0);
