import { spawn, type ChildProcess } from "node:child_process";
import { once } from "node:events";
import { mkdtempSync, rmSync } from "node:fs";
import { connect, createServer, type AddressInfo } from "node:net";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeSequelize } from "../../db/connection.server";
import { AuditEvent, DailyReport, Dive, DiveTeam, OutgoingMail, Project } from "~/lib/db.server";
import { presentProject } from "~/lib/auth/project-view.server";
import { deliverDue } from "~/lib/mail/outbox.server";
import type { MailMessage } from "~/lib/mail/mail.server";
import { getObject } from "~/lib/storage/storage.server";
import { action as signAction } from "~/routes/api.projects.$projectId.days.$date.sign";
import { loader as dayLoader } from "~/routes/api.projects.$projectId.days.$date";
import { loader as pageLoader } from "~/routes/projects.$projectId.days.$date";
import { action as daysAction } from "~/routes/projects.$projectId.days";
import { loader as batchLoader } from "~/routes/projects.$projectId.days.batch[.]pdf";
import { addSubscriber, dailyReportPdf, prepareDueSignedPdfs } from "~/models/daily-reports.server";
import { pdfPages } from "../pdf-text";
import { addMember, makeProject, makeUser, requestAs } from "./helpers";

// Signing a daily report while the file storage is down: the signature is what a supervisor cannot
// lose (practice: it is the record of the day a claim rests on), so it commits on the database
// alone; the PDF is marked "being prepared", still downloads (drawn from the signed figures), and a
// job stores it and queues it to the subscribers once the storage answers again. This file runs
// its own fake S3 server on a free port, so stopping it touches no other test.

const freePort = () => new Promise<number>((done, fail) => {
  const server = createServer().listen(0, "127.0.0.1", () => {
    const { port } = server.address() as AddressInfo;
    server.close(() => done(port));
  }).on("error", fail);
});
const portOpen = (port: number) => new Promise<boolean>((done) => {
  const socket = connect(port, "127.0.0.1");
  socket.once("connect", () => { socket.destroy(); done(true); });
  socket.once("error", () => done(false));
});

const port = await freePort();
const bucket = "firmsand-storage-down";
const directory = mkdtempSync(join(tmpdir(), "firmsand-storage-down-"));
const savedEnv = { S3_ENDPOINT: process.env.S3_ENDPOINT, S3_BUCKET: process.env.S3_BUCKET };
// Read by the storage module on its first use, which comes after this.
process.env.S3_ENDPOINT = `http://127.0.0.1:${port}`;
process.env.S3_BUCKET = bucket;

let store: ChildProcess | null = null;
async function startStore() {
  store = spawn(process.execPath, ["db/scripts/s3-server.mjs", String(port), directory, bucket], { stdio: "ignore" });
  const deadline = Date.now() + 15_000;
  while (!(await portOpen(port))) {
    if (Date.now() > deadline) throw new Error("the test's fake S3 server did not start");
    await new Promise((done) => setTimeout(done, 100));
  }
}
async function stopStore() {
  if (!store) return;
  const exited = once(store, "exit");
  store.kill("SIGTERM");
  await exited;
  store = null;
  expect(await portOpen(port)).toBe(false);
}

const TZ = "America/New_York";
const UP_DAY = "2026-07-06";
const DOWN_DAY = "2026-07-07";
let projectId: number;
let supervisorId: number;
let managerId: number;
const subscriber = "contracts@agency.example";

beforeAll(async () => {
  const project = await makeProject("storage-down");
  projectId = project.id;
  await Project.update({ timeZone: TZ }, { where: { id: projectId } });
  const supervisor = await makeUser("storage-down-supervisor");
  const manager = await makeUser("storage-down-manager");
  supervisorId = supervisor.id;
  managerId = manager.id;
  await addMember(supervisor.id, projectId, "dive-supervisor");
  await addMember(manager.id, projectId, "manager");
  const team = await DiveTeam.create({ projectId, name: "Alpha", hoses: [], members: [{ name: "a", email: "", duty: "diver" }] });
  for (const [day, minutes] of [[UP_DAY, 41], [DOWN_DAY, 52]] as const) {
    await Dive.create({ projectId, diveDate: day, teamId: team.id, diverName: "Diver", leftSurfaceAt: null, leftBottomAt: null, bottomMinutes: minutes, maxDepth: 9, notes: "" });
  }
  await addSubscriber(presentProject((await Project.findByPk(projectId))!), manager, { email: subscriber });
  await startStore();
});

afterAll(async () => {
  await stopStore();
  rmSync(directory, { recursive: true, force: true });
  await closeSequelize();
  for (const [name, value] of Object.entries(savedEnv)) {
    if (value === undefined) delete process.env[name];
    else process.env[name] = value;
  }
});

const sign = async (date: string, name: string) => signAction({
  request: await requestAs(supervisorId, `/api/projects/${projectId}/days/${date}/sign`, { method: "POST", body: JSON.stringify({ name }), headers: { "Content-Type": "application/json", Origin: "http://127.0.0.1:3999" } }),
  params: { projectId: String(projectId), date }, context: {},
} as never) as Promise<Response>;
const reportRow = (date: string) => DailyReport.findOne({ where: { projectId, localDate: date } });
const mailsOf = async (date: string) => OutgoingMail.findAll({ where: { ref: `daily-report:${(await reportRow(date))!.id}` } });
const pdfKey = (date: string) => `projects/${projectId}/daily-reports/${date}/signed.pdf`;

describe("signing while the file storage is down", () => {
  it("with the storage up, the signed PDF is stored and queued to the subscribers at once", async () => {
    const answer = await sign(UP_DAY, "Dana Reyes");
    expect(answer.status).toBe(201);
    expect((await answer.json()).signed).toMatchObject({ name: "Dana Reyes", pdf: "stored" });
    expect(await getObject(pdfKey(UP_DAY))).not.toBeNull();
    expect((await mailsOf(UP_DAY)).map((mail) => mail.toAddress)).toEqual([subscriber]);
  });

  it("keeps the signature: 201, locked, the PDF 'being prepared', nothing sent without its file; the PDF still downloads", async () => {
    await stopStore();
    const started = Date.now();
    const answer = await sign(DOWN_DAY, "Dana Reyes");
    expect(answer.status).toBe(201);
    const body = await answer.json();
    expect(body.signed).toMatchObject({ name: "Dana Reyes", pdf: "preparing" });
    expect(body.dives).toMatchObject({ count: 1, bottomMinutes: 52 });
    const row = (await reportRow(DOWN_DAY))!;
    expect(row.signedByName).toBe("Dana Reyes");
    expect(row.pdfAttempts).toBe(1);
    expect(row.pdfLastError).toBeTruthy();
    // The first retry 15 s after the failed attempt (DATETIME keeps whole seconds).
    expect(row.pdfDueAt!.getTime()).toBeGreaterThanOrEqual(Math.floor(started / 1000) * 1000 + 15_000 - 1000);
    expect(await mailsOf(DOWN_DAY)).toHaveLength(0);
    // Locked like any signed report: a second signature is refused.
    expect((await sign(DOWN_DAY, "Someone Else")).status).toBe(409);
    // The API and the page say the PDF is being prepared.
    const day = await dayLoader({ request: await requestAs(supervisorId, `/api/projects/${projectId}/days/${DOWN_DAY}`), params: { projectId: String(projectId), date: DOWN_DAY }, context: {} } as never) as Response;
    expect((await day.json()).signed.pdf).toBe("preparing");
    const page = await pageLoader({ request: await requestAs(supervisorId, `/projects/${projectId}/days/${DOWN_DAY}`), params: { projectId: String(projectId), date: DOWN_DAY }, context: {} } as never);
    expect(page.pdfPending).toMatchObject({ attempts: 1 });
    // Download: drawn from the signed figures, not stored.
    const pdf = await dailyReportPdf(presentProject((await Project.findByPk(projectId))!), DOWN_DAY);
    expect(pdf.stored).toBe(false);
    const text = (await pdfPages(pdf.bytes)).join("\n");
    expect(text).toMatch(/1\s*dives · 52\s*bottom minutes/);
    expect(text).toContain("Dana Reyes");
    // The job's retry while the storage is still down: one more attempt, the next a minute later.
    const retryAt = new Date(row.pdfDueAt!.getTime() + 1000);
    expect(await prepareDueSignedPdfs(retryAt)).toBe(0);
    const waiting = (await reportRow(DOWN_DAY))!;
    expect(waiting.pdfAttempts).toBe(2);
    expect(Math.abs(waiting.pdfDueAt!.getTime() - (retryAt.getTime() + 60_000))).toBeLessThan(1000);
  });

  it("once the storage answers, the job stores the PDF and queues it to the subscribers, once", async () => {
    await startStore();
    const later = new Date(Date.now() + 10 * 60_000);
    expect(await prepareDueSignedPdfs(later)).toBeGreaterThanOrEqual(1);
    const row = (await reportRow(DOWN_DAY))!;
    expect(row.pdfDueAt).toBeNull();
    expect(row.pdfAttempts).toBe(0);
    const stored = await getObject(pdfKey(DOWN_DAY));
    expect(stored).not.toBeNull();
    const mails = await mailsOf(DOWN_DAY);
    expect(mails.map((mail) => mail.toAddress)).toEqual([subscriber]);
    expect(mails[0]!.attachments![0]!.storageKey).toBe(pdfKey(DOWN_DAY));
    // Run again: nothing is due, nothing sent twice.
    await prepareDueSignedPdfs(new Date(later.getTime() + 60_000));
    expect(await mailsOf(DOWN_DAY)).toHaveLength(1);
    // The outbox sends the stored file (a stand-in transport catches it).
    const sent: MailMessage[] = [];
    await deliverDue(new Date(Date.now() + 1000), async (mail) => { sent.push(mail); });
    const attached = sent.find((mail) => mail.subject === `Daily report ${DOWN_DAY} signed · Test project storage-down`)!.attachments![0]!;
    expect(Buffer.compare(attached.content, stored!.bytes)).toBe(0);
    expect((await pdfPages(attached.content)).join("\n")).toMatch(/1\s*dives · 52\s*bottom minutes/);
  });
});

describe("the two-week batch while the file storage is down", () => {
  const sendBatch = async () => daysAction({
    request: await requestAs(managerId, `/projects/${projectId}/days`, { method: "POST", body: new URLSearchParams({ intent: "send-batch", from: UP_DAY, to: DOWN_DAY }), headers: { Origin: "http://127.0.0.1:3999" } }),
    params: { projectId: String(projectId) }, context: {},
  } as never) as unknown as Promise<{ init?: { status?: number; headers?: Record<string, string> }; data?: { errors: Record<string, string> }; errors?: Record<string, string>; notice?: string }>;
  const batchMails = () => OutgoingMail.count({ where: { ref: `daily-report-batch:${projectId}` } });

  it("still downloads (made from the database); sending answers 503 with Retry-After naming the file storage, and sends nothing", async () => {
    await stopStore();
    const download = await batchLoader({ request: await requestAs(supervisorId, `/projects/${projectId}/days/batch.pdf?from=${UP_DAY}&to=${DOWN_DAY}`), params: { projectId: String(projectId) }, context: {} } as never) as Response;
    expect(download.status).toBe(200);
    const pages = await pdfPages(new Uint8Array(await download.arrayBuffer()));
    expect(pages.join("\n")).toMatch(/1\s*dives · 41\s*bottom minutes[\s\S]*1\s*dives · 52\s*bottom minutes/);

    const refused = await sendBatch();
    expect(refused.init?.status).toBe(503);
    expect(refused.init?.headers).toMatchObject({ "Retry-After": "60" });
    expect(refused.data?.errors.form).toMatch(/^Firmsand's file storage is not answering right now \(ECONNREFUSED\)\. Nothing was stored or sent; try again in a minute\. The batch PDF can still be downloaded/);
    expect(await batchMails()).toBe(0);
    expect(await AuditEvent.count({ where: { projectId, action: "daily-report-batch-sent" } })).toBe(0);
  });

  it("once the storage answers, the same batch goes out", async () => {
    await startStore();
    const sent = await sendBatch();
    expect(sent.init).toBeUndefined();
    expect(sent.notice).toMatch(/go out as one PDF to 1 subscriber/);
    expect(await batchMails()).toBe(1);
  });
});
