import { createServer, type AddressInfo, type Socket } from "node:net";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeSequelize } from "../../db/connection.server";
import { DailyReport, Dive, DiveTeam, Project } from "~/lib/db.server";
import { ServiceUnavailableError } from "~/lib/errors";
import { storageEnvSchema } from "~/lib/settings/env.server";
import { StorageUnavailableError, getObject, putObject } from "~/lib/storage/storage.server";
import { loader as pdfLoader } from "~/routes/projects.$projectId.days.$date.report[.]pdf";
import { action as signAction } from "~/routes/api.projects.$projectId.days.$date.sign";
import { ORIGIN, addMember, makeProject, makeUser, requestAs } from "./helpers";

// A file store that accepts the connection and then never answers (a hung server, a half-open
// proxy) must not hold a request forever: each attempt ends at S3_REQUEST_TIMEOUT_MS, and the
// caller gets a ServiceUnavailableError naming the file storage (503 with Retry-After through the
// API). This file runs its own silent TCP server, so no other test's store is touched.

const sockets = new Set<Socket>();
const silent = createServer((socket) => {
  // Reads what the client sends and says nothing back.
  sockets.add(socket);
  socket.on("data", () => undefined);
  socket.on("close", () => sockets.delete(socket));
});
await new Promise<void>((done) => silent.listen(0, "127.0.0.1", done));
const port = (silent.address() as AddressInfo).port;

const TIMEOUT_MS = 400;
const ATTEMPTS = 2;
const saved = Object.fromEntries(["S3_ENDPOINT", "S3_BUCKET", "S3_REQUEST_TIMEOUT_MS", "S3_CONNECT_TIMEOUT_MS", "S3_MAX_ATTEMPTS"].map((name) => [name, process.env[name]]));
// Read by the storage module on its first use, which comes after this.
process.env.S3_ENDPOINT = `http://127.0.0.1:${port}`;
process.env.S3_BUCKET = "firmsand-hung";
process.env.S3_REQUEST_TIMEOUT_MS = String(TIMEOUT_MS);
process.env.S3_CONNECT_TIMEOUT_MS = "300";
process.env.S3_MAX_ATTEMPTS = String(ATTEMPTS);

afterAll(async () => {
  for (const socket of sockets) socket.destroy();
  await new Promise((done) => silent.close(done));
  await closeSequelize();
  for (const [name, value] of Object.entries(saved)) {
    if (value === undefined) delete process.env[name];
    else process.env[name] = value;
  }
});

/** How long `run` took to settle, and what it threw. */
async function timed(run: () => Promise<unknown>): Promise<{ ms: number; error: unknown }> {
  const started = performance.now();
  try {
    await run();
    return { ms: performance.now() - started, error: null };
  } catch (error) {
    return { ms: performance.now() - started, error };
  }
}

describe("a file store that never answers", () => {
  it("storing and reading end after the request timeout with a 503-kind error naming the file storage", async () => {
    for (const run of [() => putObject("tests/hung/a.bin", Buffer.from("firmsand"), "application/octet-stream"), () => getObject("tests/hung/a.bin")]) {
      const { ms, error } = await timed(run);
      expect(error).toBeInstanceOf(StorageUnavailableError);
      expect(error).toBeInstanceOf(ServiceUnavailableError);
      expect((error as Error).message).toMatch(/^Firmsand's file storage is not answering right now \(timed out\)/);
      expect((error as ServiceUnavailableError).retryAfterSeconds).toBe(60);
      // It waited for the timeout (the store did accept the connection) and gave up after its attempts:
      // at least one timeout, at most every attempt's timeout plus the SDK's back-off (under a second each).
      expect(ms).toBeGreaterThanOrEqual(TIMEOUT_MS - 20);
      expect(ms).toBeLessThan(ATTEMPTS * (TIMEOUT_MS + 1_000) + 1_000);
    }
  });

  it("a signature still commits and answers; the day's PDF still downloads, drawn from the database", async () => {
    const project = await makeProject("storage-hung");
    const supervisor = await makeUser("storage-hung-supervisor");
    await addMember(supervisor.id, project.id, "dive-supervisor");
    const team = await DiveTeam.create({ projectId: project.id, name: "Alpha", hoses: [], members: [{ name: "a", email: "", duty: "diver" }] });
    await Dive.create({ projectId: project.id, diveDate: "2026-07-08", teamId: team.id, diverName: "Diver", leftSurfaceAt: null, leftBottomAt: null, bottomMinutes: 33, maxDepth: 7, notes: "" });
    const params = { projectId: String(project.id), date: "2026-07-08" };
    const signing = await timed(async () => {
      const answer = await signAction({ request: await requestAs(supervisor.id, `/api/projects/${project.id}/days/2026-07-08/sign`, { method: "POST", body: JSON.stringify({ name: "Dana Reyes" }), headers: { "Content-Type": "application/json", Origin: ORIGIN } }), params, context: {} } as never) as Response;
      expect(answer.status).toBe(201);
      expect((await answer.json()).signed.pdf).toBe("preparing");
    });
    expect(signing.error).toBeNull();
    expect(signing.ms).toBeLessThan(9_000);
    const row = await DailyReport.findOne({ where: { projectId: project.id, localDate: "2026-07-08" } });
    expect(row!.pdfLastError).toMatch(/file storage is not answering/);
    const download = await timed(async () => {
      const answer = await pdfLoader({ request: await requestAs(supervisor.id, `/projects/${project.id}/days/2026-07-08/report.pdf`), params, context: {} } as never) as Response;
      expect(answer.status).toBe(200);
      expect(answer.headers.get("Content-Type")).toBe("application/pdf");
    });
    expect(download.error).toBeNull();
    expect(download.ms).toBeLessThan(ATTEMPTS * (TIMEOUT_MS + 1_000) + 3_000);
  });
});

describe("the store's timeouts as settings", () => {
  it("default to 5 s to connect, 30 s a request, 2 attempts, and refuse values out of range naming the setting", () => {
    expect(storageEnvSchema.parse({})).toMatchObject({ S3_CONNECT_TIMEOUT_MS: 5_000, S3_REQUEST_TIMEOUT_MS: 30_000, S3_MAX_ATTEMPTS: 2 });
    expect(storageEnvSchema.parse({ S3_REQUEST_TIMEOUT_MS: "1500" }).S3_REQUEST_TIMEOUT_MS).toBe(1_500);
    for (const [name, value, message] of [
      ["S3_REQUEST_TIMEOUT_MS", "0", "S3_REQUEST_TIMEOUT_MS must be at least 100"],
      ["S3_REQUEST_TIMEOUT_MS", "soon", "S3_REQUEST_TIMEOUT_MS must be a number of milliseconds"],
      ["S3_CONNECT_TIMEOUT_MS", "120000", "S3_CONNECT_TIMEOUT_MS must be at most 60000 (1 minute)"],
      ["S3_MAX_ATTEMPTS", "2.5", "S3_MAX_ATTEMPTS must be a whole number"],
    ] as const) {
      const parsed = storageEnvSchema.safeParse({ [name]: value });
      expect(parsed.success, `${name}=${value}`).toBe(false);
      expect(parsed.error!.issues.map((issue) => issue.message)).toContain(message);
    }
  });
});
