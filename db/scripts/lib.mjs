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

/** Builds the production app (client and server bundles) into build/. */
export function buildApp(env = process.env) {
  run(bin("react-router"), ["build"], { env });
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
