import { mkdtempSync, readdirSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { Op } from "sequelize";
import { closeSequelize } from "../../db/connection.server";
import { PROJECT, SURVEYS } from "../../sample-data/scenario";
import { configuredRoutes } from "../configured-routes";
import { Assignment, AuditEvent, DailyReport, DailyReportAmendment, Invitation, Membership, Project, CellResult, ColumnMapping, DewateringShift, Dive, DiveCell, DiveTeam, ReportSubscriber, Find, FindCustody, FindPhoto, GeotextileTube, Haul, HaulPhoto, HaulSite, JarTest, JarTestPhoto, Hold, HoldCell, ImportJob, MonitoringStation, PayPeriodReport, ProjectSettingsVersion, RecomputeJob, SedimentSample, ShareLink, SignInSession, Sounding, StopWorkEvent, Survey, SurveySnapshot, TubeFill, TurbidityRuleRecord, User, WaterQualityReading, WildlifeSighting, WildlifeStandDown, Zone, WaterQualityReadingPhoto } from "~/lib/db.server";
import { listObjectKeys } from "~/lib/storage/storage.server";
import { logFind } from "~/models/finds.server";
import { getCellsPayload } from "~/models/cells.server";
import { cellLabel, cellRowCol } from "../../shared/grid/cell-grid";
import { stagingDirectory } from "~/lib/import/stage-upload.server";
import { presentProject } from "~/lib/auth/project-view.server";
import { createShareLink } from "~/models/share-links.server";
import { createRule, createStation, recordReading } from "~/models/water-quality.server";
import { DEMO_DIR, makeDemoSiteProject, postSurvey } from "./import-helpers";
import { ORIGIN, makeUser, requestAs } from "./helpers";
import { createApiToken } from "~/lib/auth/api-token.server";

// Whatever a client sends, no /api route answers 5xx, and a refused request changes nothing: every
// mutating API route gets empty, non-JSON, wrong-type, deeply nested and oversized bodies and must
// answer 4xx (not 401/403: the caller is the manager, so the body itself is what is refused) with
// every table those routes write holding the same rows as before.

process.env.UPLOAD_DIR = mkdtempSync(join(tmpdir(), "firmsand-bad-bodies-"));

afterAll(closeSequelize);

type Handler = (args: never) => Promise<Response>;
interface MutatingRoute {
  /** The route's path in app/routes.ts. */
  route: string;
  method: string;
  /** The URL with this test's ids. */
  url: () => string;
  params: () => Record<string, string>;
  /** For a route whose valid request has no body (revoking a link): where the empty bodies go, so they cannot succeed. */
  urlForEmptyBody?: () => string;
  paramsForEmptyBody?: () => Record<string, string>;
  /** The caller's token when the route is not the manager's (the site admin's account routes). */
  token?: () => string;
}

let site: Awaited<ReturnType<typeof makeDemoSiteProject>>;
let surveyId: number;
let liveToken: string;
let adminToken: string;
let accountId: number;
let tubeId: number;
let stopWorkId: number;
let findId: number;
let holdId: number;
let jarTestId: number;
let readingId: number;
let haulId: number;
let teamId: number;
let subscriberId: number;
const projectParams = () => ({ projectId: String(site.project.id) });
const base = () => `/api/projects/${site.project.id}`;

// Written out by hand, one row per method of every /api route file that has an action; the last
// test checks this list against app/routes.ts. Tables written: assignments → Assignment,
// AuditEvent; dives → Dive, DiveCell, AuditEvent; share-links → ShareLink, AuditEvent; surveys →
// Survey, Sounding, CellResult, SurveySnapshot, ImportJob, ColumnMapping, AuditEvent and the
// staging directory; projects → Project, Zone, Membership, AuditEvent; a project's settings →
// Project, Zone, CellResult, SurveySnapshot, ProjectSettingsVersion, RecomputeJob, AuditEvent; an account (the site admin) → User,
// SignInSession, AuditEvent; dewatering shifts, tubes and fills → DewateringShift, GeotextileTube,
// TubeFill, AuditEvent; a tube's status → GeotextileTube, AuditEvent; jar tests → JarTest, AuditEvent; a jar test's or a haul ticket's photos → JarTestPhoto, HaulPhoto, the object store and the staging directory; hauls → Haul, AuditEvent; haul sites → HaulSite, AuditEvent; members → Membership, Invitation, OutgoingMail, AuditEvent; sediment samples → SedimentSample, AuditEvent;
// SignInSession, AuditEvent; water-quality stations, rules, readings → MonitoringStation,
// TurbidityRuleRecord, WaterQualityReading, StopWorkEvent, AuditEvent; a reading's photos → WaterQualityReadingPhoto, the object store and the staging directory; a resumption or an agency
// notice → StopWorkEvent, AuditEvent; wildlife sightings → WildlifeSighting, WildlifeStandDown, AuditEvent;
// SignInSession, AuditEvent; dive teams → DiveTeam, AuditEvent; archive and restore → Project, AuditEvent; finds → Find, Hold, HoldCell, AuditEvent; a find's photos → FindPhoto,
// the object store and the staging directory; its custody → FindCustody, Find; a handover's form photo → FindPhoto, FindCustody, the object store; its status → Find, AuditEvent; a hold's lift →
// Hold, AuditEvent; a basket load → Find, AuditEvent; a hold's notice → HoldNotice, AuditEvent; a day's report signed or amended → DailyReport, DailyReportAmendment, AuditEvent; a signed pay period → PayPeriodReport, AuditEvent; the GET-only routes' actions (405) and api/* (404) write nothing.
const ROUTES: MutatingRoute[] = [
  { route: "api/admin/users/:userId", method: "PATCH", url: () => `/api/admin/users/${accountId}`, params: () => ({ userId: String(accountId) }), token: () => adminToken },
  { route: "api/projects", method: "POST", url: () => "/api/projects", params: () => ({}) },
  { route: "api/projects/:projectId", method: "PATCH", url: () => base(), params: projectParams },
  // Archiving takes no body: the empty ones go to a project that does not exist, so they cannot archive this one.
  {
    route: "api/projects/:projectId/archive", method: "POST", url: () => `${base()}/archive`, params: projectParams,
    urlForEmptyBody: () => "/api/projects/999999999/archive", paramsForEmptyBody: () => ({ projectId: "999999999" }),
  },
  // Recomputing again takes no body: the empty ones go to a project that does not exist, so they cannot start one here.
  {
    route: "api/projects/:projectId/recomputes", method: "POST", url: () => `${base()}/recomputes`, params: projectParams,
    urlForEmptyBody: () => "/api/projects/999999999/recomputes", paramsForEmptyBody: () => ({ projectId: "999999999" }),
  },
  { route: "api/projects/:projectId/recomputes/:jobId", method: "POST", url: () => `${base()}/recomputes/1`, params: () => ({ ...projectParams(), jobId: "1" }) },
  // Restoring an open project is a 409 whatever the body (the site admin's).
  { route: "api/projects/:projectId/restore", method: "POST", url: () => `${base()}/restore`, params: projectParams, token: () => adminToken },
  { route: "api/projects/:projectId/assignments", method: "POST", url: () => `${base()}/assignments`, params: projectParams },
  { route: "api/projects/:projectId/dewatering/jar-tests", method: "POST", url: () => `${base()}/dewatering/jar-tests`, params: projectParams },
  { route: "api/projects/:projectId/dewatering/jar-tests/:jarTestId/photos", method: "POST", url: () => `${base()}/dewatering/jar-tests/${jarTestId}/photos`, params: () => ({ ...projectParams(), jarTestId: String(jarTestId) }) },
  { route: "api/projects/:projectId/dewatering/shifts", method: "POST", url: () => `${base()}/dewatering/shifts`, params: projectParams },
  { route: "api/projects/:projectId/dewatering/tubes", method: "POST", url: () => `${base()}/dewatering/tubes`, params: projectParams },
  { route: "api/projects/:projectId/dewatering/tubes/:tubeId", method: "PATCH", url: () => `${base()}/dewatering/tubes/${tubeId}`, params: () => ({ ...projectParams(), tubeId: String(tubeId) }) },
  { route: "api/projects/:projectId/dewatering/tubes/:tubeId/fills", method: "POST", url: () => `${base()}/dewatering/tubes/${tubeId}/fills`, params: () => ({ ...projectParams(), tubeId: String(tubeId) }) },
  { route: "api/projects/:projectId/days/:date/sign", method: "POST", url: () => `${base()}/days/2030-01-02/sign`, params: () => ({ ...projectParams(), date: "2030-01-02" }) },
  { route: "api/projects/:projectId/days/:date/countersign-requests", method: "POST", url: () => `${base()}/days/2030-01-02/countersign-requests`, params: () => ({ ...projectParams(), date: "2030-01-02" }) },
  { route: "api/projects/:projectId/days/:date/equipment", method: "PUT", url: () => `${base()}/days/2030-01-02/equipment`, params: () => ({ ...projectParams(), date: "2030-01-02" }) },
  { route: "api/projects/:projectId/days/:date/crews", method: "PUT", url: () => `${base()}/days/2030-01-02/crews`, params: () => ({ ...projectParams(), date: "2030-01-02" }) },
  { route: "api/projects/:projectId/days/:date/weather-downtime", method: "PUT", url: () => `${base()}/days/2030-01-02/weather-downtime`, params: () => ({ ...projectParams(), date: "2030-01-02" }) },
  { route: "api/projects/:projectId/days/:date/visitors", method: "PUT", url: () => `${base()}/days/2030-01-02/visitors`, params: () => ({ ...projectParams(), date: "2030-01-02" }) },
  { route: "api/projects/:projectId/days/:date/amendments", method: "POST", url: () => `${base()}/days/2030-01-02/amendments`, params: () => ({ ...projectParams(), date: "2030-01-02" }) },
  { route: "api/projects/:projectId/dives", method: "POST", url: () => `${base()}/dives`, params: projectParams },
  { route: "api/projects/:projectId/haul-sites", method: "POST", url: () => `${base()}/haul-sites`, params: projectParams },
  { route: "api/projects/:projectId/members", method: "POST", url: () => `${base()}/members`, params: projectParams },
  { route: "api/projects/:projectId/hauls", method: "POST", url: () => `${base()}/hauls`, params: projectParams },
  { route: "api/projects/:projectId/hauls/:haulId/photos", method: "POST", url: () => `${base()}/hauls/${haulId}/photos`, params: () => ({ ...projectParams(), haulId: String(haulId) }) },
  { route: "api/projects/:projectId/sediment-samples", method: "POST", url: () => `${base()}/sediment-samples`, params: projectParams },
  { route: "api/projects/:projectId/finds", method: "POST", url: () => `${base()}/finds`, params: projectParams },
  { route: "api/projects/:projectId/finds/:findId", method: "PATCH", url: () => `${base()}/finds/${findId}`, params: () => ({ ...projectParams(), findId: String(findId) }) },
  { route: "api/projects/:projectId/finds/:findId/custody", method: "POST", url: () => `${base()}/finds/${findId}/custody`, params: () => ({ ...projectParams(), findId: String(findId) }) },
  { route: "api/projects/:projectId/finds/:findId/custody/:custodyId/form-photo", method: "POST", url: () => `${base()}/finds/${findId}/custody/999999/form-photo`, params: () => ({ ...projectParams(), findId: String(findId), custodyId: "999999" }) },
  { route: "api/projects/:projectId/finds/:findId/photos", method: "POST", url: () => `${base()}/finds/${findId}/photos`, params: () => ({ ...projectParams(), findId: String(findId) }) },
  { route: "api/projects/:projectId/finds/baskets", method: "POST", url: () => `${base()}/finds/baskets`, params: projectParams },
  { route: "api/projects/:projectId/holds/:holdId/lift", method: "POST", url: () => `${base()}/holds/${holdId}/lift`, params: () => ({ ...projectParams(), holdId: String(holdId) }) },
  { route: "api/projects/:projectId/holds/:holdId/notices", method: "POST", url: () => `${base()}/holds/${holdId}/notices`, params: () => ({ ...projectParams(), holdId: String(holdId) }) },
  { route: "api/projects/:projectId/report-subscribers", method: "POST", url: () => `${base()}/report-subscribers`, params: projectParams },
  {
    route: "api/projects/:projectId/report-subscribers/:subscriberId", method: "DELETE",
    url: () => `${base()}/report-subscribers/${subscriberId}`, params: () => ({ ...projectParams(), subscriberId: String(subscriberId) }),
    urlForEmptyBody: () => `${base()}/report-subscribers/999999999`, paramsForEmptyBody: () => ({ ...projectParams(), subscriberId: "999999999" }),
  },
  { route: "api/projects/:projectId/share-links", method: "POST", url: () => `${base()}/share-links`, params: projectParams },
  {
    route: "api/projects/:projectId/share-links/:token", method: "DELETE",
    url: () => `${base()}/share-links/${liveToken}`, params: () => ({ ...projectParams(), token: liveToken }),
    urlForEmptyBody: () => `${base()}/share-links/no-such-token-0123456789`, paramsForEmptyBody: () => ({ ...projectParams(), token: "no-such-token-0123456789" }),
  },
  { route: "api/projects/:projectId/surveys", method: "POST", url: () => `${base()}/surveys`, params: projectParams },
  { route: "api/projects/:projectId/surveys/:surveyId", method: "DELETE", url: () => `${base()}/surveys/${surveyId}`, params: () => ({ ...projectParams(), surveyId: String(surveyId) }) },
  { route: "api/projects/:projectId/surveys/:surveyId", method: "PATCH", url: () => `${base()}/surveys/${surveyId}`, params: () => ({ ...projectParams(), surveyId: String(surveyId) }) },
  { route: "api/projects/:projectId/surveys/:surveyId/bias", method: "PUT", url: () => `${base()}/surveys/${surveyId}/bias`, params: () => ({ ...projectParams(), surveyId: String(surveyId) }) },
  { route: "api/projects/:projectId/teams", method: "POST", url: () => `${base()}/teams`, params: projectParams },
  { route: "api/projects/:projectId/teams/:teamId", method: "PATCH", url: () => `${base()}/teams/${teamId}`, params: () => ({ ...projectParams(), teamId: String(teamId) }) },
  {
    route: "api/projects/:projectId/teams/:teamId", method: "DELETE",
    url: () => `${base()}/teams/${teamId}`, params: () => ({ ...projectParams(), teamId: String(teamId) }),
    urlForEmptyBody: () => `${base()}/teams/999999999`, paramsForEmptyBody: () => ({ ...projectParams(), teamId: "999999999" }),
  },
  { route: "api/projects/:projectId/water-quality/stations", method: "POST", url: () => `${base()}/water-quality/stations`, params: projectParams },
  { route: "api/projects/:projectId/water-quality/rules", method: "POST", url: () => `${base()}/water-quality/rules`, params: projectParams },
  { route: "api/projects/:projectId/water-quality/readings", method: "POST", url: () => `${base()}/water-quality/readings`, params: projectParams },
  { route: "api/projects/:projectId/water-quality/readings/:readingId/photos", method: "POST", url: () => `${base()}/water-quality/readings/${readingId}/photos`, params: () => ({ ...projectParams(), readingId: String(readingId) }) },
  {
    route: "api/projects/:projectId/stop-work/:eventId/notification", method: "POST",
    url: () => `${base()}/stop-work/${stopWorkId}/notification`, params: () => ({ ...projectParams(), eventId: String(stopWorkId) }),
  },
  {
    route: "api/projects/:projectId/stop-work/:eventId/resume", method: "POST",
    url: () => `${base()}/stop-work/${stopWorkId}/resume`, params: () => ({ ...projectParams(), eventId: String(stopWorkId) }),
  },
  { route: "api/projects/:projectId/wildlife/sightings", method: "POST", url: () => `${base()}/wildlife/sightings`, params: projectParams },
  { route: "api/projects/:projectId/pay-periods", method: "POST", url: () => `${base()}/pay-periods`, params: projectParams },
  // GET-only routes: their action answers 405 to every body.
  { route: "api/admin/users", method: "POST", url: () => "/api/admin/users", params: () => ({}), token: () => adminToken },
  { route: "api/crs", method: "POST", url: () => "/api/crs", params: () => ({}) },
  { route: "api/projects/:projectId/bands", method: "POST", url: () => `${base()}/bands`, params: projectParams },
  { route: "api/projects/:projectId/cells", method: "POST", url: () => `${base()}/cells`, params: projectParams },
  { route: "api/projects/:projectId/cells/:label", method: "POST", url: () => `${base()}/cells/B7`, params: () => ({ ...projectParams(), label: "B7" }) },
  { route: "api/projects/:projectId/days/:date", method: "POST", url: () => `${base()}/days/2030-01-02`, params: () => ({ ...projectParams(), date: "2030-01-02" }) },
  { route: "api/projects/:projectId/finds.csv", method: "POST", url: () => `${base()}/finds.csv`, params: projectParams },
  { route: "api/projects/:projectId/finds/:findId", method: "POST", url: () => `${base()}/finds/${findId}`, params: () => ({ ...projectParams(), findId: String(findId) }) },
  { route: "api/projects/:projectId/dewatering/jar-tests/:jarTestId", method: "POST", url: () => `${base()}/dewatering/jar-tests/${jarTestId}`, params: () => ({ ...projectParams(), jarTestId: String(jarTestId) }) },
  { route: "api/projects/:projectId/dewatering/jar-tests/:jarTestId/photos/:photoId", method: "POST", url: () => `${base()}/dewatering/jar-tests/${jarTestId}/photos/1`, params: () => ({ ...projectParams(), jarTestId: String(jarTestId), photoId: "1" }) },
  { route: "api/projects/:projectId/water-quality/readings/:readingId/photos/:photoId", method: "POST", url: () => `${base()}/water-quality/readings/${readingId}/photos/1`, params: () => ({ ...projectParams(), readingId: String(readingId), photoId: "1" }) },
  { route: "api/projects/:projectId/hauls/:haulId/photos/:photoId", method: "POST", url: () => `${base()}/hauls/${haulId}/photos/1`, params: () => ({ ...projectParams(), haulId: String(haulId), photoId: "1" }) },
  { route: "api/projects/:projectId/finds/:findId/photos/:photoId", method: "POST", url: () => `${base()}/finds/${findId}/photos/1`, params: () => ({ ...projectParams(), findId: String(findId), photoId: "1" }) },
  { route: "api/projects/:projectId/holds", method: "POST", url: () => `${base()}/holds`, params: projectParams },
  { route: "api/projects/:projectId/progress", method: "POST", url: () => `${base()}/progress`, params: projectParams },
  { route: "api/projects/:projectId/quantities", method: "POST", url: () => `${base()}/quantities`, params: projectParams },
  { route: "api/projects/:projectId/quantities.csv", method: "POST", url: () => `${base()}/quantities.csv`, params: projectParams },
  { route: "api/projects/:projectId/quantities.geojson", method: "POST", url: () => `${base()}/quantities.geojson`, params: projectParams },
  { route: "api/projects/:projectId/reconciliation", method: "POST", url: () => `${base()}/reconciliation`, params: projectParams },
  { route: "api/projects/:projectId/stop-work", method: "POST", url: () => `${base()}/stop-work`, params: projectParams },
  { route: "api/*", method: "POST", url: () => "/api/no-such-thing", params: () => ({ "*": "no-such-thing" }) },
];

const TWO_MB = 2 * 1024 * 1024;
const DEPTH = 10_000;
const nestedObject = `${'{"name":'.repeat(DEPTH)}"x"${"}".repeat(DEPTH)}`;
const nestedArray = `${"[".repeat(DEPTH)}${"]".repeat(DEPTH)}`;
const nestedInFields = `{"date":"2031-05-06","team":"Team Heron","hose":"Hose A","cells":${nestedArray},"name":${nestedObject},"reason":${nestedArray},"status":${nestedObject}}`;
const oversizedJson = JSON.stringify({ name: "Embed", publicText: "x".repeat(TWO_MB), notes: "y", reason: "z".repeat(TWO_MB) });

/** A 2 MB body sent in chunks with no Content-Length, as a streaming client would. */
function chunkedBody(totalBytes: number): ReadableStream<Uint8Array> {
  let sent = 0;
  const chunk = new TextEncoder().encode(`{"pad":"${"x".repeat(64 * 1024)}",`);
  return new ReadableStream({
    pull(controller) {
      if (sent >= totalBytes) return controller.close();
      controller.enqueue(chunk);
      sent += chunk.byteLength;
    },
  });
}

function multipart(fields: Record<string, string>, file?: string): FormData {
  const form = new FormData();
  for (const [name, value] of Object.entries(fields)) form.set(name, value);
  if (file !== undefined) form.set("file", new Blob([file], { type: "text/csv" }), "soundings.csv");
  return form;
}

interface BadBody {
  name: string;
  /** An empty body: for a route whose valid request has none, it goes to urlForEmptyBody. */
  empty?: boolean;
  init: () => { body?: BodyInit; headers?: Record<string, string>; duplex?: "half" };
}

const json = (body: string) => () => ({ body, headers: { "Content-Type": "application/json" } });
const BAD_BODIES: BadBody[] = [
  { name: "no body, no Content-Type", empty: true, init: () => ({}) },
  { name: "empty JSON body", empty: true, init: json("") },
  { name: "JSON type, not JSON", init: json("this is not json {") },
  { name: "JSON type, truncated", init: json('{"date":"2031-05-06","cells":["B7"') },
  { name: "text/plain", init: () => ({ body: "date=2031-05-06", headers: { "Content-Type": "text/plain" } }) },
  { name: "XML", init: () => ({ body: "<assignment/>", headers: { "Content-Type": "application/xml" } }) },
  { name: "no Content-Type with a body", init: () => ({ body: new Blob(['{"name":"x"}']) }) },
  { name: "JSON array", init: json("[1,2,3]") },
  { name: "JSON string", init: json('"a string"') },
  { name: "JSON null", init: json("null") },
  { name: "JSON number", init: json("42") },
  { name: "JSON with wrong field types", init: json('{"date":5,"team":[],"cells":"B7","hose":{},"diver":false,"maxDepth":"deep","name":7,"publicText":[],"reason":false,"status":1}') },
  { name: "JSON with unknown fields only", init: json('{"__proto__":{"admin":true},"constructor":{"prototype":{}}}') },
  { name: `object nested ${DEPTH} levels`, init: json(nestedObject) },
  { name: `array nested ${DEPTH} levels`, init: json(nestedArray) },
  { name: "deep nesting inside known fields", init: json(nestedInFields) },
  { name: "2 MB JSON with Content-Length", init: () => ({ body: oversizedJson, headers: { "Content-Type": "application/json", "Content-Length": String(Buffer.byteLength(oversizedJson)) } }) },
  { name: "2 MB JSON chunked", init: () => ({ body: chunkedBody(TWO_MB), headers: { "Content-Type": "application/json" }, duplex: "half" }) },
  { name: "invalid UTF-8 JSON", init: () => ({ body: new Uint8Array([0x7b, 0x22, 0xff, 0xfe, 0x22, 0x7d]), headers: { "Content-Type": "application/json" } }) },
  // Broken %-escapes decode leniently (as browsers do), so only the fields' names decide here: none is one a route asks for.
  { name: "form with broken escapes", init: () => ({ body: "%zz=%&na%me=%E0%A4%A&=&&", headers: { "Content-Type": "application/x-www-form-urlencoded" } }) },
  { name: "multipart with a wrong boundary", init: () => ({ body: "--other\r\nContent-Disposition: form-data; name=\"name\"\r\n\r\nx\r\n--other--\r\n", headers: { "Content-Type": "multipart/form-data; boundary=expected" } }) },
  { name: "multipart without a file, fields of the wrong kind", init: () => ({ body: multipart({ kind: "sideways", surveyedOn: "yesterday", waterSurfaceElevation: "high", name: "" }) }) },
  { name: "multipart with a nested columns field", init: () => ({ body: multipart({ kind: "baseline", surveyedOn: "2026-09-08", waterSurfaceElevation: "32.4", columns: nestedObject }, "easting,northing,depth\n600100,1679950,4\n") }) },
];

/** Row counts of every table a mutating API route writes, for this project. */
async function snapshot() {
  const projectId = site.project.id;
  const surveyIds = (await Survey.findAll({ where: { projectId }, attributes: ["id"] })).map((survey) => survey.id);
  return {
    assignments: await Assignment.count({ where: { projectId } }),
    dives: await Dive.count({ where: { projectId } }),
    reportSubscribers: await ReportSubscriber.count({ where: { projectId } }),
    diveTeams: JSON.stringify(await DiveTeam.findAll({ where: { projectId }, raw: true, order: [["id", "ASC"]] })),
    diveCells: await DiveCell.count({ where: { projectId } }),
    dewateringShifts: await DewateringShift.count({ where: { projectId } }),
    dailyReports: JSON.stringify(await DailyReport.findAll({ where: { projectId }, raw: true })),
    dailyReportAmendments: await DailyReportAmendment.count(),
    tubes: JSON.stringify(await GeotextileTube.findAll({ where: { projectId }, raw: true })),
    tubeFills: await TubeFill.count({ where: { projectId } }),
    hauls: await Haul.count({ where: { projectId } }),
    haulSites: await HaulSite.count({ where: { projectId } }),
    sedimentSamples: await SedimentSample.count({ where: { projectId } }),
    shareLinks: await ShareLink.count({ where: { projectId } }),
    revokedShareLinks: await ShareLink.count({ where: { projectId, revokedAt: { [Op.ne]: null } } }),
    surveys: surveyIds.length,
    retractedSurveys: await Survey.count({ where: { projectId, status: "retracted" } }),
    soundings: await Sounding.count({ where: { surveyId: surveyIds } }),
    cellResults: await CellResult.count({ where: { projectId } }),
    snapshots: await SurveySnapshot.count({ where: { projectId } }),
    importJobs: await ImportJob.count({ where: { projectId } }),
    recomputeJobs: await RecomputeJob.count({ where: { projectId } }),
    settingsVersions: await ProjectSettingsVersion.count({ where: { projectId } }),
    columnMappings: await ColumnMapping.count({ where: { projectId } }),
    auditEvents: await AuditEvent.count({ where: { projectId } }),
    payPeriodReports: await PayPeriodReport.count({ where: { projectId } }),
    monitoringStations: await MonitoringStation.count({ where: { projectId } }),
    turbidityRules: await TurbidityRuleRecord.count({ where: { projectId } }),
    waterQualityReadings: await WaterQualityReading.count({ where: { projectId } }),
    waterQualityReadingPhotos: await WaterQualityReadingPhoto.count({ where: { projectId } }),
    stopWorkEvents: await StopWorkEvent.count({ where: { projectId } }),
    resumedStopWork: await StopWorkEvent.count({ where: { projectId, resumedAt: { [Op.ne]: null } } }),
    notifiedStopWork: await StopWorkEvent.count({ where: { projectId, agencyNotifiedAt: { [Op.ne]: null } } }),
    sightings: await WildlifeSighting.count({ where: { projectId } }),
    standDowns: await WildlifeStandDown.count({ where: { projectId } }),
    projects: await Project.count(),
    projectRow: JSON.stringify((await Project.findByPk(projectId, { raw: true }))!),
    zones: await Zone.count(),
    memberships: await Membership.count(),
    invitations: await Invitation.count(),
    account: JSON.stringify((await User.findByPk(accountId, { raw: true }))!),
    accountSessions: await SignInSession.count({ where: { userId: accountId, endedAt: null } }),
    stagedFiles: readdirSync(stagingDirectory(), { withFileTypes: true }).length,
    finds: JSON.stringify(await Find.findAll({ where: { projectId }, raw: true, order: [["id", "ASC"]] })),
    findPhotos: await FindPhoto.count({ where: { projectId } }),
    jarTests: await JarTest.count({ where: { projectId } }),
    jarTestPhotos: await JarTestPhoto.count({ where: { projectId } }),
    haulPhotos: await HaulPhoto.count({ where: { projectId } }),
    findCustody: await FindCustody.count({ where: { projectId } }),
    holds: JSON.stringify(await Hold.findAll({ where: { projectId }, raw: true })),
    holdCells: await HoldCell.count({ where: { projectId } }),
    storedObjects: (await listObjectKeys(`projects/${projectId}/`)).length,
  };
}

async function moduleOf(file: string): Promise<{ action?: Handler }> {
  return import(/* @vite-ignore */ `../../app/${file}`);
}

beforeAll(async () => {
  site = await makeDemoSiteProject("bad-bodies");
  // So that POST /api/projects reads the bodies rather than refusing the caller.
  await User.update({ mayCreateProjects: true }, { where: { id: site.users.manager } });
  tubeId = (await GeotextileTube.create({ projectId: site.project.id, name: "T-1", circumference: 30, length: 100, capacityDryMassPerLength: 5, status: "filling", notes: "" })).id;
  const haulSite = await HaulSite.create({ projectId: site.project.id, name: "Tallgrass Farm", kind: "reuse", permitNumber: "AG-1" });
  haulId = (await Haul.create({
    projectId: site.project.id, haulDate: "2026-09-10", ticketNumber: "BB-1", truck: "Truck 1", siteId: haulSite.id, loadWetMass: 20, loadVolume: null,
    cakeSolidsByWeight: 0.3, cakeSolidsFromSample: true, solidsSpecificGravity: 2.65, drySolidsKg: 5443, notes: "", idempotencyKey: null, recordedById: null,
  })).id;
  jarTestId = (await JarTest.create({
    projectId: site.project.id, testDate: "2026-09-10", testTime: null, sampleSource: "", polymerProduct: "CE-412", polymerLot: null, benchStockPercent: 0.1, jarVolumeMl: 1000,
    rawTurbidityNtu: null, jars: [{ doseMgPerL: 4, settlingMinutes: 10, turbidityNtu: null, clarity: "clear" }], chosenDoseMgPerL: 4, notes: "", idempotencyKey: null, recordedById: null,
  })).id;
  subscriberId = (await ReportSubscriber.create({ projectId: site.project.id, email: "bad-bodies-agency@example.org", userId: null, addedById: null })).id;
  teamId = (await DiveTeam.create({ projectId: site.project.id, name: "Team Heron", station: "Barge 1", hoses: [{ name: "Hose A", diameter: 6, diameterUnit: "in" }], members: [{ name: "A", email: "bad-bodies-a@example.org", duty: "diver" }] })).id;
  const baseline = SURVEYS.find((survey) => survey.key === "baseline")!;
  const stored = await postSurvey(site.project.id, site.tokens.manager, { path: join(DEMO_DIR, baseline.fileName) }, {
    kind: baseline.kind, surveyedOn: baseline.surveyedOn, waterSurfaceElevation: String(baseline.waterSurfaceElevationFt), timeZone: PROJECT.timeZone, datum: PROJECT.verticalDatum,
  });
  expect(stored.status).toBe(201);
  surveyId = ((await stored.json()) as { id: number }).id;
  const manager = { id: site.users.manager } as never;
  adminToken = (await createApiToken(await makeUser("bad-bodies-admin", { isSiteAdmin: true }), "tests")).token;
  const account = await makeUser("bad-bodies-account");
  accountId = account.id;
  await requestAs(accountId, "/projects");
  const cells = await getCellsPayload(presentProject(site.project));
  const firstInside = cellRowCol(cells.grid!, cells.status.findIndex((code) => code >= 0));
  const held = await logFind(presentProject(site.project), manager, {
    category: "cultural", description: "Sherd", count: 1, material: null, taxon: null, element: null, condition: null, finder: null, fieldTag: null,
    cell: cellLabel(firstInside.row, firstInside.col), foundAt: "2026-09-09T10:00:00-04:00",
  });
  findId = held.id;
  holdId = held.hold!.id;
  liveToken = (await createShareLink(presentProject(site.project), manager, { name: "Live link", publicText: "" }, ORIGIN, null)).token;
  // An open stop-work event (an exceedance with no resample yet), so resume bodies reach a real event.
  const view = presentProject(site.project);
  await createRule(view, manager, { kind: "above-background", limit: 29, inclusive: true, pairingWindowMinutes: 60, notifyWithinHours: 24, source: "Test permit, condition 1" });
  await createStation(view, manager, { name: "Background", kind: "background" });
  await createStation(view, manager, { name: "Compliance", kind: "compliance" });
  readingId = (await recordReading(view, { id: site.users.manager, name: "Manager" } as never, { station: "Background", takenAt: "2026-11-04T09:00:00-05:00", value: 5, unit: "NTU" })).id;
  stopWorkId = (await recordReading(view, { id: site.users.manager, name: "Manager" } as never, { station: "Compliance", takenAt: "2026-11-04T09:20:00-05:00", value: 40, unit: "NTU" })).stopWork!.id;
}, 60_000);

describe("bad bodies to every mutating API route", () => {
  for (const route of ROUTES) {
    it(`${route.method} /${route.route}: 4xx for every bad body, nothing written`, async () => {
      const { action } = await moduleOf(configuredRoutes().find((entry) => entry.path === route.route)!.file);
      const before = await snapshot();
      const answers: string[] = [];
      for (const bad of BAD_BODIES) {
        const emptyElsewhere = bad.empty && route.urlForEmptyBody;
        const url = emptyElsewhere ? route.urlForEmptyBody!() : route.url();
        const params = emptyElsewhere ? route.paramsForEmptyBody!() : route.params();
        const { body, headers = {}, duplex } = bad.init();
        const request = new Request(`${ORIGIN}${url}`, {
          method: route.method, body, duplex, headers: { ...headers, Authorization: `Bearer ${route.token?.() ?? site.tokens.manager}` },
        } as RequestInit);
        const response = await action!({ request, params, context: {} } as never);
        answers.push(`${bad.name}: ${response.status}`);
        expect(response.status, `${bad.name} → ${response.status}`).toBeGreaterThanOrEqual(400);
        expect(response.status, bad.name).toBeLessThan(500);
        expect([401, 403], bad.name).not.toContain(response.status);
        // Every refusal speaks the one error shape.
        const answer = (await response.json()) as { errors?: Array<{ message?: unknown }> };
        expect(answer.errors?.length, bad.name).toBeGreaterThan(0);
        expect(answer.errors!.every((error) => typeof error.message === "string" && error.message.length > 0), bad.name).toBe(true);
      }
      expect(await snapshot(), answers.join("\n")).toEqual(before);
    }, 60_000);
  }

  it("the list covers every /api route file with an action, and only those", async () => {
    const withAction: string[] = [];
    for (const { path, file } of configuredRoutes().filter((entry) => entry.path.startsWith("api/"))) {
      if (typeof (await moduleOf(file)).action === "function") withAction.push(path);
    }
    expect([...new Set(ROUTES.map((route) => route.route))].sort()).toEqual(withAction.sort());
  });

  it("the bodies did reach the routes: a valid request on the same URLs still works (negative control)", async () => {
    const { action } = await moduleOf("routes/api.projects.$projectId.share-links.$token.ts");
    const request = new Request(`${ORIGIN}${base()}/share-links/${liveToken}`, { method: "DELETE", headers: { Authorization: `Bearer ${site.tokens.manager}` } });
    expect((await action!({ request, params: { ...projectParams(), token: liveToken }, context: {} } as never)).status).toBe(204);
  });
});
