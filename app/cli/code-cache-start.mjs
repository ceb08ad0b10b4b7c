// The command line's entry (copied to build/cli/firmsand.mjs by app/cli/build.mjs). It runs the
// bundled command line (firmsand-bundle.cjs beside it) through V8's code cache: the first
// successful `volumes` run keeps the compiled code of everything it ran in a file beside the
// bundle, and later runs start from it instead of parsing and compiling the 0.8 MB bundle again
// (about 30 ms of a 0.3 s spring-basin run). The cache file is named by a digest of the bundle,
// so a rebuilt bundle never meets code compiled from another; V8 itself refuses a cache made by
// another Node version or with other flags, and the next run writes a fresh one. Nothing is
// written where the folder is read-only: the command line then simply compiles as it goes.
import { createHash } from "node:crypto";
import { readFileSync, renameSync, rmSync, writeFileSync } from "node:fs";
import { createRequire } from "node:module";
import { dirname } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";
import { Script } from "node:vm";

const bundle = fileURLToPath(new URL("./firmsand-bundle.cjs", import.meta.url));
const source = readFileSync(bundle, "utf8");
const digest = createHash("sha256").update(source).digest("hex").slice(0, 16);
const cacheFile = `${bundle}.${digest}.v8cache`;
let cachedData;
try {
  cachedData = readFileSync(cacheFile);
} catch {
  cachedData = undefined; // none yet
}
// The same wrapper Node gives a CommonJS module, plus the two `import.meta` values the bundle
// was built to take as parameters (app/cli/build.mjs).
const script = new Script(
  `(function (exports, require, module, __filename, __dirname, __firmsandModuleUrl, __firmsandResolve) {${source}\n})`,
  { filename: bundle, cachedData },
);
const module = { exports: {} };
const moduleUrl = pathToFileURL(bundle).href;
const resolve = (specifier) => import.meta.resolve(specifier, moduleUrl);
script.runInThisContext()(module.exports, createRequire(bundle), module, bundle, dirname(bundle), moduleUrl, resolve);

if (process.argv[2] === "volumes" && (cachedData === undefined || script.cachedDataRejected)) {
  // Once the run is over and has succeeded: the cache then holds every function it compiled.
  process.once("beforeExit", () => {
    if ((process.exitCode ?? 0) !== 0) return;
    const partial = `${cacheFile}.${process.pid}`;
    try {
      writeFileSync(partial, script.createCachedData());
      renameSync(partial, cacheFile); // whole or not at all, also with two runs at once
    } catch {
      rmSync(partial, { force: true });
    }
  });
}
