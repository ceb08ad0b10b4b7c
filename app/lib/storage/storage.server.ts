import { DeleteObjectCommand, GetObjectCommand, ListObjectsV2Command, NoSuchKey, PutObjectCommand, S3Client, S3ServiceException } from "@aws-sdk/client-s3";
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
  });
  return client;
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
  await s3().send(new PutObjectCommand({ Bucket: getStorageEnv().S3_BUCKET, Key: key, Body: bytes, ContentType: contentType, ContentLength: bytes.byteLength }));
}

/** The object's bytes and type, or null when there is no object under `key`. */
export async function getObject(key: string): Promise<StoredObject | null> {
  try {
    const answer = await s3().send(new GetObjectCommand({ Bucket: getStorageEnv().S3_BUCKET, Key: key }));
    if (!answer.Body) return null;
    const bytes = Buffer.from(await answer.Body.transformToByteArray());
    return { bytes, contentType: answer.ContentType ?? "application/octet-stream" };
  } catch (error) {
    if (error instanceof NoSuchKey || (error instanceof S3ServiceException && error.$metadata.httpStatusCode === 404)) return null;
    throw error;
  }
}

/** Removes the object; removing one that is not there is not an error (S3's own rule). */
export async function deleteObject(key: string): Promise<void> {
  await s3().send(new DeleteObjectCommand({ Bucket: getStorageEnv().S3_BUCKET, Key: key }));
}

/** Every key under a prefix (e.g. a project's "projects/7/"), for housekeeping and checks. */
export async function listObjectKeys(prefix: string): Promise<string[]> {
  const keys: string[] = [];
  let continuationToken: string | undefined;
  do {
    const page = await s3().send(new ListObjectsV2Command({ Bucket: getStorageEnv().S3_BUCKET, Prefix: prefix, ContinuationToken: continuationToken }));
    for (const entry of page.Contents ?? []) if (entry.Key) keys.push(entry.Key);
    continuationToken = page.IsTruncated ? page.NextContinuationToken : undefined;
  } while (continuationToken);
  return keys;
}
