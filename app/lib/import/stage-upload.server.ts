import { createHash, randomBytes } from "node:crypto";
import { createWriteStream } from "node:fs";
import { mkdir, rm, stat } from "node:fs/promises";
import { join } from "node:path";
import { Writable } from "node:stream";
import { pipeline } from "node:stream/promises";
import { FormDataParseError, MaxFileSizeExceededError, MaxTotalSizeExceededError, parseFormData, type FileUpload } from "@remix-run/form-data-parser";
import { uploadSettings } from "./settings.server";

/**
 * Receives a multipart upload: the `file` part goes to a staging file under UPLOAD_DIR, hashed
 * (SHA-256) while it is written, and the other fields come back as strings. A file over the size
 * limit is a 413; a body that is not form data a 400.
 */
export interface StagedFile {
  path: string;
  fileName: string;
  size: number;
  sha256: string;
}

export interface StagedUpload {
  fields: Record<string, string>;
  file: StagedFile | null;
}

export class UploadRefused extends Error {
  constructor(readonly status: 400 | 413, message: string) {
    super(message);
  }
}

export function stagingDirectory(): string {
  return join(uploadSettings().UPLOAD_DIR, "staging");
}

export async function writeStagedFile(source: ReadableStream<Uint8Array>, fileName: string): Promise<StagedFile> {
  const directory = stagingDirectory();
  await mkdir(directory, { recursive: true });
  const path = join(directory, `${Date.now()}-${randomBytes(8).toString("hex")}.csv`);
  const hash = createHash("sha256");
  let size = 0;
  const hashing = new TransformStream<Uint8Array, Uint8Array>({
    transform(chunk, controller) {
      hash.update(chunk);
      size += chunk.byteLength;
      controller.enqueue(chunk);
    },
  });
  try {
    await pipeline(source.pipeThrough(hashing), Writable.toWeb(createWriteStream(path)) as unknown as NodeJS.WritableStream);
  } catch (error) {
    await rm(path, { force: true });
    throw error;
  }
  return { path, fileName: fileName.slice(0, 255) || "soundings.csv", size, sha256: hash.digest("hex") };
}

export async function stageUpload(request: Request): Promise<StagedUpload> {
  const maxFileSize = uploadSettings().UPLOAD_MAX_BYTES;
  let file: StagedFile | null = null;
  const fields: Record<string, string> = {};
  try {
    const form = await parseFormData(request, { maxFileSize, maxFiles: 1, maxTotalSize: maxFileSize + 1024 * 1024 }, async (upload: FileUpload) => {
      if (upload.fieldName !== "file" || file) return null;
      if (upload.size === 0) return null;
      file = await writeStagedFile(upload.stream(), upload.name);
      return null;
    });
    for (const [name, value] of form.entries()) if (typeof value === "string") fields[name] = value;
  } catch (error) {
    if (file) await rm((file as StagedFile).path, { force: true });
    if (error instanceof MaxFileSizeExceededError || error instanceof MaxTotalSizeExceededError) {
      throw new UploadRefused(413, `The file is larger than ${Math.round(maxFileSize / 1024 / 1024)} MB, the most Firmsand accepts in one upload. Split it into several surveys.`);
    }
    if (error instanceof FormDataParseError || (error instanceof Error && error.name.endsWith("Error") && /multipart|form data/i.test(error.message))) {
      throw new UploadRefused(400, "The upload could not be read as a form with a file.");
    }
    throw error;
  }
  return { fields, file };
}

export async function discardStagedFile(path: string): Promise<void> {
  await rm(path, { force: true });
}

export async function stagedFileExists(path: string): Promise<boolean> {
  return stat(path).then(() => true, () => false);
}
