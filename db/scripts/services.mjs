// The services Firmsand's commands bring up besides MariaDB: the local fake SMTP server.
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
