/// <reference types="vitest/config" />
import { reactRouter } from "@react-router/dev/vite";
import tailwindcss from "@tailwindcss/vite";
import { dirname, join } from "node:path";
import { defineConfig, type Plugin } from "vite";

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

export default defineConfig({
  // The React Router plugin builds the app; Vitest runs plain modules and does not need it.
  plugins: [tailwindcss(), !underVitest && reactRouter(), !underVitest && engineWorkerBuild()],
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
