// `npm test`: the same bring-up as `npm start` for a separate test MariaDB, fake SMTP and fake S3, then
// Vitest (unit + integration against the real MariaDB) and Playwright in Debian's Chromium.
// Leaves no process behind: everything it started, it stops.
//   npm test                  all suites
//   npm test -- --unit        Vitest only
//   npm test -- --e2e         Playwright only (extra arguments go to Playwright)
import { spawn } from "node:child_process";
import {
  bin, buildApp, ensureDebianPackage, ensureNpmPackages, isPortOpen, log, run, takeCheckoutLock, waitFor,
} from "./lib.mjs";
import { ensureMariaDb, stopMariaDb } from "./db.mjs";

const args = process.argv.slice(2);
const onlyUnit = args.includes("--unit");
const onlyE2e = args.includes("--e2e");
const passThrough = args.filter((arg) => arg !== "--unit" && arg !== "--e2e");

// One `npm test` (or `npm run bench`) per checkout at a time: they share the test MariaDB and ports.
await takeCheckoutLock("test-run", "npm test or npm run bench");
ensureNpmPackages();
const { ensureMailServer, ensureS3Server, stopMailServer, stopS3Server } = await import("./services.mjs");
const chromium = onlyUnit ? null : ensureDebianPackage("chromium", "chromium");

const cleanups = [];
let appServer = null;
async function cleanUp() {
  if (appServer && appServer.exitCode === null) {
    appServer.kill("SIGTERM");
    await new Promise((done) => appServer.once("exit", done));
  }
  for (const cleanup of cleanups.reverse()) await cleanup().catch((error) => log(error.message));
}
for (const signal of ["SIGINT", "SIGTERM"]) {
  process.on(signal, () => cleanUp().finally(() => process.exit(130)));
}

function runStep(command, commandArgs, env) {
  return new Promise((done) => {
    const child = spawn(command, commandArgs, { stdio: "inherit", env });
    child.on("exit", (code, signal) => done(code ?? (signal ? 1 : 0)));
  });
}

let failed = false;
try {
  const database = await ensureMariaDb("test");
  if (database.startedHere) cleanups.push(() => stopMariaDb("test"));
  const mail = await ensureMailServer("test", { emptyMailbox: true });
  if (mail.startedHere) cleanups.push(() => stopMailServer("test"));
  const store = await ensureS3Server("test", { emptyStore: true });
  if (store.startedHere) cleanups.push(() => stopS3Server("test"));

  const baseEnv = {
    ...process.env,
    ...database.env,
    ...mail.env,
    ...store.env,
    SESSION_SECRET: "firmsand-test-session-secret-not-for-production",
    DEMO_MODE: "1",
  };

  if (!onlyE2e) {
    const unitEnv = { ...baseEnv, NODE_ENV: "test", DB_NAME: "firmsand_test" };
    run(bin("tsx"), ["db/migrate.ts", "reset"], { env: unitEnv });
    const code = await runStep(bin("vitest"), ["run", ...(onlyUnit ? passThrough : [])], unitEnv);
    if (code !== 0) failed = true;
  }

  if (!onlyUnit) {
    const port = Number(process.env.E2E_PORT ?? 3100);
    if (await isPortOpen(port)) throw new Error(`port ${port} is taken; set E2E_PORT to a free port`);
    const e2eEnv = {
      ...baseEnv,
      NODE_ENV: "production",
      DB_NAME: "firmsand_e2e",
      PORT: String(port),
      HOST: "127.0.0.1",
      BASE_URL: `http://127.0.0.1:${port}`,
      APP_ORIGIN: `http://127.0.0.1:${port}`,
      CHROMIUM_PATH: chromium,
    };
    run(bin("tsx"), ["db/migrate.ts", "reset"], { env: e2eEnv });
    run(bin("tsx"), ["db/seed.ts", "demo"], { env: e2eEnv });
    log("building the app for the browser tests");
    buildApp(e2eEnv);
    // Test settings only this server honours in production (app/lib/settings/env.server.ts): a
    // recompute shows as running for 3 s before it computes, so the running panel is always there to check.
    const serverEnv = { ...e2eEnv, FIRMSAND_TEST_SERVER: "1", RECOMPUTE_HOLD_MS: process.env.RECOMPUTE_HOLD_MS ?? "3000" };
    appServer = spawn(process.execPath, ["app/serve.mjs", "build/server/index.js"], { stdio: ["ignore", "inherit", "inherit"], env: serverEnv });
    await waitFor(() => isPortOpen(port), { timeoutMs: 30_000, what: `the app on port ${port}` });
    const code = await runStep(bin("playwright"), ["test", "-c", "tests/e2e/playwright.config.ts", ...(onlyE2e ? passThrough : [])], e2eEnv);
    if (code !== 0) failed = true;
  }
} catch (error) {
  log(error.stack ?? String(error));
  failed = true;
} finally {
  await cleanUp();
}
log(failed ? "tests FAILED" : "all tests passed");
process.exit(failed ? 1 : 0);
