// Firmsand's production HTTP server for the built app (`npm start`, the browser tests).
// It does what react-router-serve does (compression, immutable hashed assets, public files), sends
// the standard security headers (helmet), and two things more, each in a header of its own that
// overwrites whatever a client sent: the client's socket address, so the sign-in rate limit can
// count per address, and whether the request is for a document or a page's data.
import { createRequestHandler } from "@react-router/express";
import compression from "compression";
import express from "express";
import expressStaticGzip from "express-static-gzip";
import helmet from "helmet";
import { readdirSync } from "node:fs";
import { join, relative, resolve, sep } from "node:path";
import { pathToFileURL } from "node:url";

export const CLIENT_ADDRESS_HEADER = "x-firmsand-client-address";
// Whether a request asks for a page's document or for its data (a navigation inside the app, the
// URL ending in `.data`): the app sees both at the same URL, and a page kept for one must never
// answer the other (app/lib/cache/document-cache.server.ts).
export const REQUEST_KIND_HEADER = "x-firmsand-request-kind";

// E-mailed links and the Origin check use the configured origin, never a request's Host header:
// production refuses to start without one (app/lib/settings/env.server.ts holds the same rule).
if (process.env.NODE_ENV === "production" && !process.env.APP_ORIGIN) {
  process.stderr.write(
    "Firmsand's environment is not valid: APP_ORIGIN is required in production (the public origin of e-mailed links, e.g. https://firmsand.example.org)\n",
  );
  process.exit(1);
}

// Tells the app that the address header comes from this server, not from a client (read once
// when the app parses its environment, so it is set before the build is loaded).
process.env.FIRMSAND_CLIENT_ADDRESS_HEADER = "1";
const buildPath = resolve(process.argv[2] ?? "build/server/index.js");
const build = await import(pathToFileURL(buildPath).href);
const port = Number(process.env.PORT ?? 3000);
const host = process.env.HOST ?? "127.0.0.1";

const app = express();
app.disable("x-powered-by");
// The standard response headers (nosniff, opener and resource policies...) on every answer,
// static files included. Three of helmet's defaults are left to the app or changed:
// - framing is the app's rule (app/lib/http/frame-policy.server.ts: no framing, except the share
//   page's `frame-ancestors *`), so helmet's X-Frame-Options and Content-Security-Policy are off;
// - Referrer-Policy is same-origin, not no-referrer: under no-referrer a browser sends
//   `Origin: null` on a same-site POST, which the Origin check refuses; same-origin still keeps
//   a share link's token from reaching other sites in a Referer.
app.use(helmet({ contentSecurityPolicy: false, xFrameOptions: false, referrerPolicy: { policy: "same-origin" } }));
app.use(compression());
// The hashed scripts and styles as the build compressed them (vite.config.ts, precompressAssets):
// Brotli or gzip as the browser accepts, never compressed again per request (compression() leaves
// an answer that has its encoding alone).
app.use(
  join(build.publicPath, "assets"),
  expressStaticGzip(join(build.assetsBuildDirectory, "assets"), { enableBrotli: true, orderPreference: ["br", "gz"], serveStatic: { immutable: true, maxAge: "1y" } }),
);
// The other files of the build and of public/ are few and fixed once built: they are listed at
// start, and only a request for one of them goes to the file server. Before, every page and API
// read asked the disk twice for a file of its name first (a tenth of a read's time under load).
const buildStatic = express.static(build.assetsBuildDirectory);
const publicStatic = express.static("public", { maxAge: "1h" });
const buildFiles = filesUnder(build.assetsBuildDirectory, "assets");
const publicFiles = filesUnder("public");
const publicPrefix = build.publicPath.endsWith("/") ? build.publicPath.slice(0, -1) : build.publicPath;
app.use((request, response, next) => {
  if (request.method !== "GET" && request.method !== "HEAD") return next();
  let path;
  try {
    path = decodeURIComponent(request.path);
  } catch {
    return next();
  }
  if (path.startsWith(`${publicPrefix}/`) && buildFiles.has(path.slice(publicPrefix.length))) {
    // As app.use(publicPath, …) would: the file server sees the path below the public path.
    const url = request.url;
    request.url = url.slice(publicPrefix.length) || "/";
    return buildStatic(request, response, (error) => {
      request.url = url;
      next(error);
    });
  }
  if (publicFiles.has(path)) return publicStatic(request, response, next);
  next();
});
app.use((request, _response, next) => {
  request.headers[CLIENT_ADDRESS_HEADER] = request.socket.remoteAddress ?? "unknown";
  request.headers[REQUEST_KIND_HEADER] = request.path.endsWith(".data") ? "data" : "document";
  next();
});
app.all("*", createRequestHandler({ build, mode: process.env.NODE_ENV }));

/** The URL paths ("/icons/field.svg") of the files under `root`, leaving out the folder `skip`. */
function filesUnder(root, skip) {
  const paths = new Set();
  for (const entry of readdirSync(root, { recursive: true, withFileTypes: true })) {
    if (!entry.isFile()) continue;
    const path = relative(root, join(entry.parentPath ?? entry.path, entry.name)).split(sep).join("/");
    if (skip && path.startsWith(`${skip}/`)) continue;
    paths.add(`/${path}`);
  }
  return paths;
}

const server = app.listen(port, host, () => {
  process.stdout.write(`Firmsand listening on http://${host}:${port}\n`);
  // Background work the app's modules registered on load (the sweep of abandoned uploads).
  for (const start of globalThis.firmsandBackgroundTasks ?? []) start();
});
for (const signal of ["SIGTERM", "SIGINT"]) {
  process.once(signal, () => {
    server.close(() => process.exit(0));
    server.closeIdleConnections();
    // Keep-alive clients must not hold a shutdown open.
    setTimeout(() => process.exit(0), 3000).unref();
  });
}
