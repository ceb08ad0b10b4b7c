/**
 * Import benchmark over HTTP, as the survey technician's script would do it: a 1,000,000-row
 * baseline (seeded, see import-fixture.ts) POSTed as multipart to `POST /api/projects/<id>/surveys`
 * with a personal API token, timed from the first byte sent to the `201` (stored, statistics
 * committed). Memory is the app server's own peak (VmHWM of BENCH_APP_PID), read after the import.
 * Goal: under 60 s and under 600 MB. BENCH_TRACE=1 prints the server's memory as it goes. Run by `npm run bench` (db/scripts/bench.mjs) against the
 * production build it starts; needs BENCH_BASE_URL, BENCH_APP_PID and the app's DB_* environment.
 */
import { mkdtempSync, openAsBlob, readFileSync, rmSync, statSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { z } from "zod";
import { Membership, Survey, User } from "../../app/lib/db.server";
import { createApiToken } from "../../app/lib/auth/api-token.server";
import { hashPassword } from "../../app/lib/auth/password.server";
import { closeSequelize } from "../../db/connection.server";
import { createBenchProject, mb, rowsArgument, writeBaselineCsv } from "./import-fixture";

const environment = z.object({ BENCH_BASE_URL: z.string().url(), BENCH_APP_PID: z.coerce.number().int().positive() }).parse(process.env);
const rows = rowsArgument();

function serverMemory(pid: number): { rss: number; peak: number } {
  const status = readFileSync(`/proc/${pid}/status`, "utf8");
  const kilobytes = (field: string) => Number(new RegExp(`^${field}:\\s+(\\d+) kB`, "m").exec(status)?.[1] ?? Number.NaN) * 1024;
  return { rss: kilobytes("VmRSS"), peak: kilobytes("VmHWM") };
}

const directory = mkdtempSync(join(tmpdir(), "firmsand-bench-import-http-"));
const file = join(directory, "bench-baseline.csv");
const written = writeBaselineCsv(file, rows);
const project = await createBenchProject();
const user = await User.create({ email: `bench-surveyor-${Date.now()}@example.org`, name: "Bench Surveyor (synthetic)", passwordHash: await hashPassword(`bench-${Date.now()}-${Math.random()}`) });
await Membership.create({ userId: user.id, projectId: project.id, role: "surveyor" });
const { token } = await createApiToken(user, "import benchmark");

const before = serverMemory(environment.BENCH_APP_PID);
const form = new FormData();
form.set("kind", "baseline");
form.set("surveyedOn", "2026-12-01");
form.set("waterSurfaceElevation", "30");
form.set("crs", "EPSG:2237");
form.set("file", await openAsBlob(file, { type: "text/csv" }), "bench-baseline.csv");
// BENCH_TRACE=1: the server's resident memory every half second while the upload is answered.
let started = performance.now();
const sampler = process.env.BENCH_TRACE === "1"
  ? setInterval(() => {
      const now = serverMemory(environment.BENCH_APP_PID);
      console.log(`  trace ${((performance.now() - started) / 1000).toFixed(1)} s server rss ${mb(now.rss)} MB, peak so far ${mb(now.peak)} MB`);
    }, 500)
  : null;
try {
  started = performance.now();
  const response = await fetch(`${environment.BENCH_BASE_URL}/api/projects/${project.id}/surveys`, {
    method: "POST",
    headers: { Authorization: `Bearer ${token}`, Origin: environment.BENCH_BASE_URL },
    body: form,
  });
  const body = await response.text();
  const seconds = (performance.now() - started) / 1000;
  if (response.status !== 201) throw new Error(`the import was refused (${response.status}): ${body.slice(0, 2000)}`);
  const after = serverMemory(environment.BENCH_APP_PID);
  console.log(
    `import over HTTP (multipart upload → 201 with statistics committed) of ${written.toLocaleString("en-US")} rows (${(statSync(file).size / 1e6).toFixed(1)} MB): ` +
      `${seconds.toFixed(1)} s, ${Math.round(written / seconds).toLocaleString("en-US")} rows/s; app server RSS ${mb(before.rss)} MB before, peak ${mb(after.peak)} MB; ` +
      `ratio to the goal (60 s, 600 MB): time ${(seconds / 60).toFixed(2)}, memory ${(after.peak / 1024 / 1024 / 600).toFixed(2)}`,
  );
} finally {
  if (sampler) clearInterval(sampler);
  await Survey.destroy({ where: { projectId: project.id } });
  await Membership.destroy({ where: { projectId: project.id } });
  await project.destroy();
  await user.destroy();
  rmSync(directory, { recursive: true, force: true });
  await closeSequelize();
}
