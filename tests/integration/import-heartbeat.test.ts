import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeSequelize } from "../../db/connection.server";
import { SURVEYS } from "../../sample-data/scenario";
import { demoImportOptions } from "../../db/seeders/demo-surveys";
import { requireRole } from "~/lib/auth/access.server";
import { ImportJob, getSequelize } from "~/lib/db.server";
import { CUT_OFF_COMMIT_MS, CUT_OFF_MESSAGE, startCommitHeartbeat } from "~/lib/import/abandoned-uploads.server";
import { importOptionsSchema } from "~/lib/import/import-options";
import { findImportJob } from "~/lib/import/import-job-view.server";
import { createImportJob } from "~/lib/import/import-service.server";
import { writeStagedFile } from "~/lib/import/stage-upload.server";
import { makeDemoSiteProject } from "./import-helpers";
import { requestAs } from "./helpers";

// Hardening 9: an import cut off mid-commit (server or database gone) must not stay "committing"
// for an hour behind a frozen progress bar; its heartbeat stops, and the next look marks it failed.
process.env.UPLOAD_DIR = mkdtempSync(join(tmpdir(), "firmsand-heartbeat-test-"));

afterAll(closeSequelize);

const options = importOptionsSchema.parse(demoImportOptions(SURVEYS.find((survey) => survey.key === "progress-1")!));
let site: Awaited<ReturnType<typeof makeDemoSiteProject>>;

beforeAll(async () => {
  site = await makeDemoSiteProject("heartbeat");
});

async function committingJob(updatedMsAgo: number): Promise<ImportJob> {
  const staged = await writeStagedFile(new Blob(["easting,northing,depth\n1,2,3\n"]).stream(), "soundings.csv");
  const job = await createImportJob(site.project.id, site.users.surveyor, staged, options);
  await job.update({ state: "committing", stage: "storing soundings" });
  await getSequelize().query("UPDATE import_jobs SET updatedAt = ? WHERE id = ?", { replacements: [new Date(Date.now() - updatedMsAgo), job.id] });
  return job;
}

const surveyorAccess = async () => requireRole(await requestAs(site.users.surveyor, `/projects/${site.project.id}/surveys`), site.project.id, "surveys.import");

describe("hardening 9: an interrupted import is failed at once on the next look", () => {
  it("marks a commit silent for longer than the cut-off failed, saying nothing was stored", async () => {
    const job = await committingJob(CUT_OFF_COMMIT_MS + 5_000);
    const seen = await findImportJob(await surveyorAccess(), job.id);
    expect(seen!.state).toBe("failed");
    expect(seen!.error).toBe(CUT_OFF_MESSAGE);
    expect(CUT_OFF_COMMIT_MS).toBeLessThanOrEqual(60_000); // the rule: older than a minute
  });

  it("leaves a commit with a recent heartbeat alone", async () => {
    const job = await committingJob(15_000);
    expect((await findImportJob(await surveyorAccess(), job.id))!.state).toBe("committing");
  });

  it("the heartbeat keeps a long commit alive and never overwrites its final state", async () => {
    const job = await committingJob(CUT_OFF_COMMIT_MS - 1_000);
    const stop = startCommitHeartbeat(job.id, 40);
    await new Promise((done) => setTimeout(done, 200));
    await job.reload();
    expect(Date.now() - job.updatedAt.getTime()).toBeLessThan(5_000);
    await ImportJob.update({ state: "done", stage: "done" }, { where: { id: job.id } });
    await new Promise((done) => setTimeout(done, 120));
    stop();
    await job.reload();
    expect(job.state).toBe("done");
  });
});
