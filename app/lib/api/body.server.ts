import type { z } from "zod";
import { BadRequestError, detailsOf, validationErrorFrom } from "~/lib/errors";
import { readBodyBytes, refuseDeclaredOver } from "~/lib/http/body.server";
import { UnsupportedMediaTypeError } from "./errors.server";

/**
 * The API's one body reader: JSON or a form (url-encoded or multipart), read against a size limit
 * by the one bounded reader of every body (app/lib/http/body.server.ts), then checked with the route's zod schema. A Content-Type the route does not read is a 415, a
 * body that does not parse a 400, one over the limit a 413 (refused on its Content-Length before
 * reading, or cut off at the limit when it comes chunked), and one that breaks the schema a 422
 * naming each field. An empty body is read as `{}`, so the schema says what is missing.
 */

/** The most a JSON or form body may hold unless a route says otherwise. */
export const BODY_LIMIT_BYTES = 1024 * 1024;

export type BodyFormat = "json" | "form";

export interface BodyOptions {
  /** What the route reads; both unless it says otherwise. */
  formats?: readonly BodyFormat[];
  maxBytes?: number;
}

const MEDIA_TYPES: Record<BodyFormat, string> = { json: "application/json", form: "application/x-www-form-urlencoded or multipart/form-data" };

function formatOf(mediaType: string): BodyFormat | null {
  if (mediaType === "application/json" || /^application\/[\w.+-]+\+json$/.test(mediaType)) return "json";
  if (mediaType === "application/x-www-form-urlencoded" || mediaType === "multipart/form-data") return "form";
  return null;
}

/** Form entries as an object: a name sent once is a string, a name sent again an array. */
function formObject(entries: Iterable<[string, FormDataEntryValue]>): Record<string, unknown> {
  const grouped = new Map<string, FormDataEntryValue[]>();
  for (const [name, value] of entries) grouped.set(name, [...(grouped.get(name) ?? []), value]);
  // Object.fromEntries defines own properties, so a field named "__proto__" stays a field.
  return Object.fromEntries([...grouped].map(([name, values]) => [name, values.length === 1 ? values[0] : values]));
}

/** The body as plain data (before the schema): `{}` when empty. */
export async function readApiInput(request: Request, options: BodyOptions = {}): Promise<unknown> {
  const formats = options.formats ?? ["json", "form"];
  const maxBytes = options.maxBytes ?? BODY_LIMIT_BYTES;
  const contentType = request.headers.get("Content-Type") ?? "";
  const mediaType = contentType.split(";")[0].trim().toLowerCase();
  const format = formatOf(mediaType);
  const readable = format !== null && formats.includes(format);
  const unsupported = () =>
    new UnsupportedMediaTypeError(`Send the body as ${formats.map((name) => MEDIA_TYPES[name]).join(", or as ")}${mediaType ? `, not ${mediaType}` : " and say so in Content-Type"}.`);
  refuseDeclaredOver(request, maxBytes);
  if (!readable && Number(request.headers.get("Content-Length") ?? 0) > 0) throw unsupported();

  const bytes = await readBodyBytes(request, maxBytes);
  if (bytes.byteLength === 0) return {};
  if (!readable) throw unsupported();
  if (format === "json") {
    let text: string;
    try {
      text = new TextDecoder("utf-8", { fatal: true }).decode(bytes);
    } catch {
      throw new BadRequestError("The body is not valid UTF-8 text.");
    }
    try {
      // JSON.parse is not recursive in V8, so deep nesting parses rather than overflowing the stack.
      return JSON.parse(text) as unknown;
    } catch {
      throw new BadRequestError("The body is not valid JSON.");
    }
  }
  if (mediaType === "application/x-www-form-urlencoded") return formObject(new URLSearchParams(new TextDecoder().decode(bytes)));
  try {
    return formObject(await new Response(bytes, { headers: { "Content-Type": contentType } }).formData());
  } catch {
    throw new BadRequestError("The body is not a readable multipart form.");
  }
}

/**
 * For a route that streams its body itself (the survey upload): the same 415 as readApiInput when
 * the Content-Type is not `mediaType`.
 */
export function assertMediaType(request: Request, mediaType: string): void {
  const sent = (request.headers.get("Content-Type") ?? "").split(";")[0].trim().toLowerCase();
  if (sent !== mediaType) throw new UnsupportedMediaTypeError(`Send the body as ${mediaType}${sent ? `, not ${sent}` : " and say so in Content-Type"}.`);
}

/** The body checked with `schema`: the parsed input, or a typed error (400, 413, 415, 422). */
export async function readApiBody<Schema extends z.ZodType>(request: Request, schema: Schema, options: BodyOptions = {}): Promise<z.output<Schema>> {
  const parsed = schema.safeParse(await readApiInput(request, options));
  if (!parsed.success) throw validationErrorFrom(parsed.error);
  return parsed.data;
}

/** A query string checked with `schema`: a 400 naming each parameter (the request line is wrong; there is no content to refuse). */
export function readApiQuery<Schema extends z.ZodType>(request: Request, schema: Schema): z.output<Schema> {
  const parsed = schema.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  if (!parsed.success) throw new BadRequestError(detailsOf(parsed.error));
  return parsed.data;
}
