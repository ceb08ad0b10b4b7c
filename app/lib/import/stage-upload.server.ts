import { createHash, randomBytes } from "node:crypto";
import { createWriteStream } from "node:fs";
import { mkdir, rm } from "node:fs/promises";
import { join } from "node:path";
import { Readable, Writable } from "node:stream";
import { pipeline } from "node:stream/promises";
import busboy from "busboy";
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
  /** The name of a file that was chosen but holds no bytes (it is not staged). */
  emptyFileName?: string;
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

/** A route's own limit for its file part (the sounding upload's is UPLOAD_MAX_BYTES). */
export interface UploadLimit {
  maxBytes: number;
  /** What to do instead, said after "The file is larger than N MB, the most Firmsand accepts…". */
  advice: string;
}

/**
 * Streams the multipart body straight to the staging file with busboy: the file part is never
 * held whole in memory (the form-data parser we used first buffers each part before handing it
 * over, which a 200 MB survey must not do). Every upload route (surveys, find photos) reads its
 * body here, each with its own limit.
 */
export async function stageUpload(request: Request, limit: UploadLimit = { maxBytes: uploadSettings().UPLOAD_MAX_BYTES, advice: "Split it into several surveys." }): Promise<StagedUpload> {
  const maxFileSize = limit.maxBytes;
  const contentType = request.headers.get("Content-Type") ?? "";
  const unreadable = () => new UploadRefused(400, "The upload could not be read as a form with a file.");
  if (!/^multipart\/form-data/i.test(contentType) || !request.body) throw unreadable();
  const declaredLength = Number(request.headers.get("Content-Length") ?? Number.NaN);
  const tooLarge = () =>
    new UploadRefused(413, `The file is larger than ${Math.round(maxFileSize / 1024 / 1024)} MB, the most Firmsand accepts in one upload. ${limit.advice}`);
  if (declaredLength > maxFileSize + 1024 * 1024) throw tooLarge();

  let parser: busboy.Busboy;
  try {
    parser = busboy({ headers: { "content-type": contentType }, limits: { files: 1, fileSize: maxFileSize, fields: 100, fieldSize: 1024 * 1024 } });
  } catch {
    throw unreadable();
  }
  const fields: Record<string, string> = {};
  let staging = null as Promise<StagedFile> | null; // set inside the "file" callback
  let overLimit = false as boolean;
  let chosenName = false as boolean;
  parser.on("field", (name, value) => {
    fields[name] = value;
  });
  parser.on("file", (name, stream, info) => {
    if (name !== "file" || staging) {
      stream.resume();
      return;
    }
    chosenName = Boolean(info.filename);
    stream.once("limit", () => {
      overLimit = true;
    });
    staging = writeStagedFile(Readable.toWeb(stream) as ReadableStream<Uint8Array>, info.filename ?? "soundings.csv");
    // Keep a rejection from going unhandled while the rest of the body is still arriving.
    staging.catch(() => undefined);
  });

  let file: StagedFile | null = null;
  let emptyFileName: string | undefined;
  try {
    await pipeline(Readable.fromWeb(request.body as import("node:stream/web").ReadableStream<Uint8Array>), parser);
    file = staging ? await staging : null;
  } catch {
    const partial = await staging?.catch(() => null);
    if (partial) await rm(partial.path, { force: true });
    throw overLimit ? tooLarge() : unreadable();
  }
  if (file && (overLimit || file.size === 0)) {
    await rm(file.path, { force: true });
    if (overLimit) throw tooLarge();
    // A browser sends an empty part with no name when nothing was chosen; a chosen empty file keeps its name.
    if (chosenName) emptyFileName = file.fileName;
    file = null;
  }
  return { fields, file, ...(emptyFileName ? { emptyFileName } : {}) };
}

export async function discardStagedFile(path: string): Promise<void> {
  await rm(path, { force: true });
}
