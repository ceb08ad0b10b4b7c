import { randomUUID } from "node:crypto";
import { readFile } from "node:fs/promises";
import type { Transaction } from "sequelize";
import { getSequelize, type StoredPhotoAttributes } from "~/lib/db.server";
import { NotFoundError } from "~/lib/errors";
import { stageUpload, type StagedFile, type StagedUpload } from "~/lib/import/stage-upload.server";
import { deleteObject, getObject, objectKey, putObject, type StoredObject } from "~/lib/storage/storage.server";
import { PHOTO_MAX_BYTES, preparePhoto } from "./photo.server";

/**
 * The one way a feature keeps a photo (a find's, a jar test's, a haul ticket's): the staged file is
 * checked and re-encoded without metadata (`preparePhoto`), the image and its thumbnail are put in
 * the one object store, then the feature writes its rows in one transaction with the photo's
 * columns (db/models/photo-columns.ts). A refused file stores nothing; if the rows cannot be
 * written, the objects are removed again, so the store never keeps an orphan of a failed request.
 */

/** A page's or the API's multipart form with at most one photo, in `file`; UploadRefused when over the photo limit or unreadable. */
export function stagePhotoUpload(request: Request): Promise<StagedUpload> {
  return stageUpload(request, { maxBytes: PHOTO_MAX_BYTES, advice: "Send the photo at a smaller size (a phone's normal setting is well under it)." });
}

/** The photo columns a feature's photo row is created with. */
export type KeptPhoto = Pick<StoredPhotoAttributes, "objectKey" | "thumbnailKey" | "contentType" | "sizeBytes" | "thumbnailSizeBytes" | "widthPx" | "heightPx" | "originalFileName" | "exif">;

/**
 * Keeps the photo under `folder` (object key parts, project first) and calls `record` inside a
 * transaction with its columns; answers what `record` answers.
 */
export async function keepPhoto<T>(staged: StagedFile, folder: ReadonlyArray<string | number>, record: (photo: KeptPhoto, transaction: Transaction) => Promise<T>): Promise<T> {
  const prepared = await preparePhoto(await readFile(staged.path), staged.fileName);
  const name = randomUUID();
  const key = objectKey([...folder, `${name}.${prepared.extension}`]);
  const thumbnailKey = objectKey([...folder, `${name}-thumb.jpg`]);
  const stored: string[] = [];
  try {
    await putObject(key, prepared.bytes, prepared.contentType);
    stored.push(key);
    await putObject(thumbnailKey, prepared.thumbnail, "image/jpeg");
    stored.push(thumbnailKey);
    const photo: KeptPhoto = {
      objectKey: key, thumbnailKey, contentType: prepared.contentType, sizeBytes: prepared.bytes.byteLength, thumbnailSizeBytes: prepared.thumbnail.byteLength,
      widthPx: prepared.widthPx, heightPx: prepared.heightPx, originalFileName: staged.fileName.slice(0, 255), exif: prepared.camera,
    };
    return await getSequelize().transaction((transaction) => record(photo, transaction));
  } catch (error) {
    await Promise.all(stored.map((storedKey) => deleteObject(storedKey).catch(() => undefined)));
    throw error;
  }
}

/** A photo as the pages and the API list it (the camera's data is the feature's to add, or not). */
export interface PhotoView {
  id: number;
  sizeBytes: number;
  widthPx: number;
  heightPx: number;
  originalFileName: string;
  uploadedAt: string;
}

export function presentPhoto(photo: Pick<StoredPhotoAttributes, "sizeBytes" | "widthPx" | "heightPx" | "originalFileName"> & { id: number; createdAt: Date }): PhotoView {
  return { id: photo.id, sizeBytes: photo.sizeBytes, widthPx: photo.widthPx, heightPx: photo.heightPx, originalFileName: photo.originalFileName, uploadedAt: photo.createdAt.toISOString() };
}

/** A kept photo's bytes or its thumbnail's, read after the caller checked access to what it shows. */
export async function keptPhotoBytes(photo: Pick<StoredPhotoAttributes, "objectKey" | "thumbnailKey">, size: "full" | "thumb"): Promise<StoredObject> {
  const object = await getObject(size === "thumb" ? photo.thumbnailKey : photo.objectKey);
  if (!object) throw new NotFoundError("The photo's file is missing from the store.");
  return object;
}
