import { existsSync, mkdirSync, mkdtempSync, utimesSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeSequelize } from "../../db/connection.server";
import { SURVEYS } from "../../sample-data/scenario";
import { ImportJob, getSequelize } from "~/lib/db.server";
import { CUT_OFF_MESSAGE, EXPIRED_MARKER_KEEP_MS, isExpiredJob, sweepAbandonedUploads } from "~/lib/import/abandoned-uploads.server";
import { commitChoicesSchema, importOptionsSchema } from "~/lib/import/import-options";
import { createImportJob, ImportJobClosed, previewImportJob, startImportJobCommit } from "~/lib/import/import-service.server";
import { stagingDirectory, writeStagedFile } from "~/lib/import/stage-upload.server";
import { demoImportOptions } from "../../db/seeders/demo-surveys";
import { DEMO_DIR, makeDemoSiteProject } from "./import-helpers";
import { requestAs } from "./helpers";

// The sweep of abandoned uploads against the real database and a temporary UPLOAD_DIR: jobs and
// files are aged by setting updatedAt and file modification times into the past.
process.env.UPLOAD_DIR = mkdtempSync(join(tmpdir(), "firmsand-sweep-test-"));

afterAll(closeSequelize);

const HOUR = 3600_000;
const RETENTION = 24 * HOUR;
const now = new Date();
const hoursAgo = (hours: number) => new Date(now.getTime() - hours * HOUR);
const progress1 = SURVEYS.find((survey) => survey.key === "progress-1")!;
const options = importOptionsSchema.parse(demoImportOptions(progress1));

async function stagedCsv(text: string, modifiedHoursAgo: number) {
  const staged = await writeStagedFile(new Blob([text]).stream(), "soundings.csv");
  const when = hoursAgo(modifiedHoursAgo);
  utimesSync(staged.path, when, when);
  return staged;
}

async function age(job: ImportJob, updatedHoursAgo: number) {
  await getSequelize().query("UPDATE import_jobs SET updatedAt = ? WHERE id = ?", { replacements: [hoursAgo(updatedHoursAgo), job.id] });
}

describe("sweep of abandoned uploads", () => {
  let site: Awaited<ReturnType<typeof makeDemoSiteProject>>;
  const jobs: Record<string, ImportJob> = {};
  const files: Record<string, string> = {};
  const csv = "easting,northing,depth\n1,2,3\n";

  beforeAll(async () => {
    site = await makeDemoSiteProject("sweep");
    const userId = site.users.surveyor;
    for (const [name, state, updated] of [
      ["oldStaged", "staged", 30],
      ["oldReady", "ready", 25],
      ["oldFailed", "failed", 48],
      ["oldValidating", "validating", 72],
      ["freshReady", "ready", 2],
      ["oldCommitting", "committing", 96],
      ["liveCommitting", "committing", 0.005], // 18 s: within the heartbeat's cut-off
    ] as const) {
      const staged = await stagedCsv(csv, updated);
      const job = await createImportJob(site.project.id, userId, staged, options);
      await job.update({ state, stage: state === "committing" ? "storing soundings" : "preview" });
      await age(job, updated);
      jobs[name] = job;
      files[name] = staged.path;
    }
    // A done job whose staged file was left behind (its discard failed): the file is not needed.
    const doneFile = await stagedCsv(csv, 40);
    jobs.oldDone = await createImportJob(site.project.id, userId, doneFile, options);
    await jobs.oldDone.update({ state: "done", stage: "done" });
    await age(jobs.oldDone, 40);
    files.oldDone = doneFile.path;
    // Files no job refers to: an old one, a fresh one, and an old file of a name Firmsand never writes.
    files.oldOrphan = (await stagedCsv(csv, 30)).path;
    files.freshOrphan = (await stagedCsv(csv, 1)).path;
    mkdirSync(stagingDirectory(), { recursive: true });
    files.foreign = join(stagingDirectory(), "notes.txt");
    writeFileSync(files.foreign, "kept by the operator");
    utimesSync(files.foreign, hoursAgo(100), hoursAgo(100));
  });

  it("expires untouched unfinished jobs, keeps recent and committing ones, and removes stray staged files", async () => {
    const result = await sweepAbandonedUploads({ retentionMs: RETENTION, now });
    // Other test files may share the database, so count only this project's jobs.
    const reloaded = Object.fromEntries(await Promise.all(Object.entries(jobs).map(async ([name, job]) => [name, await ImportJob.findByPk(job.id)] as const)));
    for (const name of ["oldStaged", "oldReady", "oldFailed", "oldValidating"]) {
      const job = reloaded[name]!;
      expect(isExpiredJob(job), name).toBe(true);
      expect(job.preview).toBeNull();
      expect(job.error).toMatch(/waited more than 1 day without being imported.*Nothing was stored\. Upload the file again/);
      expect(existsSync(files[name]), name).toBe(false);
    }
    expect(result.expiredJobs).toBeGreaterThanOrEqual(4);
    expect(reloaded.freshReady!.state).toBe("ready");
    expect(existsSync(files.freshReady)).toBe(true);
    // A commit is never expired. One that wrote nothing for an hour was cut off (the server
    // stopped): it is marked failed, saying so, and keeps its file to be committed again.
    expect(reloaded.liveCommitting!.state).toBe("committing");
    expect(existsSync(files.liveCommitting)).toBe(true);
    expect(reloaded.oldCommitting!.state).toBe("failed");
    expect(isExpiredJob(reloaded.oldCommitting!)).toBe(false);
    expect(reloaded.oldCommitting!.error).toBe(CUT_OFF_MESSAGE);
    expect(result.cutOffCommits).toBeGreaterThanOrEqual(1);
    expect(existsSync(files.oldCommitting)).toBe(true);
    expect(reloaded.oldDone!.state).toBe("done");

    expect(existsSync(files.oldDone)).toBe(false);
    expect(existsSync(files.oldOrphan)).toBe(false);
    expect(result.orphanFiles).toBe(2);
    expect(existsSync(files.freshOrphan)).toBe(true);
    expect(existsSync(files.foreign)).toBe(true);

    // A second sweep finds nothing new.
    const again = await sweepAbandonedUploads({ retentionMs: RETENTION, now });
    expect(again.orphanFiles).toBe(0);
    expect((await ImportJob.findByPk(jobs.freshReady.id))!.state).toBe("ready");
  });

  it("a longer retention keeps what a shorter one expires", async () => {
    const staged = await stagedCsv(csv, 30);
    const job = await createImportJob(site.project.id, site.users.surveyor, staged, options);
    await job.update({ state: "ready", stage: "preview" });
    await age(job, 30);
    await sweepAbandonedUploads({ retentionMs: 48 * HOUR, now });
    expect((await ImportJob.findByPk(job.id))!.state).toBe("ready");
    expect(existsSync(staged.path)).toBe(true);
    await sweepAbandonedUploads({ retentionMs: 12 * HOUR, now });
    expect(isExpiredJob((await ImportJob.findByPk(job.id))!)).toBe(true);
    expect(existsSync(staged.path)).toBe(false);
    await expect(sweepAbandonedUploads({ retentionMs: 0, now })).rejects.toThrow(/positive/);
  });

  it("an expired job can be neither checked again nor committed, and its page says it expired", async () => {
    const job = (await ImportJob.findByPk(jobs.oldStaged.id))!;
    await expect(previewImportJob(job, options, commitChoicesSchema.parse({}))).rejects.toBeInstanceOf(ImportJobClosed);
    await startImportJobCommit(job, options, commitChoicesSchema.parse({}), null);
    expect(isExpiredJob((await ImportJob.findByPk(job.id))!)).toBe(true);

    const page = await import("~/routes/projects.$projectId.surveys.imports.$jobId");
    const path = `/projects/${site.project.id}/surveys/imports/${job.id}`;
    const params = { projectId: String(site.project.id), jobId: String(job.id) };
    const data = await page.loader({ request: await requestAs(site.users.surveyor, path), params, context: {} } as never);
    expect(data.job.expired).toBe(true);
    expect(data.job.error).toMatch(/Upload the file again/);
    const form = new URLSearchParams({ intent: "commit" });
    const post = await requestAs(site.users.surveyor, path, { method: "POST", body: form, headers: { "Content-Type": "application/x-www-form-urlencoded" } });
    const answer = (await page.action({ request: post, params, context: {} } as never)) as unknown as { init: { status: number }; data: { error: string } };
    expect(answer.init.status).toBe(410);
    expect(answer.data.error).toMatch(/Upload the file again/);

    // The survey list no longer offers it among the unfinished uploads.
    const list = await import("~/routes/projects.$projectId.surveys");
    const listed = await list.loader({ request: await requestAs(site.users.surveyor, `/projects/${site.project.id}/surveys`), params: { projectId: String(site.project.id) }, context: {} } as never);
    expect(listed.pending.map((pending: { id: number }) => pending.id)).not.toContain(job.id);
    expect(listed.pending.map((pending: { id: number }) => pending.id)).toContain(jobs.freshReady.id);
  });

  it("a commit that starts first keeps its file from the sweep", async () => {
    const staged = await writeStagedFile(new Blob([await import("node:fs/promises").then((fs) => fs.readFile(join(DEMO_DIR, progress1.fileName)))]).stream(), progress1.fileName);
    const job = await createImportJob(site.project.id, site.users.surveyor, staged, options);
    await age(job, 30);
    const commit = startImportJobCommit((await ImportJob.findByPk(job.id))!, options, commitChoicesSchema.parse({}), null);
    const swept = sweepAbandonedUploads({ retentionMs: RETENTION, now: new Date() });
    await Promise.all([commit, swept]);
    const after = (await ImportJob.findByPk(job.id))!;
    // Either the commit claimed the job first (and finished) or the sweep expired it before the
    // commit began (and the commit did nothing): never a commit that lost its file midway.
    if (isExpiredJob(after)) expect(after.surveyId).toBeNull();
    else expect(after.state).toBe("done");
    expect(after.error ?? "").not.toMatch(/ENOENT|Nothing was stored: /);
  });

  it("removes expired markers a month after they expired", async () => {
    const job = (await ImportJob.findByPk(jobs.oldReady.id))!;
    await getSequelize().query("UPDATE import_jobs SET updatedAt = ? WHERE id = ?", { replacements: [new Date(now.getTime() - EXPIRED_MARKER_KEEP_MS - HOUR), job.id] });
    const result = await sweepAbandonedUploads({ retentionMs: RETENTION, now });
    expect(result.removedMarkers).toBeGreaterThanOrEqual(1);
    expect(await ImportJob.findByPk(job.id)).toBeNull();
    expect(await ImportJob.findByPk(jobs.oldFailed.id)).not.toBeNull();
  });
});
