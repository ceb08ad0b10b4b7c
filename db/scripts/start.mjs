// `npm start`: everything a fresh machine needs to run Firmsand with its demo scenario.
// Installs what is missing, brings up the private MariaDB, the fake SMTP and fake S3 servers, migrates,
// seeds the demo when the database is empty, builds and serves on http://127.0.0.1:3000.
import { spawn } from "node:child_process";
import { bin, buildApp, ensureNpmPackages, localSecret, log, run } from "./lib.mjs";
import { ensureMariaDb } from "./db.mjs";

ensureNpmPackages();
const { ensureMailServer, ensureS3Server } = await import("./services.mjs");
const database = await ensureMariaDb("dev");
const mail = await ensureMailServer("dev");
const store = await ensureS3Server("dev");

const env = {
  ...process.env,
  ...database.env,
  ...mail.env,
  ...store.env,
  NODE_ENV: "production",
  DEMO_MODE: process.env.DEMO_MODE ?? "1",
  SESSION_SECRET: process.env.SESSION_SECRET ?? localSecret("session"),
  PORT: process.env.PORT ?? "3000",
  HOST: process.env.HOST ?? "127.0.0.1",
};
// Behind a proxy the caller sets APP_ORIGIN; else the links in e-mail name where the app serves.
env.APP_ORIGIN = process.env.APP_ORIGIN || `http://${env.HOST}:${env.PORT}`;

run(bin("tsx"), ["db/migrate.ts", "up"], { env });
run(bin("tsx"), ["db/seed.ts", "demo"], { env });
log("building the app");
buildApp(env);

log(`serving Firmsand on http://${env.HOST}:${env.PORT} (Ctrl-C stops the app; npm run db:stop stops the database)`);
const server = spawn(process.execPath, ["app/serve.mjs", "build/server/index.js"], { stdio: "inherit", env });
for (const signal of ["SIGINT", "SIGTERM"]) process.on(signal, () => server.kill(signal));
server.on("exit", (code) => process.exit(code ?? 0));
