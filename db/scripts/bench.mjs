// `npm run bench`: every benchmark figure of Firmsand, each in its own process so each peak
// memory is its own.
//   engine  the survey engine on seeded synthetic surveys (tests/bench/run.ts; no database)
//   engine-files  the engine end to end from sounding files: both seeded scenarios through the
//           command line, alternated with a reference pipeline of general-purpose packages, medians
//           and ratios of time and peak memory (tests/bench/engine-files.ts; --runs N, --scenario, --cli)
//   import  a 1,000,000-row file from upload to committed statistics: in process from a staged
//           file (tests/bench/import.ts, with stages), then POSTed to the production build's API
//           (tests/bench/import-http.ts, the server's own peak memory); the test MariaDB's
//           `firmsand_bench` database
//   event-loop  the longest event-loop stall while a 1,000,000-sounding recompute and the map's
//           surfaces run on the request thread and in the engine pool (tests/bench/engine-event-loop.ts)
//   period  the longest event-loop stall while a pay period's figures are computed from a synthetic
//           bay's engine state, on the request thread and in the engine pool, and that both give the
//           same figures (tests/bench/period-event-loop.ts; no database)
//   map     navigation to the cells drawn for a 100,000-cell bay in headless Chromium, and the
//           bytes sent (tests/bench/map.ts), against the production build served on BENCH_PORT
//           (default 3200)
//   map-demo  the same for the seeded demo project (a few hundred cells; database `firmsand_load`)
//   bodies  six 300 MB forms at once to the sign-in and forgot-password pages of the production
//           build: every answer 413 and the server's memory within 100 MB of before
//           (tests/bench/oversized-bodies.ts)
//   load    50 signed-in connections on the map's cells, the progress figures and the overview page
//           of the seeded demo (database `firmsand_load`), beside the server's floor (/healthz), with
//           autocannon against the production build (tests/bench/load.ts; --duration, --connections, --runs)
// Options: --only engine|engine-files|import|event-loop|period|map|map-demo|bodies|load (repeatable); anything else goes
// to the engine, map and load benches (for example --only engine --runs 1, --only map-demo --profile /tmp/p).
// Leaves no process behind: what it started, it stops.
import { spawn } from "node:child_process";
import { join } from "node:path";
import { DATA_DIR, bin, buildApp, ensureDebianPackage, readPid, ensureNpmPackages, isPortOpen, log, run, takeCheckoutLock, waitFor } from "./lib.mjs";
import { ensureMariaDb, stopMariaDb } from "./db.mjs";
import { ensureS3Server, stopS3Server } from "./services.mjs";

const args = process.argv.slice(2);
const parts = ["engine", "engine-files", "import", "event-loop", "period", "map", "map-demo", "bodies", "load"];
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

if (selected.includes("engine-files")) {
  log("bench: survey engine from files, beside the reference pipeline");
  run(process.execPath, ["app/cli/build.mjs"]);
  if ((await runStep(bin("tsx"), ["tests/bench/engine-files.ts", ...passThrough], process.env)) !== 0) failed = true;
}

if (selected.includes("period")) {
  log("bench: event loop while a pay period is computed");
  const periodEnv = { ...process.env, NODE_OPTIONS: [process.env.NODE_OPTIONS, "--expose-gc"].filter(Boolean).join(" ") };
  if ((await runStep(bin("tsx"), ["tests/bench/period-event-loop.ts"], periodEnv)) !== 0) failed = true;
}

const needsDatabase = selected.some((part) => part !== "engine" && part !== "engine-files" && part !== "period");
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
    let built = false;
    /** Serves the production build (built once per bench run) with `appEnv`; stopped at clean-up or by the returned function. */
    const serveApp = async (appEnv) => {
      if (await isPortOpen(port)) throw new Error(`port ${port} is taken; set BENCH_PORT to a free port`);
      if (!built) {
        log("bench: building the app");
        buildApp(appEnv);
        built = true;
      }
      // BENCH_APP_NODE_ARGS: Node options for the served app alone, e.g. "--cpu-prof --cpu-prof-dir=/tmp/p"
      // to see where a request's time goes under the load (Node refuses --cpu-prof in NODE_OPTIONS).
      const nodeArgs = (process.env.BENCH_APP_NODE_ARGS ?? "").split(" ").filter(Boolean);
      const app = spawn(process.execPath, [...nodeArgs, "app/serve.mjs", "build/server/index.js"], { stdio: ["ignore", "ignore", "inherit"], env: appEnv });
      const stop = async () => {
        if (app.exitCode !== null) return;
        app.kill("SIGTERM");
        await new Promise((done) => app.once("exit", done));
      };
      cleanups.push(stop);
      await waitFor(() => isPortOpen(port), { timeoutMs: 30_000, what: `the app on port ${port}` });
      return { app, stop };
    };
    const baseUrl = `http://127.0.0.1:${port}`;
    if (selected.includes("import") || selected.includes("map") || selected.includes("bodies")) {
      // The production build, served fresh: the import over HTTP runs first so the server's peak
      // memory (VmHWM) is the import's.
      const appEnv = { ...env, PORT: String(port), HOST: "127.0.0.1", BENCH_BASE_URL: baseUrl };
      const { app, stop } = await serveApp(appEnv);
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
        if ((await runStep(bin("tsx"), ["tests/bench/map.ts", ...passThrough], { ...benchEnv, CHROMIUM_PATH: chromium })) !== 0) failed = true;
      }
      await stop();
    }
    if (selected.includes("load") || selected.includes("map-demo")) {
      // The demo project seeded into a database of its own (its finds' photos need the fake store).
      const store = await ensureS3Server("test");
      if (store.startedHere) cleanups.push(() => stopS3Server("test"));
      const loadEnv = { ...env, ...store.env, DB_NAME: "firmsand_load", DEMO_MODE: "1", PORT: String(port), HOST: "127.0.0.1", BENCH_BASE_URL: baseUrl };
      log("bench: seeding the demo (not part of the figures)");
      run(bin("tsx"), ["db/migrate.ts", "reset"], { env: loadEnv });
      run(bin("tsx"), ["db/seed.ts", "demo"], { env: loadEnv });
      let { app, stop } = await serveApp(loadEnv);
      if (selected.includes("map-demo")) {
        log("bench: the demo's coverage map in Chromium");
        const chromium = ensureDebianPackage("chromium", "chromium");
        if ((await runStep(bin("tsx"), ["tests/bench/map.ts", "--demo", ...passThrough], { ...loadEnv, BENCH_APP_PID: String(app.pid), CHROMIUM_PATH: chromium })) !== 0) failed = true;
        if (selected.includes("load")) {
          // A fresh server for the load (the map's visits would otherwise have warmed its caches).
          await stop();
          ({ app, stop } = await serveApp(loadEnv));
        }
      }
      if (selected.includes("load")) {
        log("bench: reads under load");
        const databasePid = readPid(join(DATA_DIR, "mariadb-test.pid"));
        const benchEnv = { ...loadEnv, BENCH_APP_PID: String(app.pid), ...(databasePid ? { BENCH_DB_PID: String(databasePid) } : {}) };
        if ((await runStep(bin("tsx"), ["tests/bench/load.ts", ...passThrough], benchEnv)) !== 0) failed = true;
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
