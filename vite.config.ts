/// <reference types="vitest/config" />
import { reactRouter } from "@react-router/dev/vite";
import tailwindcss from "@tailwindcss/vite";
import { dirname, join } from "node:path";
import { defineConfig, type Plugin, type PluginOption } from "vite";
import { VitePWA } from "vite-plugin-pwa";

const underVitest = Boolean(process.env.VITEST);

/** The engine pool's worker entry and the name the pool looks for beside the server bundle (BUILT_WORKER_FILE). */
const ENGINE_WORKER_SOURCE = "app/lib/engine/engine-worker.thread.ts";
const ENGINE_WORKER_FILE = "engine-worker.thread.mjs";

/**
 * The server build's second output: the engine worker thread (app/lib/engine/engine-worker.server.ts) as
 * one self-contained ES module written beside every server chunk that starts it, so
 * `new URL("./engine-worker.thread.mjs", import.meta.url)` finds it. A worker's entry must be a
 * file of its own, and Rollup would split the code it shares with the server bundle into chunks;
 * esbuild (already installed for Vite and tsx) bundles it alone in a fraction of a second. Done in
 * the plugin, so every `react-router build` emits it, not only Firmsand's own scripts.
 */
function engineWorkerBuild(): Plugin {
  return {
    name: "firmsand:engine-worker",
    apply: "build",
    applyToEnvironment: (environment) => environment.config.consumer === "server",
    async writeBundle(options, bundle) {
      const outDir = options.dir ?? dirname(options.file!);
      const starters = Object.values(bundle).filter((output) => output.type === "chunk" && output.code.includes(ENGINE_WORKER_FILE));
      if (starters.length === 0) this.error(`no server chunk refers to ${ENGINE_WORKER_FILE}: has the engine pool moved?`);
      const { build } = await import("esbuild");
      for (const directory of new Set(starters.map((chunk) => dirname(chunk.fileName)))) {
        await build({
          entryPoints: [ENGINE_WORKER_SOURCE],
          outfile: join(outDir, directory, ENGINE_WORKER_FILE),
          bundle: true,
          platform: "node",
          format: "esm",
          target: "node20",
          logLevel: "warning",
        });
      }
    },
  };
}

/** The service worker's background sending (Background Sync), bundled alone and loaded by the generated worker with importScripts. */
const FIELD_SEND_SOURCE = "app/components/field/background-send.worker.ts";
const FIELD_SEND_FILE = "field-send.js";

/**
 * Writes `build/client/field-send.js`: the field queue's sender (app/components/field/sync.ts and the
 * store it reads) as one classic script for the service worker, which cannot load modules with
 * importScripts. esbuild bundles it in a fraction of a second, as for the engine's worker thread.
 */
function fieldSendBuild(): Plugin {
  return {
    name: "firmsand:field-send",
    apply: "build",
    applyToEnvironment: (environment) => environment.config.consumer === "client",
    async writeBundle(options) {
      const { build } = await import("esbuild");
      await build({
        entryPoints: [FIELD_SEND_SOURCE],
        outfile: join(options.dir ?? "build/client", FIELD_SEND_FILE),
        bundle: true,
        platform: "browser",
        format: "iife",
        target: "es2022",
        minify: true,
        logLevel: "warning",
      });
    },
  };
}

/** The built scripts and styles served precompressed (app/serve.mjs); fonts and images are compressed already. */
const PRECOMPRESSED = /\.(?:js|mjs|css|svg|json)$/;

/**
 * Writes a Brotli (`.br`, quality 11) and a gzip (`.gz`, level 9) copy beside each built script and
 * style under `build/client/assets`, for the server to send as they are (express-static-gzip).
 * Compressing them at each request cost the server about 70 ms of CPU per first visit to the map
 * page, on the cores the browser was using at the same moment, and gave larger files. Built here
 * with Node's zlib (a few seconds for the whole build, in its thread pool); a copy no smaller than
 * its file is not written. The files are hashed and immutable, so each copy is made once per build.
 */
function precompressAssets(): Plugin {
  return {
    name: "firmsand:precompress-assets",
    apply: "build",
    applyToEnvironment: (environment) => environment.config.consumer === "client",
    async writeBundle(options) {
      const { readdir, readFile, writeFile } = await import("node:fs/promises");
      const zlib = await import("node:zlib");
      const { promisify } = await import("node:util");
      const brotli = promisify(zlib.brotliCompress);
      const gzip = promisify(zlib.gzip);
      const assets = join(options.dir ?? "build/client", "assets");
      const names = (await readdir(assets, { recursive: true })).filter((name) => PRECOMPRESSED.test(name));
      await Promise.all(
        names.map(async (name) => {
          const file = await readFile(join(assets, name));
          if (file.length < 1024) return;
          const [br, gz] = await Promise.all([
            brotli(file, { params: { [zlib.constants.BROTLI_PARAM_QUALITY]: 11, [zlib.constants.BROTLI_PARAM_SIZE_HINT]: file.length } }),
            gzip(file, { level: 9 }),
          ]);
          if (br.length < file.length) await writeFile(join(assets, `${name}.br`), br);
          if (gz.length < file.length) await writeFile(join(assets, `${name}.gz`), gz);
        }),
      );
    },
  };
}

/**
 * The field app's service worker and web app manifest (Workbox's generateSW through
 * vite-plugin-pwa). React Router's framework mode renders pages on the server, so there is no
 * index.html to fall back to: the worker precaches the built scripts, styles, shipped fonts, icons
 * and the offline page; a project's field page is kept as the server last rendered it (network
 * first, so it is fresh whenever there is signal) and its data is in IndexedDB
 * (app/components/field/); a project's map style is kept the same way; any other page asked for
 * without a network answers the offline page. The plugin's hooks run for the browser build only
 * (the server build has nothing to precache).
 */
function fieldAppWorker(): PluginOption[] {
  const plugins = VitePWA({
    injectRegister: false,
    registerType: "autoUpdate",
    outDir: "build/client",
    includeManifestIcons: false,
    manifest: {
      id: "/projects",
      name: "Firmsand field",
      short_name: "Firmsand",
      description: "Dive logs, readings, finds and other field records, entered at the water and sent when there is signal.",
      start_url: "/projects",
      scope: "/",
      display: "standalone",
      orientation: "any",
      background_color: "#f7f8f6",
      theme_color: "#14606e",
      icons: [
        { src: "/icons/field-192.png", sizes: "192x192", type: "image/png" },
        { src: "/icons/field-512.png", sizes: "512x512", type: "image/png" },
        { src: "/icons/field-maskable-512.png", sizes: "512x512", type: "image/png", purpose: "maskable" },
        { src: "/icons/field.svg", sizes: "any", type: "image/svg+xml" },
      ],
    },
    workbox: {
      globDirectory: "build/client",
      globPatterns: ["assets/**/*.{js,css,woff2}", "icons/*.{png,svg}", "favicon.svg", "offline.html", "manifest.webmanifest"],
      // The map's bundle is the largest script; it is part of the shell the field pages may open.
      maximumFileSizeToCacheInBytes: 4 * 1024 * 1024,
      navigateFallback: null,
      // Background sending of the field queue once the page is closed (fieldSendBuild).
      importScripts: [`/${FIELD_SEND_FILE}`],
      cleanupOutdatedCaches: true,
      clientsClaim: true,
      skipWaiting: true,
      runtimeCaching: [
        {
          // A project's field page: fresh from the server when there is signal, the last copy without.
          urlPattern: ({ request, url }) => request.mode === "navigate" && /^\/projects\/\d+\/field$/.test(url.pathname),
          handler: "NetworkFirst",
          options: { cacheName: "firmsand-field-pages", networkTimeoutSeconds: 6, cacheableResponse: { statuses: [200] } },
        },
        {
          urlPattern: ({ url }) => /^\/projects\/\d+\/map\/style\.json$/.test(url.pathname),
          handler: "NetworkFirst",
          options: { cacheName: "firmsand-map-styles", networkTimeoutSeconds: 6, cacheableResponse: { statuses: [200] } },
        },
        {
          // Every other page needs the server: without a network it answers the offline page.
          urlPattern: ({ request }) => request.mode === "navigate",
          handler: "NetworkOnly",
          options: { precacheFallback: { fallbackURL: "/offline.html" } },
        },
      ],
    },
  });
  return plugins.map((plugin) => ({ ...plugin, applyToEnvironment: (environment: { config: { consumer: string } }) => environment.config.consumer === "client" }));
}

export default defineConfig({
  // The React Router plugin builds the app; Vitest runs plain modules and does not need it.
  plugins: [tailwindcss(), !underVitest && reactRouter(), !underVitest && engineWorkerBuild(), !underVitest && fieldSendBuild(), !underVitest && fieldAppWorker(), !underVitest && precompressAssets()],
  resolve: { tsconfigPaths: true },
  // The dev server serves where the app's settings say it does (HOST and PORT make its origin).
  server: { host: process.env.HOST ?? "127.0.0.1", port: Number(process.env.PORT ?? 3000), strictPort: true },
  test: {
    // Unit tests sit beside the code; integration tests against the real MariaDB sit in
    // tests/integration. Browser tests run under Playwright (tests/e2e), not here.
    include: [
      "shared/**/*.test.ts",
      "app/**/*.test.ts",
      "db/**/*.test.ts",
      "sample-data/**/*.test.ts",
      "tests/integration/**/*.test.ts",
    ],
    environment: "node",
    // The origin the app's settings derive from HOST and PORT: tests/integration/helpers.ts's ORIGIN.
    env: { APP_ORIGIN: "", HOST: "127.0.0.1", PORT: "3999" },
    testTimeout: 30_000,
    hookTimeout: 60_000,
    fileParallelism: false,
  },
});
