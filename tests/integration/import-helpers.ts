import { createReadStream, readFileSync } from "node:fs";
import { rm } from "node:fs/promises";
import { join } from "node:path";
import { Readable } from "node:stream";
import { createCrs } from "../../shared/crs";
import { resolveCrsDefinition } from "~/lib/geo/epsg.server";
import { createApiToken } from "~/lib/auth/api-token.server";
import { CellResult, Project, Sounding, Survey, SurveySnapshot, Zone } from "~/lib/db.server";
import { GRID, PROJECT, SURVEYS, WORK_LIMIT, ZONES } from "../../sample-data/scenario";
import { importSurveyFile } from "~/lib/import/import-service.server";
import { writeStagedFile } from "~/lib/import/stage-upload.server";
import { addMember, makeUser, ORIGIN } from "./helpers";
import * as surveysApi from "~/routes/api.projects.$projectId.surveys";
import * as surveyApi from "~/routes/api.projects.$projectId.surveys.$surveyId";

// Helpers for the sounding import tests: a project on the demo scenario's work limit, members
// with personal API tokens, and calls of the API's route handlers with real multipart requests.

export const DEMO_DIR = join(import.meta.dirname, "..", "..", "sample-data", "demo");
export const FIXTURES = join(import.meta.dirname, "..", "fixtures", "import");

export async function makeDemoSiteProject(label: string) {
  const project = await Project.create({
    name: `Import test ${label}`,
    slug: `import-${label}-${Math.random().toString(36).slice(2, 8)}`,
    crs: PROJECT.crs,
    lengthUnit: PROJECT.lengthUnit,
    gridOriginE: GRID.originEastingFt,
    gridOriginN: GRID.originNorthingFt,
    cellSize: GRID.cellSizeFt,
    rasterResolution: GRID.rasterResolutionFt,
    maxEdge: GRID.maxTriangleEdgeFt,
    tolerance: GRID.toleranceFt,
    firmShare: GRID.firmShare,
    minCoverage: GRID.minCoverage,
    workLimitGeoJson: JSON.stringify(WORK_LIMIT),
  });
  for (const [index, zone] of ZONES.entries()) {
    await Zone.create({ projectId: project.id, name: zone.name, sortOrder: index + 1, polygonGeoJson: JSON.stringify(zone.polygon) });
  }
  const tokens: Record<"surveyor" | "manager" | "viewer", string> = { surveyor: "", manager: "", viewer: "" };
  const users: Record<"surveyor" | "manager" | "viewer", number> = { surveyor: 0, manager: 0, viewer: 0 };
  for (const role of ["surveyor", "manager", "viewer"] as const) {
    const user = await makeUser(`${label}-${role}`);
    await addMember(user.id, project.id, role);
    tokens[role] = (await createApiToken(user, "tests")).token;
    users[role] = user.id;
  }
  return { project, tokens, users };
}

/** The demo scenario's surveys imported into `projectId` through the import path, in order (UPLOAD_DIR must be set). */
export async function importDemoSurveys(projectId: number, userId: number, surveys: ReadonlyArray<(typeof SURVEYS)[number]> = SURVEYS): Promise<void> {
  for (const survey of surveys) {
    const staged = await writeStagedFile(Readable.toWeb(createReadStream(join(DEMO_DIR, survey.fileName))) as ReadableStream<Uint8Array>, survey.fileName);
    const outcome = await importSurveyFile({
      projectId, userId, staged,
      options: {
        kind: survey.kind, surveyedOn: survey.surveyedOn, timeZone: PROJECT.timeZone, waterSurfaceElevation: survey.waterSurfaceElevationFt,
        fileHasElevations: false, datum: PROJECT.verticalDatum, crs: PROJECT.crs, lengthUnit: PROJECT.lengthUnit, surveyOrder: "1a",
      },
      choices: { excludeRows: [], excludeErrorRows: false, outside: "keep", acceptSameFile: false },
    });
    await rm(staged.path, { force: true });
    if (!outcome.ok) throw new Error(`${survey.fileName} refused: ${outcome.preview.blockers.join(" ")}`);
  }
}

export function projectCrs() {
  return createCrs(resolveCrsDefinition(PROJECT.crs).definition);
}

export async function counts(projectId: number) {
  const surveyIds = (await Survey.findAll({ where: { projectId }, attributes: ["id"] })).map((survey) => survey.id);
  return {
    surveys: surveyIds.length,
    soundings: surveyIds.length ? await Sounding.count({ where: { surveyId: surveyIds } }) : 0,
    cells: await CellResult.count({ where: { projectId } }),
    snapshots: await SurveySnapshot.count({ where: { projectId } }),
  };
}

async function call(handler: (args: never) => Promise<unknown>, request: Request, params: Record<string, string>): Promise<Response> {
  try {
    const result = await handler({ request, params, context: {} } as never);
    if (!(result instanceof Response)) throw new Error("the route did not answer with a Response");
    return result;
  } catch (error) {
    if (error instanceof Response) return error;
    throw error;
  }
}

export async function postSurvey(
  projectId: number,
  token: string | null,
  file: { path: string } | { name: string; content: string | Uint8Array },
  fields: Record<string, string>,
): Promise<Response> {
  const form = new FormData();
  for (const [name, value] of Object.entries(fields)) form.set(name, value);
  if ("path" in file) form.set("file", new Blob([readFileSync(file.path)], { type: "text/csv" }), file.path.split("/").pop());
  else form.set("file", new Blob([file.content as BlobPart], { type: "text/csv" }), file.name);
  const headers = new Headers();
  if (token) headers.set("Authorization", `Bearer ${token}`);
  const request = new Request(`${ORIGIN}/api/projects/${projectId}/surveys`, { method: "POST", body: form, headers });
  return call(surveysApi.action as never, request, { projectId: String(projectId) });
}

export async function surveyRequest(projectId: number, surveyId: number, token: string, method: "GET" | "DELETE" | "PATCH", body?: unknown): Promise<Response> {
  const request = new Request(`${ORIGIN}/api/projects/${projectId}/surveys/${surveyId}`, {
    method,
    headers: { Authorization: `Bearer ${token}`, "Content-Type": "application/json" },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
  const handler = method === "GET" ? surveyApi.loader : surveyApi.action;
  return call(handler as never, request, { projectId: String(projectId), surveyId: String(surveyId) });
}

export async function storedTotals(projectId: number) {
  const cells = await CellResult.findAll({ where: { projectId }, raw: true });
  const sum = (key: "plannedVolume" | "removedVolume" | "remainingVolume" | "depositedVolume") => cells.reduce((total, cell) => total + cell[key], 0);
  return { cells: cells.length, plannedVolume: sum("plannedVolume"), removedVolume: sum("removedVolume"), remainingVolume: sum("remainingVolume"), depositedVolume: sum("depositedVolume"), statuses: cells.map((cell) => cell.status) };
}
