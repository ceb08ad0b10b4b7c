/**
 * Reads under load: 50 signed-in connections (a session each) for 20 s each (autocannon) on the three reads a
 * crowd makes most, the map's cells (`/api/projects/<id>/cells`), the progress figures
 * (`/api/projects/<id>/progress`) and the overview page (`/projects/<id>`), against the production
 * build serving the seeded demo project. The reference, measured the same way in the same run, is
 * the server's floor: `/healthz`, which does no sign-in and no query. Every request asks for gzip
 * as a browser does. Goal (issue "hardening"): p99 under 150 ms and no errors or non-2xx answers.
 * Figures: requests per second, p50 / p99 / max latency, errors, non-2xx, bytes per answer, the
 * load average before each target, and the CPU time the app server and MariaDB spent per answer
 * (from /proc): on a busy machine the latencies follow the load, the CPU per answer much less.
 * Options: --duration S (default 20), --connections N (default 50), --runs N (default 1).
 * Run by `npm run bench -- --only load`; needs BENCH_BASE_URL.
 */
import autocannon from "autocannon";
import { readFileSync } from "node:fs";
import { loadavg } from "node:os";
import { z } from "zod";

const environment = z.object({
  BENCH_BASE_URL: z.string().url(),
  BENCH_APP_PID: z.coerce.number().int().positive(),
  BENCH_DB_PID: z.coerce.number().int().positive().optional(),
}).parse(process.env);
const base = environment.BENCH_BASE_URL;

function option(name: string, fallback: number): number {
  const index = process.argv.indexOf(`--${name}`);
  return index >= 0 ? z.coerce.number().int().positive().parse(process.argv[index + 1]) : fallback;
}
const duration = option("duration", 20);
const connections = option("connections", 50);
const runs = option("runs", 1);
const GOAL_P99_MS = 150;

/** Signs in with the sign-in form as a browser does and returns the session cookie. */
async function signIn(email: string): Promise<string> {
  const response = await fetch(new URL("/login", base), {
    method: "POST",
    body: new URLSearchParams({ email, password: "firmsand-demo", next: "" }),
    headers: { Origin: new URL(base).origin, "Content-Type": "application/x-www-form-urlencoded" },
    redirect: "manual",
  });
  const cookie = response.headers.getSetCookie().map((line) => line.split(";")[0]).join("; ");
  if (response.status !== 302 || !cookie.includes("=")) throw new Error(`sign-in as ${email} answered ${response.status}`);
  return cookie;
}

type Figures = { total: number; requests: number; p50: number; p99: number; max: number; errors: number; non2xx: number; bytesPerAnswer: number };

/** `connections` connections on `path`, each with its own session (`cookies` in turn) or none. */
function measure(path: string, cookies: string[] | null, seconds: number): Promise<Figures> {
  const headers: Record<string, string> = { "accept-encoding": "gzip, deflate, br" };
  let next = 0;
  // Each connection is a reader of its own: a session of one of the demo's members in turn.
  const setupClient = (client: { setHeaders(headers: Record<string, string>): void }) => {
    if (cookies) client.setHeaders({ ...headers, cookie: cookies[next++ % cookies.length]! });
  };
  return new Promise((resolve, reject) => {
    autocannon({ url: new URL(path, base).href, connections, duration: seconds, headers, setupClient: setupClient as never }, (error, result) => {
      if (error) return reject(error);
      resolve({
        total: result.requests.total,
        requests: result.requests.average,
        p50: result.latency.p50,
        p99: result.latency.p99,
        max: result.latency.max,
        errors: result.errors + result.timeouts,
        non2xx: result.non2xx,
        bytesPerAnswer: result.requests.total > 0 ? result.throughput.total / result.requests.total : 0,
      });
    });
  });
}

/** CPU seconds (user + system) a process has used, from /proc/<pid>/stat (clock ticks of 10 ms). */
function cpuSeconds(pid: number | undefined): number {
  if (pid === undefined) return Number.NaN;
  const fields = readFileSync(`/proc/${pid}/stat`, "utf8").split(") ")[1]!.split(" ");
  return (Number(fields[11]) + Number(fields[12])) / 100;
}

const load = () => loadavg().map((value) => value.toFixed(2)).join(" ");

const cookie = await signIn("manager@example.org");
// 50 readers, not one: a session per connection, signed in as the demo's members in turn, so what
// one reader has already been answered does not serve the others.
const MEMBERS = ["manager", "divesup", "dewatering", "monitor", "surveyor", "viewer"].map((name) => `${name}@example.org`);
const sessions: string[] = [];
for (let index = 0; index < connections; index++) sessions.push(await signIn(MEMBERS[index % MEMBERS.length]!));
// The demo project: the first project the projects page links to, read back through the API.
const listing = await (await fetch(new URL("/projects", base), { headers: { cookie } })).text();
const projectId = /href="\/projects\/(\d+)"/.exec(listing)?.[1];
if (!projectId) throw new Error("no project on /projects: the load bench needs the seeded demo");
const demo = { id: Number(projectId), ...z.object({ settings: z.object({ name: z.string() }) })
  .parse(await (await fetch(new URL(`/api/projects/${projectId}`, base), { headers: { cookie } })).json()).settings };
const targets = [
  { name: "reference: /healthz (no sign-in, no query)", path: "/healthz", cookie: null, goal: false },
  { name: "map cells", path: `/api/projects/${demo.id}/cells`, cookie: sessions, goal: true },
  { name: "progress figures", path: `/api/projects/${demo.id}/progress`, cookie: sessions, goal: true },
  { name: "overview page", path: `/projects/${demo.id}`, cookie: sessions, goal: true },
];

console.log(`reads under load: ${connections} connections × ${duration} s per target, each connection a session of its own (${MEMBERS.length} demo members in turn), production build, demo project "${demo.name}"`);
let met = true;
for (let run = 1; run <= runs; run++) {
  if (runs > 1) console.log(`run ${run} of ${runs}`);
  for (const target of targets) {
    await measure(target.path, target.cookie, 2); // warm-up: caches, JIT, pooled connections
    const before = load();
    const cpuBefore = [cpuSeconds(environment.BENCH_APP_PID), cpuSeconds(environment.BENCH_DB_PID)];
    const figures = await measure(target.path, target.cookie, duration);
    const answers = Math.max(1, figures.total);
    const [appMs, dbMs] = [environment.BENCH_APP_PID, environment.BENCH_DB_PID].map((pid, index) => ((cpuSeconds(pid) - cpuBefore[index]!) * 1000) / answers);
    // No answer at all in the time is a failure, never a p99 of 0.
    const ok = figures.total > 0 && figures.p99 < GOAL_P99_MS && figures.errors === 0 && figures.non2xx === 0;
    if (target.goal && !ok) met = false;
    console.log(
      `  ${target.name.padEnd(44)} ${figures.requests.toFixed(0).padStart(6)} req/s  p50 ${String(figures.p50).padStart(4)} ms  ` +
      `p99 ${String(figures.p99).padStart(5)} ms  max ${String(figures.max).padStart(5)} ms  errors ${figures.errors}  non-2xx ${figures.non2xx}  ` +
      `${(figures.bytesPerAnswer / 1024).toFixed(1)} KiB/answer  CPU per answer: app ${appMs!.toFixed(2)} ms, MariaDB ${Number.isNaN(dbMs) ? "–" : dbMs!.toFixed(2)} ms  ` +
      `load average ${before}` + (target.goal ? `  ${ok ? "goal met" : "goal NOT met"}` : ""),
    );
  }
}
console.log(`  goal (p99 < ${GOAL_P99_MS} ms, no errors, no non-2xx on cells, progress and the overview): ${met ? "met" : "NOT met"}`);
process.exit(met ? 0 : 1);
