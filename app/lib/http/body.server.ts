import { data } from "react-router";
import { BadRequestError, PayloadTooLargeError } from "~/lib/errors";

/**
 * Every request body Firmsand reads is read here, against a limit suited to the route: a
 * Content-Length over the limit is refused before a byte is read, and a chunked body is cut off
 * at the limit, so an oversized body is never held in memory. Page forms read at most
 * FORM_LIMIT_BYTES, a form carrying one small file (a work limit, a shoreline) its file's limit
 * plus room for the other fields; the API's JSON and forms read at most 1 MB (app/lib/api/body.server.ts);
 * survey uploads stream to disk under UPLOAD_MAX_BYTES (app/lib/import/stage-upload.server.ts).
 */

/** The most a page form without a file may hold: far above any form Firmsand draws. */
export const FORM_LIMIT_BYTES = 64 * 1024;

/** Room for a form's other fields beside its one file. */
const FORM_FIELDS_ALLOWANCE_BYTES = 64 * 1024;

function sizeLabel(bytes: number): string {
  if (bytes >= 1024 * 1024) return `${Math.round((bytes / 1024 / 1024) * 10) / 10} MB`;
  return bytes >= 1024 ? `${Math.round(bytes / 1024)} KB` : `${bytes} bytes`;
}

function tooLarge(maxBytes: number): PayloadTooLargeError {
  return new PayloadTooLargeError(`The body is larger than ${sizeLabel(maxBytes)}, the most this request accepts.`);
}

/** Refuses a body whose declared length is over the limit, before reading it. */
export function refuseDeclaredOver(request: Request, maxBytes: number): void {
  const declared = request.headers.get("Content-Length");
  if (declared !== null && Number(declared) > maxBytes) throw tooLarge(maxBytes);
}

/** How long, and how much, of a refused body is read and dropped so that its sender gets the 413. */
const DISCARD_SECONDS = 30;
const DISCARD_MAX_BYTES = 256 * 1024 * 1024;

/**
 * Reads and drops the rest of a refused body in the background, holding none of it. Cutting the
 * connection at once would make the client's next write fail with a reset before it reads the
 * 413 (a "lingering close", as web servers do); past the time or byte cap the connection is cut.
 */
function discardRest(reader: ReadableStreamDefaultReader<Uint8Array>): void {
  const cut = () => void reader.cancel().catch(() => undefined);
  const timer = setTimeout(cut, DISCARD_SECONDS * 1000);
  timer.unref?.();
  void (async () => {
    let discarded = 0;
    try {
      for (;;) {
        const chunk = await reader.read();
        if (chunk.done) break;
        discarded += chunk.value.byteLength;
        if (discarded > DISCARD_MAX_BYTES) {
          cut();
          break;
        }
      }
    } catch {
      // The client went away; nothing to drop.
    } finally {
      clearTimeout(timer);
    }
  })();
}

/** The body's bytes, read to at most `maxBytes` (PayloadTooLargeError beyond: the rest is never read). */
export async function readBodyBytes(request: Request, maxBytes: number): Promise<Uint8Array<ArrayBuffer>> {
  refuseDeclaredOver(request, maxBytes);
  if (!request.body) return new Uint8Array(0);
  const reader = request.body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    let chunk: ReadableStreamReadResult<Uint8Array>;
    try {
      chunk = await reader.read();
    } catch {
      throw new BadRequestError("The body could not be read to its end.");
    }
    if (chunk.done) break;
    total += chunk.value.byteLength;
    if (total > maxBytes) {
      // Stop at the limit: nothing more is held, and the answer goes out now.
      discardRest(reader);
      throw tooLarge(maxBytes);
    }
    chunks.push(chunk.value);
  }
  const bytes = new Uint8Array(total);
  let offset = 0;
  for (const chunk of chunks) {
    bytes.set(chunk, offset);
    offset += chunk.byteLength;
  }
  return bytes;
}

/** The form, read to at most `maxBytes` and parsed as its Content-Type says (url-encoded or multipart). */
async function readForm(request: Request, maxBytes: number): Promise<FormData> {
  const bytes = await readBodyBytes(request, maxBytes);
  try {
    return await new Response(bytes, { headers: { "Content-Type": request.headers.get("Content-Type") ?? "" } }).formData();
  } catch {
    throw new BadRequestError("The form could not be read: send it as application/x-www-form-urlencoded or multipart/form-data.");
  }
}

/** A refused body as the page's answer, through its error boundary (a browser's own forms never get one). */
function pageAnswerFor(error: unknown): unknown {
  if (error instanceof PayloadTooLargeError) return data(error.message, { status: 413 });
  if (error instanceof BadRequestError) return data(error.message, { status: 400 });
  return error;
}

/** A page action's form, read to at most `maxBytes`: 413 over the limit, 400 when it is not a form. */
export async function readPageForm(request: Request, maxBytes = FORM_LIMIT_BYTES): Promise<FormData> {
  try {
    return await readForm(request, maxBytes);
  } catch (error) {
    throw pageAnswerFor(error);
  }
}

/**
 * A page form that carries one file of at most `maxFileBytes`, or null when the body is larger:
 * the page then answers 413 in its own words (e.g. "simplify the outline first").
 */
export async function readFileForm(request: Request, maxFileBytes: number): Promise<FormData | null> {
  try {
    return await readForm(request, maxFileBytes + FORM_FIELDS_ALLOWANCE_BYTES);
  } catch (error) {
    if (error instanceof PayloadTooLargeError) return null;
    throw pageAnswerFor(error);
  }
}

/**
 * A copy of `request` whose body is `form`, already read within its limit: for a library that
 * reads the body itself (the sign-in strategy), so that it never reads the client's stream.
 */
export function requestWithForm(request: Request, form: FormData): Request {
  const body = new URLSearchParams();
  for (const [name, value] of form) if (typeof value === "string") body.append(name, value);
  const headers = new Headers(request.headers);
  headers.set("Content-Type", "application/x-www-form-urlencoded");
  headers.delete("Content-Length");
  return new Request(request.url, { method: request.method, headers, body, signal: request.signal });
}
