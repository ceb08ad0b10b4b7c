import { createHash } from "node:crypto";
import { createReadStream } from "node:fs";
import { z } from "zod";
import { BadRequestError, PayloadTooLargeError, ValidationError } from "~/lib/errors";
import { stagePhotoUpload } from "~/lib/images/stored-photo.server";
import { discardStagedFile, UploadRefused, type StagedFile, type StagedUpload } from "~/lib/import/stage-upload.server";
import type { StoredObject } from "~/lib/storage/storage.server";
import { assertMediaType } from "./body.server";

/**
 * What every API photo route shares: the upload staged within the photo limit, its refusals in
 * the API's one error shape, and the answer that serves a photo's bytes (never kept by shared caches).
 */

/**
 * An API route's photo upload: multipart with the photo in `file` (415 otherwise, 413 over the
 * limit, 422 without a photo); `use` gets the staged file, which is removed afterwards whatever happens.
 */
export async function withApiPhotoUpload<T>(request: Request, use: (file: StagedFile, fields: Record<string, string>) => Promise<T>): Promise<T> {
  assertMediaType(request, "multipart/form-data");
  let staged: StagedUpload;
  try {
    staged = await stagePhotoUpload(request);
  } catch (error) {
    if (error instanceof UploadRefused) throw error.status === 413 ? new PayloadTooLargeError({ field: "file", message: error.message }) : new BadRequestError({ field: "file", message: error.message });
    throw error;
  }
  try {
    if (!staged.file) throw new ValidationError({ field: "file", message: "no photo was sent in the `file` field" });
    return await use(staged.file, staged.fields);
  } finally {
    if (staged.file) await discardStagedFile(staged.file.path);
  }
}

/** SHA-256 (hex) of a staged file, read as a stream: an upload's content for its Idempotency-Key. */
export async function stagedFileDigest(path: string): Promise<string> {
  const hash = createHash("sha256");
  for await (const chunk of createReadStream(path)) hash.update(chunk as Buffer);
  return hash.digest("hex");
}

/** `?size=thumb` for the thumbnail; the full photo by default. */
export const photoQuerySchema = z.object({ size: z.enum(["full", "thumb"], { message: "size is full or thumb" }).default("full") }).strict();

export function photoResponse(photo: StoredObject): Response {
  return new Response(new Uint8Array(photo.bytes), {
    headers: { "Content-Type": photo.contentType, "Content-Length": String(photo.bytes.byteLength), "Cache-Control": "private, no-store" },
  });
}
