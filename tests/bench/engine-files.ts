import { spawn, spawnSync } from "node:child_process";
import { existsSync, readFileSync, rmSync } from "node:fs";
import { availableParallelism, loadavg } from "node:os";
import { join } from "node:path";
import { cliArguments, ensureScenarioFiles, fileScenarios, scenarioDirectory, type FileScenario } from "./engine-files/scenarios";

/**
 * npm run bench -- --only engine-files — the engine end to end from files, as users run it: each
 * scenario's sounding files through `firmsand volumes` (the built command line; --cli sources runs
 * it from TypeScript with tsx), each run alternated with the reference pipeline
 * (engine-files/reference.mjs: general-purpose packages only, the same files and at least the same
 * work). Each command is its own process: the time is from spawn to exit, the peak memory its
 * maximum resident set (GNU time's %M, threads included). Prints every run with the machine's load
 * average, then the medians and their ratios.
 * Options: --runs N (default 5), --scenario spring|bay, --cli built|sources.
 */

const root = join(import.meta.dirname, "..", "..");
const args = process.argv.slice(2);
const option = (name: string) => (args.includes(name) ? args[args.indexOf(name) + 1] : undefined);
const runs = Number(option("--runs") ?? 5);
if (!Number.isInteger(runs) || runs < 1) throw new Error("--runs needs a whole number of 1 or more");
const onlyScenario = option("--scenario");
const cliChoice = option("--cli") ?? "built";
if (!["built", "sources"].includes(cliChoice)) throw new Error("--cli is built or sources");

const builtCli = join(root, "build", "cli", "firmsand.mjs");
let ours: string[];
if (cliChoice === "built") {
  if (!existsSync(builtCli)) throw new Error(`${builtCli} is missing: run npm run build:cli first (npm run bench does)`);
  ours = [process.execPath, builtCli];
} else {
  ours = [join(root, "node_modules", ".bin", "tsx"), join(root, "app", "cli", "firmsand.ts")];
}
const reference = [process.execPath, join(import.meta.dirname, "engine-files", "reference.mjs")];
const gnuTime = "/usr/bin/time";
if (!existsSync(gnuTime)) throw new Error("GNU time (/usr/bin/time) is needed for the peak memory: apt-get install time");

interface Measured {
  seconds: number;
  /** CPU time, user + system, all threads. */
  cpuSeconds: number;
  peakMb: number;
  load: number;
  stdout: string;
  stderr: string;
}

/** One command to its exit: wall time, peak RSS, the load average when it ended. */
function measure(command: string[], output: string): Promise<Measured> {
  const rusage = join(scenarioDirectory, "time.txt");
  rmSync(rusage, { force: true });
  return new Promise((resolve, reject) => {
    const start = performance.now();
    const child = spawn(gnuTime, ["-o", rusage, "-f", "%M %U %S", "sh", "-c", 'exec "$@" > "$0"', output, ...command], { stdio: ["ignore", "ignore", "pipe"] });
    let stderr = "";
    child.stderr.setEncoding("utf8").on("data", (chunk: string) => (stderr += chunk));
    child.on("error", reject);
    child.on("exit", (code) => {
      const seconds = (performance.now() - start) / 1000;
      if (code !== 0) return reject(new Error(`${command.join(" ")} exited with ${code}:\n${stderr}`));
      const [peakKb, user, system] = readFileSync(rusage, "utf8").trim().split("\n").pop()!.split(" ").map(Number);
      resolve({ seconds, cpuSeconds: user + system, peakMb: peakKb / 1024, load: loadavg()[0], stdout: readFileSync(output, "utf8").slice(0, 400), stderr });
    });
  });
}

const median = (values: number[]) => {
  const sorted = [...values].sort((a, b) => a - b);
  const middle = Math.floor(sorted.length / 2);
  return sorted.length % 2 === 1 ? sorted[middle] : (sorted[middle - 1] + sorted[middle]) / 2;
};
const totalsOf = (json: string) => JSON.parse(/"totals":(\{[^}]*\})/.exec(json)?.[1] ?? "null") as { removedVolume: number; plannedVolume: number; cells: number } | null;
const fmt = (measured: Measured) =>
  `${measured.seconds.toFixed(2).padStart(6)} s (CPU ${measured.cpuSeconds.toFixed(2)} s) ${measured.peakMb.toFixed(0).padStart(5)} MB (load ${measured.load.toFixed(2)})`;

async function benchScenario(scenario: FileScenario) {
  const files = await ensureScenarioFiles(scenario);
  const cli = [...ours, "volumes", ...cliArguments(scenario, files)];
  const ref = [...reference, ...cliArguments(scenario, files)];
  const oursOut = join(scenarioDirectory, `${scenario.name}-ours.json`);
  const refOut = join(scenarioDirectory, `${scenario.name}-reference.json`);
  console.log(`\n${scenario.name}: ${scenario.soundings.toLocaleString("en-US")} soundings × 2 files, ${scenario.settings.resolution} ${scenario.units} raster, ${scenario.settings.cellSize} ${scenario.units} cells`);
  // One warm-up of each (page cache, disk), not counted.
  const warmOurs = await measure(cli, oursOut);
  const warmRef = await measure(ref, refOut);
  const [oursTotals, refTotals] = [totalsOf(warmOurs.stdout), totalsOf(warmRef.stdout)];
  if (!oursTotals || !refTotals) throw new Error("no totals in an output");
  const gap = Math.abs(oursTotals.removedVolume - refTotals.removedVolume) / refTotals.removedVolume;
  console.log(`  same job: ${oursTotals.cells} cells both: ${oursTotals.cells === refTotals.cells}; removed ${oursTotals.removedVolume.toFixed(1)} vs reference ${refTotals.removedVolume.toFixed(1)} (${(gap * 100).toFixed(4)} % apart)`);
  if (oursTotals.cells !== refTotals.cells || gap > 1e-3) throw new Error("the command line and the reference disagree: not the same job");
  const oursRuns: Measured[] = [];
  const refRuns: Measured[] = [];
  for (let run = 0; run < runs; run++) {
    // Alternate which goes first, so neither always follows the other.
    if (run % 2 === 0) {
      oursRuns.push(await measure(cli, oursOut));
      refRuns.push(await measure(ref, refOut));
    } else {
      refRuns.push(await measure(ref, refOut));
      oursRuns.push(await measure(cli, oursOut));
    }
    console.log(`  run ${run + 1}: firmsand ${fmt(oursRuns[run])}   reference ${fmt(refRuns[run])}`);
  }
  const stageNames = Object.keys(JSON.parse(refRuns[0].stderr.trim().split("\n").pop()!).stages as Record<string, number>);
  const refStages = refRuns.map((measured) => JSON.parse(measured.stderr.trim().split("\n").pop()!).stages as Record<string, number>);
  console.log(`  reference stages (median ms): ${stageNames.map((name) => `${name} ${median(refStages.map((stages) => stages[name])).toFixed(0)}`).join(", ")}`);
  const time = { ours: median(oursRuns.map((r) => r.seconds)), ref: median(refRuns.map((r) => r.seconds)) };
  const memory = { ours: median(oursRuns.map((r) => r.peakMb)), ref: median(refRuns.map((r) => r.peakMb)) };
  const cpu = { ours: median(oursRuns.map((r) => r.cpuSeconds)), ref: median(refRuns.map((r) => r.cpuSeconds)) };
  const loads = [...oursRuns, ...refRuns].map((r) => r.load);
  return { scenario, time, memory, cpu, loads };
}

console.log(`engine from files: ${cliChoice === "built" ? "built command line (node build/cli/firmsand.mjs)" : "command line from sources (tsx app/cli/firmsand.ts)"} vs tests/bench/engine-files/reference.mjs; ` +
  `median of ${runs} alternated run${runs > 1 ? "s" : ""}; ${availableParallelism()} cores, load average at start ${loadavg().map((value) => value.toFixed(2)).join(" ")}`);
// Start-up: the command line's usage (it exits 2 after printing it), from spawn to exit.
// Node's own start beside it (an empty script), alternated.
const startups: number[] = [];
const bare: number[] = [];
const timed = (command: string, commandArgs: string[]) => {
  const start = performance.now();
  spawnSync(command, commandArgs, { stdio: "ignore" });
  return (performance.now() - start) / 1000;
};
for (let run = 0; run < 5; run++) {
  startups.push(timed(ours[0], [...ours.slice(1), "--help"]));
  bare.push(timed(process.execPath, ["-e", "0"]));
}
console.log(`start-up (firmsand --help, median of 5): ${median(startups).toFixed(3)} s, node alone ${median(bare).toFixed(3)} s (load ${loadavg()[0].toFixed(2)}); goal under 0.3 s`);

const results = [];
for (const scenario of fileScenarios) {
  if (onlyScenario && scenario.name !== onlyScenario) continue;
  results.push(await benchScenario(scenario));
}
// The time ratio is wall time from spawn to exit (what a user waits); CPU time beside it shows
// how much of the difference the second thread makes on a shared machine.
console.log("\n| scenario | firmsand | reference | time ratio | CPU firmsand / reference (ratio) | firmsand peak | reference peak | memory ratio | load average |");
console.log("| --- | --- | --- | --- | --- | --- | --- | --- | --- |");
for (const { scenario, time, memory, cpu, loads } of results) {
  console.log(`| ${scenario.name} | ${time.ours.toFixed(2)} s | ${time.ref.toFixed(2)} s | ${(time.ours / time.ref).toFixed(2)} | ${cpu.ours.toFixed(2)} / ${cpu.ref.toFixed(2)} s (${(cpu.ours / cpu.ref).toFixed(2)}) | ` +
    `${memory.ours.toFixed(0)} MB | ${memory.ref.toFixed(0)} MB | ${(memory.ours / memory.ref).toFixed(2)} | ${Math.min(...loads).toFixed(2)}–${Math.max(...loads).toFixed(2)} |`);
}
const failed = results.filter(({ time, memory }) => time.ours / time.ref > 1 || memory.ours / memory.ref > 1.2);
console.log(failed.length === 0 ? "goal met: time ratio ≤ 1.0 and memory ratio ≤ 1.2 on every scenario" : `goal not met on: ${failed.map((result) => result.scenario.name).join(", ")} (time ratio ≤ 1.0, memory ratio ≤ 1.2)`);
