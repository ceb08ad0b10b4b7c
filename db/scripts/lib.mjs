// Bring-up helpers shared by `npm start`, `npm test` and `npm run db:*`.
// Only Node's built-ins here: these run before the npm packages are installed.
import { spawn, spawnSync } from "node:child_process";
import { closeSync, existsSync, mkdirSync, openSync, readFileSync, rmSync, statSync, writeFileSync, writeSync } from "node:fs";
import { connect } from "node:net";
import { dirname, join, resolve } from "node:path";
import { randomBytes } from "node:crypto";
import { fileURLToPath } from "node:url";

export const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), "..", "..");
export const DATA_DIR = join(ROOT, ".data");

export function log(message) {
  process.stderr.write(`[firmsand] ${message}\n`);
}

export function sleep(ms) {
  return new Promise((done) => setTimeout(done, ms));
}

/** Runs a command to completion with inherited output; throws on a non-zero exit. */
export function run(command, args, options = {}) {
  const result = spawnSync(command, args, { stdio: "inherit", cwd: ROOT, ...options });
  if (result.error) throw result.error;
  if (result.status !== 0) {
    throw new Error(`${command} ${args.join(" ")} exited with ${result.status ?? result.signal}`);
  }
  return result;
}

/** Finds an executable on PATH or in the sbin directories Debian puts servers in. */
export function findExecutable(name) {
  const dirs = [...(process.env.PATH ?? "").split(":"), "/usr/sbin", "/usr/local/sbin", "/sbin"];
  for (const dir of dirs) {
    if (!dir) continue;
    const candidate = join(dir, name);
    if (existsSync(candidate)) return candidate;
  }
  return null;
}

let aptUpdated = false;
/** Installs Debian packages with apt-get when a needed executable is missing. */
export function ensureDebianPackage(executable, debianPackage) {
  const found = findExecutable(executable);
  if (found) return found;
  log(`${executable} not found: installing Debian package ${debianPackage}`);
  const asRoot = process.getuid?.() === 0;
  const prefix = asRoot ? [] : ["sudo"];
  const env = { ...process.env, DEBIAN_FRONTEND: "noninteractive" };
  const apt = (args) => {
    const [command, ...rest] = [...prefix, "apt-get", ...args];
    run(command, rest, { env });
  };
  if (!aptUpdated) {
    apt(["update", "-qq"]);
    aptUpdated = true;
  }
  apt(["install", "-y", "-qq", "--no-install-recommends", debianPackage]);
  const installed = findExecutable(executable);
  if (!installed) throw new Error(`${debianPackage} was installed but ${executable} is still missing`);
  return installed;
}

/** Runs `npm ci` when node_modules is missing or older than package-lock.json. */
export function ensureNpmPackages() {
  const marker = join(ROOT, "node_modules", ".package-lock.json");
  const lock = join(ROOT, "package-lock.json");
  const fresh = existsSync(marker) && statSync(marker).mtimeMs >= statSync(lock).mtimeMs;
  if (fresh) return;
  log("installing npm packages (npm ci)");
  run("npm", ["ci", "--no-audit", "--no-fund"]);
}

/** True when something accepts TCP connections on host:port. */
export function isPortOpen(port, host = "127.0.0.1", timeoutMs = 500) {
  return new Promise((done) => {
    const socket = connect({ port, host });
    const finish = (open) => {
      socket.destroy();
      done(open);
    };
    socket.setTimeout(timeoutMs, () => finish(false));
    socket.once("connect", () => finish(true));
    socket.once("error", () => finish(false));
  });
}

export async function waitFor(check, { timeoutMs = 30_000, intervalMs = 100, what = "service" } = {}) {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    if (await check()) return;
    await sleep(intervalMs);
  }
  throw new Error(`timed out after ${timeoutMs} ms waiting for ${what}`);
}

/** Starts a detached background process that outlives this script; returns its pid. */
export function spawnDetached(command, args, { logFile, env = process.env } = {}) {
  let stdio = "ignore";
  if (logFile) {
    mkdirSync(dirname(logFile), { recursive: true });
    const fd = openSync(logFile, "a");
    stdio = ["ignore", fd, fd];
  }
  const child = spawn(command, args, { cwd: ROOT, env, detached: true, stdio });
  child.unref();
  return child.pid;
}

export function isProcessAlive(pid) {
  if (!pid) return false;
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
}

export function readPid(pidFile) {
  if (!existsSync(pidFile)) return null;
  const pid = Number(readFileSync(pidFile, "utf8").trim());
  return Number.isInteger(pid) && pid > 0 ? pid : null;
}

/** Sends SIGTERM to the process in a pid file we wrote and waits until it is gone. */
export async function stopByPidFile(pidFile, what, timeoutMs = 20_000) {
  const pid = readPid(pidFile);
  if (!pid || !isProcessAlive(pid)) return false;
  process.kill(pid, "SIGTERM");
  await waitFor(() => !isProcessAlive(pid), { timeoutMs, what: `${what} to stop` });
  return true;
}

/** A per-machine secret kept under the git-ignored data directory, generated once. */
export function localSecret(name) {
  const file = join(DATA_DIR, `${name}.secret`);
  if (!existsSync(file)) {
    mkdirSync(DATA_DIR, { recursive: true });
    writeFileSync(file, randomBytes(32).toString("hex"), { mode: 0o600 });
  }
  return readFileSync(file, "utf8").trim();
}

/** True when the module at `moduleUrl` is the script node was started with. */
export function isMainModule(moduleUrl) {
  return Boolean(process.argv[1]) && fileURLToPath(moduleUrl) === resolve(process.argv[1]);
}

/** The path of an installed npm package's command (no npx layer, so signals reach it). */
export function bin(name) {
  return join(ROOT, "node_modules", ".bin", name);
}

// Run against the built engine worker: a 10 ft square of muck 2 ft thick on firm sand must plan
// 200 ft³ = 200 / 27 yd³ (27 ft³ per yd³, NIST SP 811). Proves the bundle loads and computes.
const WORKER_CHECK = `
import { Worker } from "node:worker_threads";
const fail = (message) => { process.stderr.write("[firmsand] built engine worker: " + message + "\\n"); process.exit(1); };
const worker = new Worker(process.argv[1], { execArgv: [] });
const timer = setTimeout(() => fail("no answer within 30 s"), 30000);
worker.on("error", (error) => fail(error.message));
// A 10 × 10 ft square, muck top 10 ft over firm sand at 8 ft, sounded every foot: the two jobs of a
// project's engine state (one survey's work, then the state from its rasters) must plan 200 ft³.
const easting = [], northing = [];
for (let x = -1; x <= 11; x++) for (let y = -1; y <= 11; y++) { easting.push(x); northing.push(y); }
const count = easting.length;
const workLimit = [[[[0, 0], [10, 0], [10, 10], [0, 10], [0, 0]]]];
const settings = { cellSize: 5, resolution: 1, maxEdge: 5, originX: 0, originY: 0, rotationDegrees: 0, tolerance: 0.25, firmShare: 0.95, minCoverage: 0.8, surveyNoise: 0.25 };
const lines = {
  cellGrid: { originX: 0, originY: 0, cellSize: 5, rotationDegrees: 0, firstCol: 0, firstRow: 0, cols: 2, rows: 2 },
  rasterGrid: { originX: 0, originY: 0, spacing: 1, cols: 10, rows: 10 },
};
const work = { easting: Float64Array.from(easting), northing: Float64Array.from(northing), elevation: new Float64Array(count).fill(10), refusalElevation: new Float64Array(count).fill(8), count: true };
worker.on("message", (message) => {
  if (message.ready) return worker.postMessage({ kind: "survey", id: 1, work, settings: { maxEdge: 5, rasterGrid: lines.rasterGrid, precision: "float64", cellGrid: lines.cellGrid } });
  if (message.progress) return;
  if (message.error) fail(message.error);
  if (message.id === 1) {
    const { rasters, summary, soundingsPerCell } = message.done.survey;
    const input = {
      inForce: { baseline: { id: 1, kind: "baseline", surveyedOn: "2026-01-01" }, later: [] }, lines,
      sampled: { muckTop: rasters[0], firm: rasters[1], progress: [], surfaces: summary }, soundingsPerCell: [soundingsPerCell],
      workLimit, zones: [], settings, lengthUnit: "ft", waterSurfaceElevation: null, withFigures: true,
    };
    return worker.postMessage({ kind: "state", id: 2, input });
  }
  const planned = message.done?.state?.figures?.totals?.plannedVolume;
  if (!(Math.abs(planned - 200 / 27) < 1e-9)) fail("planned " + planned + " yd³, expected " + 200 / 27);
  clearTimeout(timer);
  worker.terminate();
});
`;

/**
 * Builds the production app (client and server bundles, and the engine worker beside the server
 * bundle: see engineWorkerBuild in vite.config.ts) into build/, then runs the built worker once.
 */
export function buildApp(env = process.env) {
  run(bin("react-router"), ["build"], { env });
  const worker = join(ROOT, "build", "server", "engine-worker.thread.mjs");
  if (!existsSync(worker)) throw new Error(`the build has no engine worker at ${worker} (emitted by engineWorkerBuild in vite.config.ts)`);
  const check = spawnSync(process.execPath, ["--input-type=module", "-e", WORKER_CHECK, worker], { stdio: "inherit", cwd: ROOT, env });
  if (check.status !== 0) throw new Error(`the built engine worker (${worker}) failed its check`);
  log("built engine worker checked");
}

/**
 * Waits until this process holds `.data/<name>.lock` (one `npm test` or `npm run bench` per
 * checkout: they share the test MariaDB and its ports). A lock left by a dead process is taken over.
 */
export async function takeCheckoutLock(name, what) {
  mkdirSync(DATA_DIR, { recursive: true });
  const lockFile = join(DATA_DIR, `${name}.lock`);
  let announced = false;
  for (;;) {
    try {
      const fd = openSync(lockFile, "wx");
      writeSync(fd, String(process.pid));
      closeSync(fd);
      process.on("exit", () => rmSync(lockFile, { force: true }));
      return;
    } catch (error) {
      if (error.code !== "EEXIST") throw error;
      const holder = readPid(lockFile);
      if (holder && !isProcessAlive(holder)) {
        rmSync(lockFile, { force: true });
        continue;
      }
      if (!announced) log(`another ${what} (pid ${holder}) is running in this checkout; waiting for it`);
      announced = true;
      await sleep(1000);
    }
  }
}
