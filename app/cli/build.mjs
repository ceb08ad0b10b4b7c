// Builds the `firmsand` command line as plain JavaScript (`npm run build:cli`, also part of
// `npm run build` and of `npm ci` through `prepare`): build/cli/firmsand.mjs and, beside it, the
// engine worker thread it starts (engine-worker.thread.mjs, the name the pool looks for beside a
// bundle). Running the built file starts in a fraction of the time tsx needs to compile the
// sources at every start and in every thread. esbuild is the one Vite's worker build already uses.
import { build } from "esbuild";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";

const root = join(dirname(fileURLToPath(import.meta.url)), "..", "..");
const outdir = join(root, "build", "cli");
const common = { bundle: true, platform: "node", format: "esm", target: "node20", logLevel: "warning", absWorkingDir: root, legalComments: "none" };

await Promise.all([
  build({ ...common, entryPoints: [join(root, "app/cli/firmsand.ts")], outfile: join(outdir, "firmsand.mjs") }),
  build({ ...common, entryPoints: [join(root, "app/lib/engine/engine-worker.thread.ts")], outfile: join(outdir, "engine-worker.thread.mjs") }),
]);
