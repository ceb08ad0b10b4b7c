// `npm run bench`: every benchmark figure of Firmsand, each in its own process so each peak
// memory is its own.
//   engine  the survey engine on seeded synthetic surveys (tests/bench/run.ts; no database)
//   import  a 1,000,000-row file from upload to committed statistics: in process from a staged
//           file (tests/bench/import.ts, with stages), then POSTed to the production build's API
//           (tests/bench/import-http.ts, the server's own peak memory); the test MariaDB's
//           `firmsand_bench` database
//   event-loop  the longest event-loop stall while a 1,000,000-sounding recompute and the map's
//           surfaces run on the request thread and in the engine pool (tests/bench/engine-event-loop.ts)
//   map     navigation to the cells drawn for a 100,000-cell bay in headless Chromium, and the
//           bytes sent (tests/bench/map.ts), against the production build served on BENCH_PORT
//           (default 3200)
//   bodies  six 300 MB forms at once to the sign-in and forgot-password pages of the production
//           build: every answer 413 and the server's memory within 100 MB of before
//           (tests/bench/oversized-bodies.ts)
// Options: --only engine|import|event-loop|map|bodies (repeatable); anything else goes to the engine bench
// (for example --only engine --runs 1). Leaves no process behind: what it started, it stops.
import { spawn } from "node:child_process";
import { bin, buildApp, ensureDebianPackage, ensureNpmPackages, isPortOpen, log, run, takeCheckoutLock, waitFor } from "./lib.mjs";
import { ensureMariaDb, stopMariaDb } from "./db.mjs";

const args = process.argv.slice(2);
const parts = ["engine", "import", "event-loop", "map", "bodies"];
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
    const port = Number(process.env.BENCH_PORT ?? 3200);
    const env = {
      ...process.env, ...database.env, DB_NAME: "firmsand_bench", NODE_ENV: "production", SESSION_SECRET: "firmsand-bench-session-secret-not-for-production",
      APP_ORIGIN: `http://127.0.0.1:${port}`,
    };
    run(bin("tsx"), ["db/migrate.ts", "reset"], { env });
    if (selected.includes("import")) {
      log("bench: sounding import, in process");
      if ((await runStep(bin("tsx"), ["tests/bench/import.ts"], env)) !== 0) failed = true;
    }
    if (selected.includes("event-loop")) {
      log("bench: event loop while the engine works");
      const loopEnv = { ...env, NODE_OPTIONS: [env.NODE_OPTIONS, "--expose-gc"].filter(Boolean).join(" ") };
      if ((await runStep(bin("tsx"), ["tests/bench/engine-event-loop.ts"], loopEnv)) !== 0) failed = true;
    }
    if (selected.includes("import") || selected.includes("map") || selected.includes("bodies")) {
      // The production build, served fresh: the import over HTTP runs first so the server's peak
      // memory (VmHWM) is the import's.
      if (await isPortOpen(port)) throw new Error(`port ${port} is taken; set BENCH_PORT to a free port`);
      const appEnv = { ...env, PORT: String(port), HOST: "127.0.0.1", BENCH_BASE_URL: `http://127.0.0.1:${port}` };
      log("bench: building the app");
      buildApp(appEnv);
      const app = spawn(process.execPath, ["app/serve.mjs", "build/server/index.js"], { stdio: ["ignore", "ignore", "inherit"], env: appEnv });
      cleanups.push(async () => {
        if (app.exitCode !== null) return;
        app.kill("SIGTERM");
        await new Promise((done) => app.once("exit", done));
      });
      await waitFor(() => isPortOpen(port), { timeoutMs: 30_000, what: `the app on port ${port}` });
      const benchEnv = { ...appEnv, BENCH_APP_PID: String(app.pid) };
      if (selected.includes("import")) {
        log("bench: sounding import, over HTTP");
        if ((await runStep(bin("tsx"), ["tests/bench/import-http.ts"], benchEnv)) !== 0) failed = true;
      }
      if (selected.includes("bodies")) {
        log("bench: oversized bodies before sign-in");
        if ((await runStep(bin("tsx"), ["tests/bench/oversized-bodies.ts"], benchEnv)) !== 0) failed = true;
      }
      if (selected.includes("map")) {
        log("bench: coverage map in Chromium");
        const chromium = ensureDebianPackage("chromium", "chromium");
        if ((await runStep(bin("tsx"), ["tests/bench/map.ts"], { ...benchEnv, CHROMIUM_PATH: chromium })) !== 0) failed = true;
      }
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
