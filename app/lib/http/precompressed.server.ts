import { promisify } from "node:util";
import { gzip } from "node:zlib";

// A body many requests read unchanged (the map's cells between two recomputes) is compressed once,
// when it is cached, rather than by the server's compression for every answer: at a 100,000-cell
// bay the payload is about 3 MB of JSON, tens of milliseconds of gzip per request on the request
// thread. The server's compression leaves an answer that already has a Content-Encoding alone.

const gzipAsync = promisify(gzip);

export interface PrecompressedBody {
  text: string;
  gzip: Uint8Array<ArrayBuffer>;
}

/** The text and its gzip (compressed on libuv's thread pool, off the request thread). */
export async function precompress(text: string): Promise<PrecompressedBody> {
  const zipped = await gzipAsync(Buffer.from(text, "utf8"));
  // Copied once out of zlib's pooled buffer into its own, so the cached bytes are a body as they are.
  const gzipped = new Uint8Array(zipped.byteLength);
  gzipped.set(zipped);
  return { text, gzip: gzipped };
}

/** Whether the request's Accept-Encoding takes gzip (`gzip` or `*`, not at `q=0`). */
export function acceptsGzip(request: Request): boolean {
  const header = request.headers.get("Accept-Encoding");
  if (!header) return false;
  let gzipQuality: number | null = null;
  let anyQuality: number | null = null;
  for (const part of header.split(",")) {
    const [name, ...parameters] = part.trim().toLowerCase().split(";");
    const q = parameters.map((parameter) => /^\s*q=([0-9.]+)\s*$/.exec(parameter)?.[1]).find((value) => value !== undefined);
    const quality = q === undefined ? 1 : Number(q);
    if (name === "gzip" || name === "x-gzip") gzipQuality = quality;
    else if (name === "*") anyQuality = quality;
  }
  return (gzipQuality ?? anyQuality ?? 0) > 0;
}

/** The answer with the body gzipped when the client takes gzip, as it is otherwise. */
export function precompressedResponse(request: Request, body: PrecompressedBody, headers: Record<string, string>): Response {
  const vary = { ...headers, Vary: "Accept-Encoding" };
  if (acceptsGzip(request)) {
    return new Response(body.gzip, {
      headers: { ...vary, "Content-Encoding": "gzip", "Content-Length": String(body.gzip.byteLength) },
    });
  }
  return new Response(body.text, { headers: vary });
}
