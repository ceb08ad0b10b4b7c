// The services Firmsand's commands bring up besides MariaDB: the local fake SMTP server and the
// local fake S3 object store.
import { existsSync, readdirSync, rmSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import {
  DATA_DIR, isPortOpen, isProcessAlive, log, readPid, spawnDetached, stopByPidFile, waitFor,
} from "./lib.mjs";

export const MAIL_PORTS = {
  dev: Number(process.env.SMTP_PORT ?? 2525),
  test: Number(process.env.SMTP_TEST_PORT ?? 2526),
};

function mailPaths(instance) {
  return {
    mailbox: join(DATA_DIR, `mail-${instance}`),
    pidFile: join(DATA_DIR, `mail-${instance}.pid`),
    logFile: join(DATA_DIR, `mail-${instance}.log`),
  };
}

/** Starts the fake SMTP server for `instance` unless ours is already running. */
export async function ensureMailServer(instance, { emptyMailbox = false } = {}) {
  const port = MAIL_PORTS[instance];
  const { mailbox, pidFile, logFile } = mailPaths(instance);
  // Empty the mailbox but keep its folder: a server that is already running writes into it.
  if (emptyMailbox && existsSync(mailbox)) {
    for (const entry of readdirSync(mailbox)) rmSync(join(mailbox, entry), { recursive: true, force: true });
  }
  const env = { SMTP_HOST: "127.0.0.1", SMTP_PORT: String(port), MAILBOX_DIR: mailbox };
  const running = isProcessAlive(readPid(pidFile));
  if (running) return { startedHere: false, env };
  if (await isPortOpen(port)) {
    throw new Error(`port ${port} is taken by another program; set SMTP_PORT (or SMTP_TEST_PORT) to a free port`);
  }
  const pid = spawnDetached(process.execPath, [join("db", "scripts", "mail-server.mjs"), String(port), mailbox], { logFile });
  writeFileSync(pidFile, String(pid));
  await waitFor(async () => {
    if (!isProcessAlive(pid)) throw new Error(`the fake SMTP server exited; see ${logFile}`);
    return isPortOpen(port);
  }, { timeoutMs: 15_000, what: `fake SMTP on port ${port}` });
  log(`fake SMTP (${instance}) on 127.0.0.1:${port}, mailbox ${mailbox}`);
  return { startedHere: true, env };
}

export async function stopMailServer(instance) {
  const stopped = await stopByPidFile(mailPaths(instance).pidFile, `fake SMTP (${instance})`);
  if (stopped) log(`stopped fake SMTP (${instance})`);
  return stopped;
}

export const S3_PORTS = {
  dev: Number(process.env.S3_PORT ?? 4568),
  test: Number(process.env.S3_TEST_PORT ?? 4569),
};

/** The fake store's fixed credentials (s3rver accepts only these); a real store's come from the environment. */
const FAKE_S3_KEY = "S3RVER";

function s3Paths(instance) {
  return {
    directory: join(DATA_DIR, `s3-${instance}`),
    pidFile: join(DATA_DIR, `s3-${instance}.pid`),
    logFile: join(DATA_DIR, `s3-${instance}.log`),
  };
}

/**
 * Starts the fake S3 server for `instance` unless ours is already running; `env` holds the app's
 * S3_* settings. With `emptyStore` a server started here starts with no objects (the tests' database
 * starts empty too, so an object kept from an earlier run would stand where a new record's goes).
 */
export async function ensureS3Server(instance, { emptyStore = false } = {}) {
  const port = S3_PORTS[instance];
  const { directory, pidFile, logFile } = s3Paths(instance);
  const bucket = process.env.S3_BUCKET ?? "firmsand";
  const env = {
    S3_ENDPOINT: `http://127.0.0.1:${port}`, S3_BUCKET: bucket, S3_REGION: "us-east-1",
    S3_ACCESS_KEY_ID: FAKE_S3_KEY, S3_SECRET_ACCESS_KEY: FAKE_S3_KEY,
  };
  if (isProcessAlive(readPid(pidFile))) return { startedHere: false, env };
  if (await isPortOpen(port)) {
    throw new Error(`port ${port} is taken by another program; set S3_PORT (or S3_TEST_PORT) to a free port`);
  }
  if (emptyStore) rmSync(directory, { recursive: true, force: true });
  const pid = spawnDetached(process.execPath, [join("db", "scripts", "s3-server.mjs"), String(port), directory, bucket], { logFile });
  writeFileSync(pidFile, String(pid));
  await waitFor(async () => {
    if (!isProcessAlive(pid)) throw new Error(`the fake S3 server exited; see ${logFile}`);
    return isPortOpen(port);
  }, { timeoutMs: 15_000, what: `fake S3 on port ${port}` });
  log(`fake S3 (${instance}) on 127.0.0.1:${port}, bucket ${bucket}, objects in ${directory}`);
  return { startedHere: true, env };
}

export async function stopS3Server(instance) {
  const stopped = await stopByPidFile(s3Paths(instance).pidFile, `fake S3 (${instance})`);
  if (stopped) log(`stopped fake S3 (${instance})`);
  return stopped;
}
