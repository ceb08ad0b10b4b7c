import { existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { randomBytes } from "node:crypto";
import { z } from "zod";
import { DATA_DIR, parseEnvironment } from "../../../db/settings";

// Firmsand's environment, parsed once with zod at first use. Every server module reads
// settings from here (the database connection's from db/settings.ts), never from process.env directly.

/** Reads a per-machine secret from the git-ignored data directory, creating it the first time. */
function localSecret(name: string): string {
  const file = join(DATA_DIR, `${name}.secret`);
  if (!existsSync(file)) {
    mkdirSync(DATA_DIR, { recursive: true });
    writeFileSync(file, randomBytes(32).toString("hex"), { mode: 0o600 });
  }
  return readFileSync(file, "utf8").trim();
}

const flag = z
  .enum(["0", "1", "true", "false", ""])
  .default("0")
  .transform((value) => value === "1" || value === "true");

const envSchema = z.object({
  NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
  SMTP_HOST: z.string().min(1).default("127.0.0.1"),
  SMTP_PORT: z.coerce.number().int().min(1).max(65535).default(2525),
  MAIL_FROM: z.string().min(3).default("Firmsand <no-reply@firmsand.localhost>"),
  MAILBOX_DIR: z.string().min(1).default(join(DATA_DIR, "mail-dev")),
  SESSION_SECRET: z.string().min(16, "SESSION_SECRET must be at least 16 characters").optional(),
  /** A sign-in session unused this long ends (hours; 1 hour to 30 days). */
  SESSION_IDLE_HOURS: z.coerce.number({ message: "SESSION_IDLE_HOURS must be a number of hours" }).min(1, "SESSION_IDLE_HOURS must be at least 1").max(720, "SESSION_IDLE_HOURS must be at most 720 (30 days)").default(12),
  /** A sign-in session ends this long after it began, however much it is used (days; 1 to 90). */
  SESSION_MAX_DAYS: z.coerce.number({ message: "SESSION_MAX_DAYS must be a number of days" }).min(1, "SESSION_MAX_DAYS must be at least 1").max(90, "SESSION_MAX_DAYS must be at most 90").default(14),
  DEMO_MODE: flag,
  /**
   * The public origin (scheme://host[:port]) of e-mailed links and the Origin check. Required in
   * production; elsewhere derived from HOST and PORT. Never taken from a request, whose Host
   * header a client chooses.
   */
  APP_ORIGIN: z.preprocess((value) => (value === "" ? undefined : value), z.url().optional())
    .refine((value) => value === undefined || /^https?:$/.test(new URL(value).protocol), "APP_ORIGIN must be an http or https origin")
    .refine((value) => value === undefined || new URL(value).pathname === "/", "APP_ORIGIN must be an origin only (scheme://host[:port]), without a path")
    .transform((value) => (value === undefined ? undefined : new URL(value).origin)),
  /** Where the app serves (`npm start`, `npm run dev`); outside production they make APP_ORIGIN. */
  HOST: z.string().min(1).default("127.0.0.1"),
  PORT: z.coerce.number().int().min(1).max(65535).default(3000),
  /** Trust X-Forwarded-For for the client address (only behind a proxy you run). */
  TRUST_PROXY: flag,
  /** Engine worker threads for imports and the map (0: compute on the request thread, for debugging only). */
  ENGINE_THREADS: z.string().regex(/^\d+$/, "ENGINE_THREADS must be a whole number (0–4)").default("1").transform(Number).pipe(z.number().int().max(4)),
  /** Set by app/serve.mjs for itself: its x-firmsand-client-address header carries the socket address. */
  FIRMSAND_CLIENT_ADDRESS_HEADER: flag,
});

/**
 * The sounding uploads' settings. Parsed on their own, at the first upload rather than at the
 * first database connection, so a test or script that sets them after loading the models still
 * has them taken.
 */
const uploadEnvSchema = z.object({
  /** Where staged sounding files wait between upload and commit (git-ignored by default). */
  UPLOAD_DIR: z.string().min(1).default(join(DATA_DIR, "uploads")),
  /** Largest sounding file accepted, bytes (200 MB). */
  UPLOAD_MAX_BYTES: z.coerce.number().int().positive().default(200 * 1024 * 1024),
  /** Hours an upload may wait unimported and untouched before its staged file is removed: 1 hour to 90 days. */
  UPLOAD_RETENTION_HOURS: z.coerce
    .number({ message: "UPLOAD_RETENTION_HOURS must be a number of hours" })
    .min(1, "UPLOAD_RETENTION_HOURS must be at least 1 hour")
    .max(90 * 24, "UPLOAD_RETENTION_HOURS must be at most 2160 hours (90 days)")
    .default(24),
});
export type UploadEnv = z.infer<typeof uploadEnvSchema>;
let parsedUploads: UploadEnv | undefined;

export function getUploadEnv(): UploadEnv {
  parsedUploads ??= parseEnvironment(uploadEnvSchema);
  return parsedUploads;
}

/**
 * The object store's settings (app/lib/storage/): any S3-compatible endpoint. `npm start` and
 * `npm test` point them at the local fake S3 server they start (db/scripts/s3-server.mjs). Parsed
 * at the first stored or read object, as the uploads' are.
 */
export const storageEnvSchema = z.object({
  S3_ENDPOINT: z.url("S3_ENDPOINT must be a URL such as http://127.0.0.1:4568").refine((value) => /^https?:$/.test(new URL(value).protocol), "S3_ENDPOINT must be an http or https URL").default("http://127.0.0.1:4568"),
  S3_BUCKET: z.string().regex(/^[a-z0-9][a-z0-9.-]{1,61}[a-z0-9]$/, "S3_BUCKET must be a bucket name: 3 to 63 lower-case letters, digits, dots or hyphens").default("firmsand"),
  S3_REGION: z.string().min(1).default("us-east-1"),
  S3_ACCESS_KEY_ID: z.string().min(1, "S3_ACCESS_KEY_ID must not be empty").default("S3RVER"),
  S3_SECRET_ACCESS_KEY: z.string().min(1, "S3_SECRET_ACCESS_KEY must not be empty").default("S3RVER"),
  /** Path-style URLs (endpoint/bucket/key): what the fake and most self-hosted stores need. */
  S3_FORCE_PATH_STYLE: flag.default(true),
  /** How long connecting to the store may take, per attempt (milliseconds; 100 ms to 1 min). */
  S3_CONNECT_TIMEOUT_MS: z.coerce.number({ message: "S3_CONNECT_TIMEOUT_MS must be a number of milliseconds" }).int("S3_CONNECT_TIMEOUT_MS must be a whole number of milliseconds").min(100, "S3_CONNECT_TIMEOUT_MS must be at least 100").max(60_000, "S3_CONNECT_TIMEOUT_MS must be at most 60000 (1 minute)").default(5_000),
  /** How long one request to the store may take from sending to the last byte of its answer, per attempt (milliseconds; 100 ms to 10 min). */
  S3_REQUEST_TIMEOUT_MS: z.coerce.number({ message: "S3_REQUEST_TIMEOUT_MS must be a number of milliseconds" }).int("S3_REQUEST_TIMEOUT_MS must be a whole number of milliseconds").min(100, "S3_REQUEST_TIMEOUT_MS must be at least 100").max(600_000, "S3_REQUEST_TIMEOUT_MS must be at most 600000 (10 minutes)").default(30_000),
  /** Attempts per request, the first included (the SDK retries a store that does not answer with a short back-off): 1 to 5. */
  S3_MAX_ATTEMPTS: z.coerce.number({ message: "S3_MAX_ATTEMPTS must be a number" }).int("S3_MAX_ATTEMPTS must be a whole number").min(1, "S3_MAX_ATTEMPTS must be at least 1").max(5, "S3_MAX_ATTEMPTS must be at most 5").default(2),
});
export type StorageEnv = z.infer<typeof storageEnvSchema>;
let parsedStorage: StorageEnv | undefined;

export function getStorageEnv(): StorageEnv {
  parsedStorage ??= parseEnvironment(storageEnvSchema);
  return parsedStorage;
}

/**
 * Settings for tests only. `RECOMPUTE_HOLD_MS` holds every recompute job this long once it is
 * claimed (running, its stage saying so) before it computes, so a browser test can read the
 * running state however fast the machine is. It is honoured outside production (Vitest, `npm run
 * dev`), and in production only on the server `npm test` starts for the browser tests, which sets
 * `FIRMSAND_TEST_SERVER=1`; anywhere else it is ignored with a warning. Parsed at the first recompute.
 */
const testHooksEnvSchema = z.object({
  NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
  FIRMSAND_TEST_SERVER: flag,
  RECOMPUTE_HOLD_MS: z.coerce
    .number({ message: "RECOMPUTE_HOLD_MS must be a number of milliseconds" })
    .int("RECOMPUTE_HOLD_MS must be a whole number of milliseconds")
    .min(0, "RECOMPUTE_HOLD_MS cannot be negative")
    .max(60_000, "RECOMPUTE_HOLD_MS must be at most 60000 (1 minute)")
    .default(0),
});
export interface TestHooksEnv {
  /** How long a claimed recompute waits before it computes (0: not at all). */
  recomputeHoldMs: number;
}
let parsedTestHooks: TestHooksEnv | undefined;

/** The test-only settings as they apply here (0 wherever they are not honoured). */
export function getTestHooksEnv(): TestHooksEnv {
  if (parsedTestHooks) return parsedTestHooks;
  const value = parseEnvironment(testHooksEnvSchema);
  const honoured = value.NODE_ENV !== "production" || value.FIRMSAND_TEST_SERVER;
  if (!honoured && value.RECOMPUTE_HOLD_MS > 0) {
    process.stderr.write("Firmsand: RECOMPUTE_HOLD_MS is a test setting and is ignored in production (only the browser tests' server, FIRMSAND_TEST_SERVER=1, honours it)\n");
  }
  parsedTestHooks = { recomputeHoldMs: honoured ? value.RECOMPUTE_HOLD_MS : 0 };
  return parsedTestHooks;
}

/** The app's settings; the database's are db/settings.ts (read by the connection). */
export type Env = z.infer<typeof envSchema> & { SESSION_SECRET: string; APP_ORIGIN: string };

let parsed: Env | undefined;

/** The same words as app/serve.mjs's refusal to start. */
const APP_ORIGIN_REQUIRED =
  "Firmsand's environment is not valid: APP_ORIGIN is required in production (the public origin of e-mailed links, e.g. https://firmsand.example.org)";

export function getEnv(): Env {
  if (parsed) return parsed;
  const value = parseEnvironment(envSchema);
  const production = value.NODE_ENV === "production";
  // Outside production a generated secret under .data/ stands in (never committed).
  const sessionSecret = value.SESSION_SECRET ?? (production ? undefined : localSecret("session"));
  if (!sessionSecret) throw new Error("Firmsand's environment is not valid: SESSION_SECRET is required in production");
  const appOrigin = value.APP_ORIGIN ?? (production ? undefined : new URL(`http://${value.HOST}:${value.PORT}`).origin);
  if (!appOrigin) throw new Error(APP_ORIGIN_REQUIRED);
  parsed = { ...value, SESSION_SECRET: sessionSecret, APP_ORIGIN: appOrigin };
  return parsed;
}
