import { PassThrough, Writable } from "node:stream";
import type { EntryContext, RouterContextProvider } from "react-router";
import { createReadableStreamFromReadable } from "@react-router/node";
import { ServerRouter } from "react-router";
import { isbot } from "isbot";
import type { RenderToPipeableStreamOptions } from "react-dom/server";
import { renderToPipeableStream } from "react-dom/server";
import { dataFingerprint, drawnOnce, readerPageKey } from "./lib/cache/page-drawing.server";

// React Router's own server entry (streamed, bots wait for all content), with one thing more: a
// page kept per reader is drawn again only when its data changed (app/lib/cache/page-drawing.server.ts).

export const streamTimeout = 5_000;

export default async function handleRequest(
  request: Request,
  responseStatusCode: number,
  responseHeaders: Headers,
  routerContext: EntryContext,
  loadContext: RouterContextProvider,
): Promise<Response> {
  // https://httpwg.org/specs/rfc9110.html#HEAD
  if (request.method.toUpperCase() === "HEAD") return new Response(null, { status: responseStatusCode, headers: responseHeaders });

  const state = routerContext.staticHandlerContext;
  const readerKey = loadContext.get(readerPageKey);
  if (readerKey && request.method.toUpperCase() === "GET" && responseStatusCode === 200 && !state.errors && !state.actionData) {
    const fingerprint = dataFingerprint(state.loaderData);
    if (fingerprint) {
      const drawing = await drawnOnce(readerKey, fingerprint, () => drawWhole(request, routerContext)).catch(() => null);
      if (drawing) {
        responseHeaders.set("Content-Type", "text/html");
        // Server-Timing (W3C): what the browser's developer tools show beside the request.
        responseHeaders.append("Server-Timing", drawing.drawnMs === null ? 'draw;desc="unchanged: drawn before from the same data"' : `draw;dur=${drawing.drawnMs.toFixed(1)}`);
        return new Response(drawing.html, { status: responseStatusCode, headers: responseHeaders });
      }
      // The drawing failed: drawn again below as any page is, where its error is handled.
    }
  }
  return streamed(request, responseStatusCode, responseHeaders, routerContext);
}

/** The whole page as one string, once everything on it is ready; rejects on any error while drawing. */
function drawWhole(request: Request, routerContext: EntryContext): Promise<string> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    let failed = false;
    const fail = (error: unknown) => {
      failed = true;
      clearTimeout(timeoutId);
      reject(error);
    };
    const timeoutId = setTimeout(() => {
      abort();
      fail(new Error("drawing the page took too long"));
    }, streamTimeout + 1000);
    const sink = new Writable({
      write(chunk: Buffer, _encoding, callback) {
        chunks.push(chunk);
        callback();
      },
      final(callback) {
        clearTimeout(timeoutId);
        callback();
        if (!failed) resolve(Buffer.concat(chunks).toString("utf8"));
      },
    });
    const { pipe, abort } = renderToPipeableStream(<ServerRouter context={routerContext} url={request.url} />, {
      onAllReady() {
        pipe(sink);
      },
      onShellError: fail,
      onError: fail,
    });
  });
}

/** React Router's default: the page streamed as it is drawn (bots and SPA mode wait for all of it). */
function streamed(request: Request, responseStatusCode: number, responseHeaders: Headers, routerContext: EntryContext): Promise<Response> {
  return new Promise((resolve, reject) => {
    let shellRendered = false;
    const userAgent = request.headers.get("user-agent");
    const readyOption: keyof RenderToPipeableStreamOptions = (userAgent && isbot(userAgent)) || routerContext.isSpaMode ? "onAllReady" : "onShellReady";
    // Abort the stream after `streamTimeout`, leaving time to flush the rejected boundaries.
    let timeoutId: ReturnType<typeof setTimeout> | undefined = setTimeout(() => abort(), streamTimeout + 1000);
    const { pipe, abort } = renderToPipeableStream(<ServerRouter context={routerContext} url={request.url} />, {
      [readyOption]() {
        shellRendered = true;
        const body = new PassThrough({
          final(callback) {
            clearTimeout(timeoutId);
            timeoutId = undefined;
            callback();
          },
        });
        const stream = createReadableStreamFromReadable(body);
        responseHeaders.set("Content-Type", "text/html");
        pipe(body);
        resolve(new Response(stream, { headers: responseHeaders, status: responseStatusCode }));
      },
      onShellError(error: unknown) {
        reject(error);
      },
      onError(error: unknown) {
        responseStatusCode = 500;
        // Errors inside the shell are logged here; a shell error is logged by React Router.
        if (shellRendered) console.error(error);
      },
    });
  });
}
