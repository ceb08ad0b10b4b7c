// Builds the `firmsand` command line as plain JavaScript (`npm run build:cli`, also part of
// `npm run build` and of `npm ci` through `prepare`): build/cli/firmsand.mjs (which runs the bundle
// firmsand-bundle.cjs through V8's code cache) and, beside it, the
// engine worker thread it starts (engine-worker.thread.mjs, the name the pool looks for beside a
// bundle). Running the built file starts in a fraction of the time tsx needs to compile the
// sources at every start and in every thread. esbuild is the one Vite's worker build already uses.
import { copyFileSync, readdirSync, rmSync } from "node:fs";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";

let build;
try {
  ({ build } = await import("esbuild"));
} catch (error) {
  // `npm ci --omit=dev` runs `prepare` without the build tools: the command line is then built
  // where they are installed (npm run build:cli). Anywhere else a missing esbuild is an error.
  if (process.env.npm_lifecycle_event === "prepare") {
    process.stderr.write("[firmsand] esbuild is not installed (production install?): the command line is not built; run npm run build:cli where the dev dependencies are\n");
    process.exit(0);
  }
  throw error;
}

const root = join(dirname(fileURLToPath(import.meta.url)), "..", "..");
const outdir = join(root, "build", "cli");

/**
 * zod's translations of its messages (`z.locales`, about a third of the bundle) are left out: the
 * command line words its own messages and zod's English default is imported on its own. Less code
 * to compile at every start.
 */
const withoutZodLocales = {
  name: "firmsand:no-zod-locales",
  setup(builder) {
    builder.onResolve({ filter: /[\\/]locales[\\/]index\.js$/ }, (args) => (/[\\/]zod[\\/]/.test(args.importer) ? { path: "zod-locales", namespace: "firmsand-empty" } : undefined));
    builder.onLoad({ filter: /.*/, namespace: "firmsand-empty" }, () => ({ contents: "export {};", loader: "js" }));
  },
};

const common = {
  bundle: true,
  platform: "node",
  format: "esm",
  target: "node20",
  logLevel: "warning",
  absWorkingDir: root,
  legalComments: "none",
  plugins: [withoutZodLocales],
};

// Written over in place (not emptied first), so a command line already running keeps its files.
await Promise.all([
  // The command line as one CommonJS bundle, run by build/cli/firmsand.mjs (app/cli/code-cache-start.mjs)
  // through V8's code cache. CommonJS because only a classic script can be given cached code on
  // Node 20; the two `import.meta` values it uses arrive as parameters of the script's wrapper.
  build({
    ...common,
    format: "cjs",
    entryPoints: [join(root, "app/cli/firmsand.ts")],
    outfile: join(outdir, "firmsand-bundle.cjs"),
    define: { "import.meta.url": "__firmsandModuleUrl", "import.meta.resolve": "__firmsandResolve" },
  }),
  // The thread loads what a state or bands job needs only on first use (dynamic imports, kept as
  // chunks of their own here), so a thread that triangulates and samples starts on little code.
  build({
    ...common,
    entryPoints: { "engine-worker.thread": join(root, "app/lib/engine/engine-worker.thread.ts") },
    outdir,
    splitting: true,
    outExtension: { ".js": ".mjs" },
    chunkNames: "engine-[name]-[hash]",
  }),
]);
copyFileSync(join(root, "app/cli/code-cache-start.mjs"), join(outdir, "firmsand.mjs"));
// Code caches of earlier bundles (each is named by its bundle's digest) are of no further use.
for (const name of readdirSync(outdir)) if (name.endsWith(".v8cache")) rmSync(join(outdir, name), { force: true });
