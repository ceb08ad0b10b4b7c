// A private MariaDB for Firmsand: data directory inside the repo (.data/, git-ignored), listening
// on 127.0.0.1 only. `npm start` uses the "dev" instance, `npm test` the "test" instance.
//   node db/scripts/db.mjs start [dev|test]   start MariaDB (installing mariadb-server if missing), the fake SMTP and fake S3 servers
//   node db/scripts/db.mjs stop [dev|test|all] stop the instance(s) and the fake SMTP and S3 servers this repo started
//   node db/scripts/db.mjs status
// Only Node's built-ins: this runs before `npm ci` (`start` installs the packages for the mail server).
import { spawnSync } from "node:child_process";
import { existsSync, mkdirSync, rmSync } from "node:fs";
import { join } from "node:path";
import { tmpdir, userInfo } from "node:os";
import { createHash } from "node:crypto";
import {
  DATA_DIR, ROOT, ensureDebianPackage, ensureNpmPackages, findExecutable, isMainModule, isPortOpen, isProcessAlive, localSecret, log,
  readPid, spawnDetached, stopByPidFile, waitFor,
} from "./lib.mjs";
import { ensureMailServer, ensureS3Server, stopMailServer, stopS3Server } from "./services.mjs";

export const INSTANCES = {
  dev: { port: Number(process.env.DB_PORT ?? 3307), databases: [process.env.DB_NAME ?? "firmsand"] },
  test: { port: Number(process.env.DB_TEST_PORT ?? 3308), databases: ["firmsand_test", "firmsand_e2e", "firmsand_bench", "firmsand_load"] },
};

function paths(instance) {
  const dataDir = join(DATA_DIR, `mariadb-${instance}`);
  // Unix socket paths are limited to 107 bytes; fall back to /tmp for deep checkouts.
  let socket = join(DATA_DIR, `mariadb-${instance}.sock`);
  if (Buffer.byteLength(socket) > 100) {
    const tag = createHash("sha1").update(ROOT).digest("hex").slice(0, 10);
    socket = join(tmpdir(), `firmsand-${tag}-${instance}.sock`);
  }
  return {
    dataDir,
    socket,
    pidFile: join(DATA_DIR, `mariadb-${instance}.pid`),
    logFile: join(DATA_DIR, `mariadb-${instance}.log`),
  };
}

export function databaseCredentials() {
  return {
    user: process.env.DB_USER ?? "firmsand",
    password: process.env.DB_PASSWORD ?? localSecret("mariadb-app-password"),
  };
}

function rootSql(socket, sql) {
  const client = findExecutable("mariadb") ?? findExecutable("mysql");
  if (!client) throw new Error("the mariadb client is missing (Debian package mariadb-client)");
  return spawnSync(client, ["--no-defaults", `--socket=${socket}`, "-uroot", "-e", sql], { encoding: "utf8" });
}

function quote(value) {
  return `'${String(value).replace(/\\/g, "\\\\").replace(/'/g, "\\'")}'`;
}

/**
 * Makes sure a MariaDB for `instance` answers on 127.0.0.1:port with its databases and the
 * application user. Starts a private server when nothing is listening there.
 * Returns `{ startedHere, port, env }`; `env` holds the DB_* variables for the app.
 */
export async function ensureMariaDb(instance) {
  const config = INSTANCES[instance];
  if (!config) throw new Error(`unknown database instance "${instance}"`);
  const { port, databases } = config;
  const { dataDir, socket, pidFile, logFile } = paths(instance);
  const credentials = databaseCredentials();
  const env = {
    DB_HOST: "127.0.0.1",
    DB_PORT: String(port),
    DB_NAME: databases[0],
    DB_USER: credentials.user,
    DB_PASSWORD: credentials.password,
  };

  const ours = isProcessAlive(readPid(pidFile));
  if (!ours && (await isPortOpen(port))) {
    // Someone else's server (or ours started from another checkout): use it as it is.
    log(`MariaDB already reachable on 127.0.0.1:${port}; using it`);
    return { startedHere: false, port, env };
  }

  if (!ours) {
    const server = ensureDebianPackage("mariadbd", "mariadb-server");
    if (!existsSync(join(dataDir, "mysql"))) {
      log(`initialising a private MariaDB data directory in ${dataDir}`);
      rmSync(dataDir, { recursive: true, force: true });
      mkdirSync(dataDir, { recursive: true });
      const installDb = findExecutable("mariadb-install-db") ?? findExecutable("mysql_install_db");
      const init = spawnSync(installDb, [
        "--no-defaults", `--datadir=${dataDir}`, `--user=${userInfo().username}`,
        "--auth-root-authentication-method=normal", "--skip-test-db",
      ], { encoding: "utf8" });
      if (init.status !== 0) throw new Error(`mariadb-install-db failed:\n${init.stdout}\n${init.stderr}`);
    }
    log(`starting MariaDB (${instance}) on 127.0.0.1:${port}`);
    const pid = spawnDetached(server, [
      "--no-defaults", `--datadir=${dataDir}`, `--socket=${socket}`, `--port=${port}`,
      "--bind-address=127.0.0.1", `--user=${userInfo().username}`, `--pid-file=${pidFile}`,
      `--log-error=${logFile}`, "--skip-name-resolve", "--innodb-buffer-pool-size=256M",
      "--character-set-server=utf8mb4", "--collation-server=utf8mb4_unicode_ci",
    ]);
    await waitFor(async () => {
      if (!isProcessAlive(pid)) throw new Error(`MariaDB exited during start-up; see ${logFile}`);
      return (await isPortOpen(port)) && rootSql(socket, "SELECT 1").status === 0;
    }, { timeoutMs: 60_000, what: `MariaDB on port ${port}` });
  }

  const statements = [];
  for (const host of ["127.0.0.1", "localhost"]) {
    statements.push(`CREATE USER IF NOT EXISTS ${quote(credentials.user)}@${quote(host)} IDENTIFIED BY ${quote(credentials.password)}`);
    statements.push(`ALTER USER ${quote(credentials.user)}@${quote(host)} IDENTIFIED BY ${quote(credentials.password)}`);
    for (const database of databases) {
      statements.push(`GRANT ALL PRIVILEGES ON \`${database}\`.* TO ${quote(credentials.user)}@${quote(host)}`);
    }
  }
  for (const database of databases) {
    statements.push(`CREATE DATABASE IF NOT EXISTS \`${database}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
  }
  const setup = rootSql(socket, statements.join(";\n") + ";");
  if (setup.status !== 0) throw new Error(`could not create the Firmsand databases:\n${setup.stderr}`);
  return { startedHere: !ours, port, env };
}

export async function stopMariaDb(instance) {
  const { pidFile } = paths(instance);
  const stopped = await stopByPidFile(pidFile, `MariaDB (${instance})`);
  if (stopped) log(`stopped MariaDB (${instance})`);
  return stopped;
}

async function main() {
  const [command = "status", which = "dev"] = process.argv.slice(2);
  if (command === "start") {
    const { env } = await ensureMariaDb(which);
    log(`MariaDB (${which}) ready: mysql://${env.DB_USER}@${env.DB_HOST}:${env.DB_PORT}/${env.DB_NAME}`);
    // `stop` stops them all, so `start` brings them all back (the fake servers need the npm packages).
    ensureNpmPackages();
    const mail = await ensureMailServer(which);
    log(`fake SMTP (${which}) ready on ${mail.env.SMTP_HOST}:${mail.env.SMTP_PORT}`);
    const store = await ensureS3Server(which);
    log(`fake S3 (${which}) ready on ${store.env.S3_ENDPOINT}`);
  } else if (command === "stop") {
    const targets = which === "all" || process.argv.length <= 3 ? Object.keys(INSTANCES) : [which];
    let any = false;
    for (const instance of targets) {
      any = (await stopMariaDb(instance)) || any;
      any = (await stopMailServer(instance)) || any;
      any = (await stopS3Server(instance)) || any;
    }
    if (!any) log("no private MariaDB, fake SMTP or fake S3 of this checkout was running");
  } else if (command === "status") {
    for (const [instance, { port }] of Object.entries(INSTANCES)) {
      const alive = isProcessAlive(readPid(paths(instance).pidFile));
      log(`${instance}: ${alive ? "running" : "stopped"} (port ${port})`);
    }
  } else {
    log(`unknown command "${command}" (start, stop, status)`);
    process.exit(2);
  }
}

if (isMainModule(import.meta.url)) {
  main().catch((error) => {
    log(error.message);
    process.exit(1);
  });
}
