import { DeleteObjectCommand, GetObjectCommand, ListObjectsV2Command, NoSuchKey, PutObjectCommand, S3Client, S3ServiceException } from "@aws-sdk/client-s3";
import { ServiceUnavailableError } from "~/lib/errors";
import { getStorageEnv } from "~/lib/settings/env.server";

/**
 * Firmsand's one way to keep files (find photos now; haul-ticket photos, jar tests and signed
 * daily reports later): objects in an S3-compatible store named by the environment (S3_ENDPOINT,
 * S3_BUCKET, keys), so app servers keep no files of their own. In the demo and the tests the
 * store is the local fake S3 server that `npm start` and `npm test` bring up.
 *
 * Callers choose the key with `objectKey` (project first, so a project's objects sit together),
 * keep it in their own table, and check permissions before calling `getObject`: the store is never
 * reachable from a browser, every byte is served through a route that has asked the one table.
 */

export interface StoredObject {
  bytes: Buffer;
  contentType: string;
}

let client: S3Client | undefined;

function s3(): S3Client {
  if (client) return client;
  const env = getStorageEnv();
  client = new S3Client({
    endpoint: env.S3_ENDPOINT,
    region: env.S3_REGION,
    forcePathStyle: env.S3_FORCE_PATH_STYLE,
    credentials: { accessKeyId: env.S3_ACCESS_KEY_ID, secretAccessKey: env.S3_SECRET_ACCESS_KEY },
    // Without these a store that accepts the connection and never answers holds the request (and a
    // signature's PDF job) forever: the SDK's defaults are no timeout at all. Each attempt is bounded;
    // the SDK tries at most S3_MAX_ATTEMPTS times, with its own short back-off between.
    // requestTimeout runs until the answer's headers; socketTimeout (inactivity) covers a body that stalls after them.
    requestHandler: { connectionTimeout: env.S3_CONNECT_TIMEOUT_MS, requestTimeout: env.S3_REQUEST_TIMEOUT_MS, throwOnRequestTimeout: true, socketTimeout: env.S3_REQUEST_TIMEOUT_MS },
    maxAttempts: env.S3_MAX_ATTEMPTS,
  });
  return client;
}

/** What says the store itself did not answer (refused, reset, timed out, or a 5xx), as against a request it refused. */
const UNREACHABLE_CODES = new Set(["ECONNREFUSED", "ECONNRESET", "EHOSTUNREACH", "ENETUNREACH", "ENOTFOUND", "EAI_AGAIN", "EPIPE", "ECONNABORTED"]);
function unreachableCause(error: unknown): string | null {
  if (!(error instanceof Error)) return null;
  const code = (error as { code?: unknown }).code;
  if (error.name === "TimeoutError" || error.name === "RequestTimeout" || code === "ETIMEDOUT" || /timed? ?out/i.test(error.message)) return "timed out";
  if (typeof code === "string" && UNREACHABLE_CODES.has(code)) return code;
  if (error instanceof S3ServiceException && (error.$metadata.httpStatusCode ?? 0) >= 500) return `status ${error.$metadata.httpStatusCode}`;
  const nested = (error as { cause?: unknown }).cause;
  return nested && nested !== error ? unreachableCause(nested) : null;
}

/**
 * Sends one command; a store that does not answer becomes a ServiceUnavailableError naming the
 * file storage (503 with Retry-After through the API), so callers can tell "try again later" from
 * a fault of ours. The endpoint's address stays in the server's log, not in the answer.
 */
async function send<Output>(request: (client: S3Client) => Promise<Output>): Promise<Output> {
  try {
    return await request(s3());
  } catch (error) {
    throw asUnavailable(error);
  }
}

/** A failure that says the store did not answer, as StorageUnavailableError (logged); anything else as it is. */
function asUnavailable(error: unknown): unknown {
  if (error instanceof StorageUnavailableError) return error;
  const cause = unreachableCause(error);
  if (cause === null) return error;
  process.stderr.write(`Firmsand: the file storage did not answer (${cause}): ${(error as Error).message}\n`);
  return new StorageUnavailableError(cause);
}

/** The file storage did not answer; nothing was stored, and the request may be tried again shortly. */
export class StorageUnavailableError extends ServiceUnavailableError {
  constructor(readonly reason: string) {
    super(`Firmsand's file storage is not answering right now (${reason}). Nothing was stored or sent; try again in a minute.`, 60);
  }
}

const KEY_PART = /^[A-Za-z0-9][A-Za-z0-9._-]{0,127}$/;

/**
 * A key from its parts, e.g. objectKey(["projects", 7, "finds", 12, "photos", "3f…c.jpg"]).
 * Parts are plain names (letters, digits, dot, dash, underscore), so no part can climb out of its
 * folder or smuggle a second one in.
 */
export function objectKey(parts: ReadonlyArray<string | number>): string {
  const names = parts.map(String);
  const bad = names.find((name) => !KEY_PART.test(name) || name === "." || name === "..");
  if (names.length === 0 || bad !== undefined) throw new Error(`not an object key part: "${bad ?? ""}"`);
  return names.join("/");
}

export async function putObject(key: string, bytes: Uint8Array, contentType: string): Promise<void> {
  await send((store) => store.send(new PutObjectCommand({ Bucket: getStorageEnv().S3_BUCKET, Key: key, Body: bytes, ContentType: contentType, ContentLength: bytes.byteLength })));
}

/** The object's bytes and type, or null when there is no object under `key`. */
export async function getObject(key: string): Promise<StoredObject | null> {
  try {
    const answer = await send((store) => store.send(new GetObjectCommand({ Bucket: getStorageEnv().S3_BUCKET, Key: key })));
    if (!answer.Body) return null;
    const bytes = Buffer.from(await answer.Body.transformToByteArray());
    return { bytes, contentType: answer.ContentType ?? "application/octet-stream" };
  } catch (error) {
    if (error instanceof NoSuchKey || (error instanceof S3ServiceException && error.$metadata.httpStatusCode === 404)) return null;
    // Also a body that stalls after the answer's headers (the socket's inactivity timeout).
    throw asUnavailable(error);
  }
}

/** Removes the object; removing one that is not there is not an error (S3's own rule). */
export async function deleteObject(key: string): Promise<void> {
  await send((store) => store.send(new DeleteObjectCommand({ Bucket: getStorageEnv().S3_BUCKET, Key: key })));
}

/** Every key under a prefix (e.g. a project's "projects/7/"), for housekeeping and checks. */
export async function listObjectKeys(prefix: string): Promise<string[]> {
  const keys: string[] = [];
  let continuationToken: string | undefined;
  do {
    const page = await send((store) => store.send(new ListObjectsV2Command({ Bucket: getStorageEnv().S3_BUCKET, Prefix: prefix, ContinuationToken: continuationToken })));
    for (const entry of page.Contents ?? []) if (entry.Key) keys.push(entry.Key);
    continuationToken = page.IsTruncated ? page.NextContinuationToken : undefined;
  } while (continuationToken);
  return keys;
}
