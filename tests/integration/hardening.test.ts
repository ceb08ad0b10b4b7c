import { spawnSync } from "node:child_process";
import { cpSync, mkdtempSync, readFileSync, rmSync, symlinkSync } from "node:fs";
import { connect, createServer, type AddressInfo } from "node:net";
import { tmpdir } from "node:os";
import { join } from "node:path";
import Papa from "papaparse";
import { ConnectionRefusedError } from "sequelize";
import { afterAll, describe, expect, it, vi } from "vitest";
import { closeSequelize } from "../../db/connection.server";
import { getDatabaseSettings } from "../../db/settings";
import { assertSameOrigin } from "~/lib/http/origin.server";
import { listMailboxMessages } from "~/lib/mail/mailbox.server";
import { deliverDue } from "~/lib/mail/outbox.server";
import { action as forgotPasswordAction } from "~/routes/forgot-password";
import { loader as loginLoader } from "~/routes/login";
import { loader as problemsCsvLoader } from "~/routes/projects.$projectId.surveys.imports.$jobId.problems[.]csv";
import { ImportJob, getSequelize } from "~/lib/db.server";
import { createApiToken } from "~/lib/auth/api-token.server";
import * as progressApi from "~/routes/api.projects.$projectId.progress";
import { analyseStagedFile } from "~/lib/import/analyse.server";
import { commitChoicesSchema, importOptionsSchema } from "~/lib/import/import-options";
import { loadProjectGeometry } from "~/lib/engine/project-geometry.server";
import { writeStagedFile } from "~/lib/import/stage-upload.server";
import { startsLikeFormula } from "../../shared/csv-safe";
import { SURVEYS } from "../../sample-data/scenario";
import { demoImportOptions } from "../../db/seeders/demo-surveys";
import { requireRole } from "~/lib/auth/access.server";
import { addMember, makeProject, makeUser, requestAs, thrown, ORIGIN } from "./helpers";
import { DEMO_DIR, makeDemoSiteProject } from "./import-helpers";

// Issue 12 ("Hardening"): each item's test is named after the item.

afterAll(closeSequelize);
process.env.UPLOAD_DIR = mkdtempSync(join(tmpdir(), "firmsand-hardening-test-"));

const ATTACKER = "http://attacker.example";

describe("hardening 1: links in e-mail come only from configured origins", () => {
  it("builds a password-reset link on the configured origin whatever the request's Host", async () => {
    const user = await makeUser("reset-host");
    const body = new URLSearchParams({ email: user.email });
    const request = new Request(`${ATTACKER}/forgot-password`, { method: "POST", body, headers: { Origin: ATTACKER, Host: "attacker.example" } });
    await forgotPasswordAction({ request, params: {}, context: {} } as never);
    await deliverDue();
    const mail = (await listMailboxMessages()).find((message) => message.envelopeTo.includes(user.email));
    const link = mail?.text.match(/https?:\/\/\S+\/reset-password\/\S+/)?.[0];
    expect(link, "the reset mail's link").toBeDefined();
    expect(new URL(link!).origin).toBe(ORIGIN);
  });

  it("refuses a form whose Origin matches only the request's own Host", async () => {
    const error = await thrown(async () => assertSameOrigin(new Request(`${ATTACKER}/forgot-password`, { method: "POST", headers: { Origin: ATTACKER } })));
    expect((error as Response).status).toBe(403);
  });

  it("refuses to start the production server without APP_ORIGIN", () => {
    const env: Record<string, string | undefined> = { ...process.env, NODE_ENV: "production" };
    delete env.APP_ORIGIN;
    // The build is never reached: the check comes first, so a missing build does not matter.
    const run = spawnSync(process.execPath, ["app/serve.mjs", "no-such-build/index.js"], { env, encoding: "utf8", timeout: 20_000 });
    expect(run.status).toBe(1);
    expect(run.stderr).toMatch(/APP_ORIGIN is required in production/);
  });
});

describe("hardening 4: open redirect", () => {
  async function loginRedirect(next: string): Promise<string | null> {
    const user = await makeUser("next");
    // The raw query as a browser sends it: the test names the percent-encoded form.
    const request = await requestAs(user.id, `/login?next=${next}`);
    const answer = await thrown(() => loginLoader({ request, params: {}, context: {} } as never));
    expect(answer, `the answer to next=${next}`).toBeInstanceOf(Response);
    expect((answer as Response).status).toBe(302);
    return (answer as Response).headers.get("Location");
  }

  it("follows a path of the app's own", async () => {
    expect(await loginRedirect(encodeURIComponent("/projects/7/map?layer=remaining#cell"))).toBe("/projects/7/map?layer=remaining#cell");
  });

  it("sends anything that is not a same-origin path to /projects, never an error", async () => {
    for (const next of [
      "/%09/other.host/x", "//other.host", "%2F%2Fother.host", "%5Cother.host", "/%5Cother.host", "%5C%5Cother.host", "http://other.host/",
      `${encodeURIComponent(ATTACKER)}%2Fprojects`, "/%0A/other.host", "/x%0D%0ASet-Cookie:a=b", "/%E3%80%82other.host", "/%00", "javascript:alert(1)", "",
    ]) {
      expect(await loginRedirect(next), `next=${next}`).toBe("/projects");
    }
  });
});

describe("hardening 8: every CSV the product writes is formula-safe", () => {
  it("writes the import problems CSV's values from the file so no spreadsheet runs them", async () => {
    const site = await makeDemoSiteProject("problems-csv");
    const survey = SURVEYS.find((candidate) => candidate.key === "progress-1")!;
    const [header, ...rows] = readFileSync(join(DEMO_DIR, survey.fileName), "utf8").trim().split("\n").slice(0, 21);
    const hostile = ['=HYPERLINK(""http://attacker.example"",""open"")', "@SUM(1)", "+1+1", "-2-2"];
    // Each hostile value replaces a depth, so the row rules report it as the problem's value.
    const text = [header, ...rows.map((row, index) => {
      const fields = row.split(",");
      if (index < hostile.length) fields[3] = `"${hostile[index]}"`;
      return fields.join(",");
    })].join("\n");
    const staged = await writeStagedFile(new Blob([text]).stream(), "hostile.csv");
    const options = importOptionsSchema.parse(demoImportOptions(survey, {}));
    const { preview } = await analyseStagedFile({ path: staged.path, sha256: staged.sha256, options, choices: commitChoicesSchema.parse({ outside: "keep" }), geometry: await loadProjectGeometry(site.project.id) });
    const job = await ImportJob.create({
      projectId: site.project.id, userId: site.users.surveyor, state: "ready", stage: "ready", fileName: "hostile.csv",
      filePath: staged.path, fileSize: text.length, contentSha256: staged.sha256, options, preview: preview as never,
    });
    const request = await requestAs(site.users.surveyor, `/projects/${site.project.id}/surveys/imports/${job.id}/problems.csv`);
    const response = (await problemsCsvLoader({ request, params: { projectId: String(site.project.id), jobId: String(job.id) }, context: {} } as never)) as Response;
    expect(response.status).toBe(200);
    const cells = Papa.parse<string[]>(await response.text(), { skipEmptyLines: true }).data;
    const values = cells.slice(1).map((cells) => cells[2]);
    // The file's values are all there, each shown as text.
    for (const value of hostile.map((raw) => raw.replaceAll('""', '"'))) expect(values).toContain(`'${value}`);
    for (const cell of cells.flat()) expect(startsLikeFormula(cell), cell).toBe(false);
  });
});

describe("hardening 12: project ids are plain decimal numbers", () => {
  it("answers 404 for 0x1, 1.0, ' 1' and the like, and serves the plain id", async () => {
    const project = await makeProject("plain-id");
    const user = await makeUser("plain-id");
    await addMember(user.id, project.id, "viewer");
    const request = await requestAs(user.id, `/projects/${project.id}`);
    await expect(requireRole(request, String(project.id))).resolves.toMatchObject({ project: { id: project.id } });
    for (const id of [`0x${project.id.toString(16)}`, `${project.id}.0`, ` ${project.id}`, `${project.id} `, `+${project.id}`, `0${project.id}`, `${project.id}e0`, "", "0", "-1"]) {
      const error = await thrown(() => requireRole(request, id));
      expect(error, `project id "${id}"`).toBeInstanceOf(Response);
      expect((error as Response).status, `project id "${id}"`).toBe(404);
    }
  });
});

describe("hardening 12: with the database down the API answers JSON 503", () => {
  it("answers 503 in the API's error shape, not a text/plain 500", async () => {
    const project = await makeProject("db-down");
    const user = await makeUser("db-down");
    await addMember(user.id, project.id, "viewer");
    const { token } = await createApiToken(user, "db-down");
    const request = new Request(`${ORIGIN}/api/projects/${project.id}/progress`, { headers: { Authorization: `Bearer ${token}` } });
    const args = { request, params: { projectId: String(project.id) }, context: {} } as never;
    expect((await progressApi.loader(args)).status, "with the database up").toBe(200);

    // What Sequelize throws when MariaDB refuses the connection (stopped server).
    const refused = Object.assign(new Error("connect ECONNREFUSED 127.0.0.1:1"), { code: "ECONNREFUSED" });
    const down = vi.spyOn(getSequelize().connectionManager, "getConnection").mockRejectedValue(new ConnectionRefusedError(refused));
    const quiet = vi.spyOn(console, "error").mockImplementation(() => {});
    try {
      const answer = await progressApi.loader(args);
      expect(answer.status).toBe(503);
      expect(answer.headers.get("Content-Type")).toMatch(/^application\/json/);
      expect(Number(answer.headers.get("Retry-After"))).toBeGreaterThan(0);
      const body = (await answer.json()) as { errors: Array<{ message: string }> };
      expect(body.errors[0].message).toMatch(/database/);
    } finally {
      down.mockRestore();
      quiet.mockRestore();
    }
  });
});

describe("hardening 12: npm run db:start also restarts the fake SMTP and S3 servers", () => {
  it("brings the fake SMTP and S3 servers back after db:stop stopped them", async () => {
    // The scripts in a checkout of their own (their .data/ is beside them), so this test cannot
    // stop the servers the test run uses. The database port is the test MariaDB's: reachable, so
    // start uses it as it is and stop leaves it alone (it is not this checkout's).
    const root = mkdtempSync(join(tmpdir(), "firmsand-db-start-"));
    cpSync(join(REPO, "db", "scripts"), join(root, "db", "scripts"), { recursive: true });
    cpSync(join(REPO, "package-lock.json"), join(root, "package-lock.json"), { preserveTimestamps: true });
    symlinkSync(join(REPO, "node_modules"), join(root, "node_modules"));
    const smtpPort = await freePort();
    const s3Port = await freePort();
    const env = { ...process.env, DB_PORT: String(getDatabaseSettings().DB_PORT), SMTP_PORT: String(smtpPort), S3_PORT: String(s3Port) };
    const db = (command: string) => {
      const run = spawnSync(process.execPath, ["db/scripts/db.mjs", command, "dev"], { cwd: root, env, encoding: "utf8", timeout: 60_000 });
      expect(run.status, `db.mjs ${command}: ${run.stderr}`).toBe(0);
    };
    try {
      db("start");
      expect(await portOpen(smtpPort), "fake SMTP after the first start").toBe(true);
      expect(await portOpen(s3Port), "fake S3 after the first start").toBe(true);
      db("stop");
      expect(await portOpen(smtpPort), "fake SMTP after stop").toBe(false);
      expect(await portOpen(s3Port), "fake S3 after stop").toBe(false);
      db("start");
      expect(await portOpen(smtpPort), "fake SMTP after start again").toBe(true);
      expect(await portOpen(s3Port), "fake S3 after start again").toBe(true);
    } finally {
      db("stop");
      rmSync(root, { recursive: true, force: true });
    }
  });
});

const REPO = join(import.meta.dirname, "..", "..");

function freePort(): Promise<number> {
  return new Promise((done, fail) => {
    const server = createServer().listen(0, "127.0.0.1", () => {
      const { port } = server.address() as AddressInfo;
      server.close(() => done(port));
    }).on("error", fail);
  });
}

function portOpen(port: number): Promise<boolean> {
  return new Promise((done) => {
    const socket = connect(port, "127.0.0.1");
    socket.once("connect", () => { socket.destroy(); done(true); });
    socket.once("error", () => done(false));
  });
}

describe("hardening 10: impossible coordinates and depths are row errors", () => {
  it("refuses non-finite values, values beyond ±1e7 and points far outside the project CRS's area of use", async () => {
    const site = await makeDemoSiteProject("impossible");
    const survey = SURVEYS.find((candidate) => candidate.key === "progress-1")!;
    const [header, ...rows] = readFileSync(join(DEMO_DIR, survey.fileName), "utf8").trim().split("\n").slice(0, 141);
    expect(header.split(",").slice(1, 4)).toEqual(["easting", "northing", "depth"]);
    // Rows 2–101: easting 1e308 (a hundred of them); then an infinity, a northing beyond −1e7,
    // and a point 3,000 km north of the CRS's area (Florida West, US survey feet).
    const edits: Array<[number, number, string]> = [
      ...Array.from({ length: 100 }, (_, index): [number, number, string] => [index, 1, "1e308"]),
      [100, 2, "1e400"],
      [101, 2, "-2e7"],
      [102, 2, String(1_680_000 + 3_000_000 / 0.3048006)],
    ];
    const edited = rows.map((row) => row.split(","));
    for (const [index, column, value] of edits) edited[index][column] = value;
    const text = [header, ...edited.map((fields) => fields.join(","))].join("\n");
    const staged = await writeStagedFile(new Blob([text]).stream(), "impossible.csv");
    const options = importOptionsSchema.parse(demoImportOptions(survey, {}));
    const { preview } = await analyseStagedFile({ path: staged.path, sha256: staged.sha256, options, choices: commitChoicesSchema.parse({ outside: "keep" }), geometry: await loadProjectGeometry(site.project.id) });

    const rangeRows = new Set(preview.problems.filter((problem) => problem.rule === "coordinate range").map((problem) => problem.row));
    // Spreadsheet rows: the header is row 1, so data row index i is row i + 2.
    expect([...rangeRows].sort((a, b) => a - b)).toEqual(edits.map(([index]) => index + 2));
    expect(preview.problemRows).toBeGreaterThanOrEqual(edits.length);
    expect(preview.blockers.join(" ")).toMatch(/rows have problems/);
    // Leaving those rows out stores the plausible rest.
    const withoutThem = await analyseStagedFile({ path: staged.path, sha256: staged.sha256, options, choices: commitChoicesSchema.parse({ outside: "keep", excludeErrorRows: true }), geometry: await loadProjectGeometry(site.project.id) });
    expect(withoutThem.preview.storedCount).toBe(rows.length - edits.length);
  });
});
